-- rollwise sql testdata/dialects/lab.roll -m 'mid_minutes,visits_n' -b patients.ward -d bigquery
WITH `visits_rows` AS (
  SELECT
    `patients`.`ward` AS `patients__ward`,
    `visits`.`minutes` AS `mid_minutes_arg`
  FROM `lab`.`visits` AS `visits`
  LEFT JOIN `lab`.`patients` AS `patients` ON `visits`.`patient` = `patients`.`id`
),
`visits_ranks` AS (
  SELECT
    `patients__ward`,
    `mid_minutes_arg` AS `mid_minutes_median_value`,
    ROW_NUMBER() OVER (PARTITION BY `patients__ward` ORDER BY `mid_minutes_arg` ASC NULLS LAST) AS `mid_minutes_median_number`,
    count(`mid_minutes_arg`) OVER (PARTITION BY `patients__ward` ORDER BY `mid_minutes_arg` ASC NULLS LAST ROWS BETWEEN UNBOUNDED PRECEDING AND UNBOUNDED FOLLOWING) AS `mid_minutes_median_count`
  FROM `visits_rows`
),
`visits_cells` AS (
  SELECT
    `patients__ward`,
    0 AS `grouping_id`,
    avg(CAST(CASE WHEN 2 * `mid_minutes_median_number` BETWEEN `mid_minutes_median_count` AND `mid_minutes_median_count` + 2 THEN `mid_minutes_median_value` END AS FLOAT64)) AS `mid_minutes`,
    count(*) AS `visits_n`
  FROM `visits_ranks`
  GROUP BY `patients__ward`
)
SELECT
  `patients__ward`,
  `mid_minutes`,
  `visits_n`,
  `grouping_id`
FROM `visits_cells`
ORDER BY `patients__ward` ASC NULLS LAST;
