-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,total_minutes,avg_minutes,per_visit,urgent_share,fees,fee_per_min,sd_score,var_score,notes' -b patients.ward --totals grand -d bigquery
WITH `visits_rows` AS (
  SELECT
    `patients`.`ward` AS `patients__ward`,
    `visits`.`minutes` AS `total_minutes_arg`,
    `visits`.`urgent` AS `urgent_n_if`,
    `visits`.`fee` AS `fees_arg`,
    `visits`.`score` AS `sd_score_arg`,
    `visits`.`note` AS `visits__note_per`
  FROM `lab`.`visits` AS `visits`
  LEFT JOIN `lab`.`patients` AS `patients` ON `visits`.`patient` = `patients`.`id`
),
`visits_cells` AS (
  SELECT
    `patients__ward`,
    GROUPING(`patients__ward`) AS `grouping_id`,
    count(*) AS `visits_n`,
    sum(`total_minutes_arg`) AS `total_minutes`,
    avg(CAST(`total_minutes_arg` AS FLOAT64)) AS `avg_minutes`,
    count(CASE WHEN `urgent_n_if` THEN 1 END) AS `urgent_n`,
    sum(`fees_arg`) AS `fees`,
    stddev_samp(CAST(`sd_score_arg` AS FLOAT64)) AS `sd_score`,
    var_samp(CAST(`sd_score_arg` AS FLOAT64)) AS `var_score`
  FROM `visits_rows`
  GROUP BY GROUPING SETS ((`patients__ward`), ())
),
`notes_per_visits_cells` AS (
  SELECT
    `patients__ward`,
    `visits__note_per`,
    (GROUPING(`patients__ward`) * 2 + GROUPING(`visits__note_per`)) AS `grouping_id`
  FROM `visits_rows`
  GROUP BY GROUPING SETS ((`patients__ward`, `visits__note_per`), (`visits__note_per`))
),
`notes_per_groups` AS (
  SELECT
    `patients__ward`,
    `visits__note_per`,
    `grouping_id`
  FROM `notes_per_visits_cells`
),
`notes_per` AS (
  SELECT
    `patients__ward`,
    `grouping_id`,
    count(CASE WHEN `visits__note_per` IS NOT NULL THEN 1 END) AS `notes`
  FROM `notes_per_groups`
  GROUP BY `grouping_id`, `patients__ward`
)
SELECT
  `visits_cells`.`patients__ward`,
  `visits_cells`.`visits_n` AS `visits_n`,
  `visits_cells`.`total_minutes` AS `total_minutes`,
  `visits_cells`.`avg_minutes` AS `avg_minutes`,
  (CAST(`visits_cells`.`total_minutes` AS FLOAT64) / NULLIF(`visits_cells`.`visits_n`, 0)) AS `per_visit`,
  (CAST(`visits_cells`.`urgent_n` AS FLOAT64) / NULLIF(`visits_cells`.`visits_n`, 0)) AS `urgent_share`,
  `visits_cells`.`fees` AS `fees`,
  (CAST(`visits_cells`.`fees` AS FLOAT64) / NULLIF(`visits_cells`.`total_minutes`, 0)) AS `fee_per_min`,
  `visits_cells`.`sd_score` AS `sd_score`,
  `visits_cells`.`var_score` AS `var_score`,
  COALESCE(`notes_per`.`notes`, 0) AS `notes`,
  `visits_cells`.`grouping_id`
FROM `visits_cells`
  LEFT JOIN `notes_per` ON `notes_per`.`grouping_id` = CASE `visits_cells`.`grouping_id` WHEN 0 THEN 0 WHEN 1 THEN 2 END
    AND `notes_per`.`patients__ward` IS NOT DISTINCT FROM `visits_cells`.`patients__ward`
ORDER BY (`visits_cells`.`grouping_id` & 1), `visits_cells`.`patients__ward` ASC NULLS LAST;
