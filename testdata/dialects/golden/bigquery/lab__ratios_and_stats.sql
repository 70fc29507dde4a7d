-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,total_minutes,avg_minutes,per_visit,urgent_share,fees,fee_per_min,sd_score,var_score,notes' -b patients.ward --totals grand -d bigquery
WITH `visits_rows` AS (
  SELECT
    `patients`.`ward` AS `patients__ward`,
    `visits`.`minutes` AS `total_minutes_arg`,
    `visits`.`urgent` AS `urgent_n_if`,
    `visits`.`fee` AS `fees_arg`,
    `visits`.`score` AS `sd_score_arg`,
    `visits`.`note` AS `notes_arg`
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
    var_samp(CAST(`sd_score_arg` AS FLOAT64)) AS `var_score`,
    count(DISTINCT `notes_arg`) AS `notes`
  FROM `visits_rows`
  GROUP BY GROUPING SETS ((`patients__ward`), ())
)
SELECT
  `patients__ward`,
  `visits_n`,
  `total_minutes`,
  `avg_minutes`,
  (CAST(`total_minutes` AS FLOAT64) / NULLIF(`visits_n`, 0)) AS `per_visit`,
  (CAST(`urgent_n` AS FLOAT64) / NULLIF(`visits_n`, 0)) AS `urgent_share`,
  `fees`,
  (CAST(`fees` AS FLOAT64) / NULLIF(`total_minutes`, 0)) AS `fee_per_min`,
  `sd_score`,
  `var_score`,
  `notes`,
  `grouping_id`
FROM `visits_cells`
ORDER BY (`grouping_id` & 1), `patients__ward` ASC NULLS LAST;
