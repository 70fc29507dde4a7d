-- rollwise sql testdata/dialects/lab.roll -m 'mid_minutes,urgent_mid,patient_mid' -b patients.ward --totals rollup -d bigquery
WITH `visits_rows` AS (
  SELECT
    `patients`.`ward` AS `patients__ward`,
    `visits`.`minutes` AS `mid_minutes_arg`,
    `visits`.`urgent` AS `urgent_mid_if`,
    `visits`.`patient` AS `visits__patient_per`
  FROM `lab`.`visits` AS `visits`
  LEFT JOIN `lab`.`patients` AS `patients` ON `visits`.`patient` = `patients`.`id`
),
`visits_ranks` AS (
  SELECT
    `patients__ward`,
    `mid_minutes_arg` AS `mid_minutes_median_value`,
    ROW_NUMBER() OVER (PARTITION BY `patients__ward` ORDER BY `mid_minutes_arg` ASC NULLS LAST) AS `mid_minutes_median_number_0`,
    count(`mid_minutes_arg`) OVER (PARTITION BY `patients__ward` ORDER BY `mid_minutes_arg` ASC NULLS LAST ROWS BETWEEN UNBOUNDED PRECEDING AND UNBOUNDED FOLLOWING) AS `mid_minutes_median_count_0`,
    ROW_NUMBER() OVER (ORDER BY `mid_minutes_arg` ASC NULLS LAST) AS `mid_minutes_median_number_1`,
    count(`mid_minutes_arg`) OVER (ORDER BY `mid_minutes_arg` ASC NULLS LAST ROWS BETWEEN UNBOUNDED PRECEDING AND UNBOUNDED FOLLOWING) AS `mid_minutes_median_count_1`,
    CASE WHEN `urgent_mid_if` THEN `mid_minutes_arg` END AS `urgent_mid_median_value`,
    ROW_NUMBER() OVER (PARTITION BY `patients__ward` ORDER BY CASE WHEN `urgent_mid_if` THEN `mid_minutes_arg` END ASC NULLS LAST) AS `urgent_mid_median_number_0`,
    count(CASE WHEN `urgent_mid_if` THEN `mid_minutes_arg` END) OVER (PARTITION BY `patients__ward` ORDER BY CASE WHEN `urgent_mid_if` THEN `mid_minutes_arg` END ASC NULLS LAST ROWS BETWEEN UNBOUNDED PRECEDING AND UNBOUNDED FOLLOWING) AS `urgent_mid_median_count_0`,
    ROW_NUMBER() OVER (ORDER BY CASE WHEN `urgent_mid_if` THEN `mid_minutes_arg` END ASC NULLS LAST) AS `urgent_mid_median_number_1`,
    count(CASE WHEN `urgent_mid_if` THEN `mid_minutes_arg` END) OVER (ORDER BY CASE WHEN `urgent_mid_if` THEN `mid_minutes_arg` END ASC NULLS LAST ROWS BETWEEN UNBOUNDED PRECEDING AND UNBOUNDED FOLLOWING) AS `urgent_mid_median_count_1`
  FROM `visits_rows`
),
`visits_cells` AS (
  SELECT
    `patients__ward`,
    GROUPING(`patients__ward`) AS `grouping_id`,
    CASE GROUPING(`patients__ward`)
      WHEN 0 THEN avg(CAST(CASE WHEN 2 * `mid_minutes_median_number_0` BETWEEN `mid_minutes_median_count_0` AND `mid_minutes_median_count_0` + 2 THEN `mid_minutes_median_value` END AS FLOAT64))
      WHEN 1 THEN avg(CAST(CASE WHEN 2 * `mid_minutes_median_number_1` BETWEEN `mid_minutes_median_count_1` AND `mid_minutes_median_count_1` + 2 THEN `mid_minutes_median_value` END AS FLOAT64))
    END AS `mid_minutes`,
    CASE GROUPING(`patients__ward`)
      WHEN 0 THEN avg(CAST(CASE WHEN 2 * `urgent_mid_median_number_0` BETWEEN `urgent_mid_median_count_0` AND `urgent_mid_median_count_0` + 2 THEN `urgent_mid_median_value` END AS FLOAT64))
      WHEN 1 THEN avg(CAST(CASE WHEN 2 * `urgent_mid_median_number_1` BETWEEN `urgent_mid_median_count_1` AND `urgent_mid_median_count_1` + 2 THEN `urgent_mid_median_value` END AS FLOAT64))
    END AS `urgent_mid`
  FROM `visits_ranks`
  GROUP BY GROUPING SETS ((`patients__ward`), ())
),
`patient_mid_per_visits_cells` AS (
  SELECT
    `patients__ward`,
    `visits__patient_per`,
    (GROUPING(`patients__ward`) * 2 + GROUPING(`visits__patient_per`)) AS `grouping_id`,
    sum(`mid_minutes_arg`) AS `patient_mid_per_total_minutes`
  FROM `visits_rows`
  GROUP BY GROUPING SETS ((`patients__ward`, `visits__patient_per`), (`visits__patient_per`))
),
`patient_mid_per_groups` AS (
  SELECT
    `patients__ward`,
    `visits__patient_per`,
    `grouping_id`,
    `patient_mid_per_total_minutes` AS `patient_mid_value`
  FROM `patient_mid_per_visits_cells`
),
`patient_mid_per_ranks` AS (
  SELECT
    `grouping_id`,
    `patients__ward`,
    `visits__patient_per`,
    `patient_mid_value`,
    CASE WHEN `visits__patient_per` IS NOT NULL THEN `patient_mid_value` END AS `patient_mid_median_value`,
    ROW_NUMBER() OVER (PARTITION BY `grouping_id`, `patients__ward` ORDER BY CASE WHEN `visits__patient_per` IS NOT NULL THEN `patient_mid_value` END ASC NULLS LAST) AS `patient_mid_median_number`,
    count(CASE WHEN `visits__patient_per` IS NOT NULL THEN `patient_mid_value` END) OVER (PARTITION BY `grouping_id`, `patients__ward` ORDER BY CASE WHEN `visits__patient_per` IS NOT NULL THEN `patient_mid_value` END ASC NULLS LAST ROWS BETWEEN UNBOUNDED PRECEDING AND UNBOUNDED FOLLOWING) AS `patient_mid_median_count`
  FROM `patient_mid_per_groups`
),
`patient_mid_per` AS (
  SELECT
    `patients__ward`,
    `grouping_id`,
    avg(CAST(CASE WHEN 2 * `patient_mid_median_number` BETWEEN `patient_mid_median_count` AND `patient_mid_median_count` + 2 THEN `patient_mid_median_value` END AS FLOAT64)) AS `patient_mid`
  FROM `patient_mid_per_ranks`
  GROUP BY `grouping_id`, `patients__ward`
)
SELECT
  `visits_cells`.`patients__ward`,
  `visits_cells`.`mid_minutes` AS `mid_minutes`,
  `visits_cells`.`urgent_mid` AS `urgent_mid`,
  `patient_mid_per`.`patient_mid` AS `patient_mid`,
  `visits_cells`.`grouping_id`
FROM `visits_cells`
  LEFT JOIN `patient_mid_per` ON `patient_mid_per`.`grouping_id` = CASE `visits_cells`.`grouping_id` WHEN 0 THEN 0 WHEN 1 THEN 2 END
    AND `patient_mid_per`.`patients__ward` IS NOT DISTINCT FROM `visits_cells`.`patients__ward`
ORDER BY (`visits_cells`.`grouping_id` & 1), `visits_cells`.`patients__ward` ASC NULLS LAST;
