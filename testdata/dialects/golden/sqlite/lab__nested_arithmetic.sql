-- rollwise sql testdata/dialects/lab.roll -m 'nested_arith,visits_n,total_minutes' -b patients.ward --totals grand -d sqlite
WITH `visits_rows` AS (
  SELECT
    `patients`.`ward` AS `patients.ward`,
    `visits`.`minutes` AS `total_minutes_arg`
  FROM `lab`.`visits` AS `visits`
  LEFT JOIN `lab`.`patients` AS `patients` ON `visits`.`patient` = `patients`.`id`
),
`visits_cells` AS (
  SELECT
    `patients.ward`,
    0 AS `grouping_id`,
    count(*) AS `visits_n`,
    sum(`total_minutes_arg`) AS `total_minutes`
  FROM `visits_rows`
  GROUP BY `patients.ward`
  UNION ALL
  SELECT
    NULL AS `patients.ward`,
    1 AS `grouping_id`,
    count(*) AS `visits_n`,
    sum(`total_minutes_arg`) AS `total_minutes`
  FROM `visits_rows`
)
SELECT
  `patients.ward`,
  (`visits_n` - (`total_minutes` - `visits_n`) - `visits_n` * (`visits_n` - 2) + CAST(coalesce(`total_minutes` - 100, 0) AS REAL) / NULLIF((`visits_n` - 6), 0)) AS `nested_arith`,
  `visits_n`,
  `total_minutes`,
  `grouping_id`
FROM `visits_cells`
ORDER BY (`grouping_id` & 1), `patients.ward` ASC NULLS LAST;
