-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,total_minutes' -b 'visits.seen_month,visits.seen_week' --totals rollup -d bigquery
WITH `visits_rows` AS (
  SELECT
    (DATE_TRUNC(`visits`.`seen_on`, MONTH)) AS `visits__seen_month`,
    (DATE_TRUNC(`visits`.`seen_on`, ISOWEEK)) AS `visits__seen_week`,
    `visits`.`minutes` AS `total_minutes_arg`
  FROM `lab`.`visits` AS `visits`
),
`visits_cells` AS (
  SELECT
    `visits__seen_month`,
    `visits__seen_week`,
    (GROUPING(`visits__seen_month`) * 2 + GROUPING(`visits__seen_week`)) AS `grouping_id`,
    count(*) AS `visits_n`,
    sum(`total_minutes_arg`) AS `total_minutes`
  FROM `visits_rows`
  GROUP BY GROUPING SETS ((`visits__seen_month`, `visits__seen_week`), (`visits__seen_month`), ())
)
SELECT
  `visits__seen_month`,
  `visits__seen_week`,
  `visits_n`,
  `total_minutes`,
  `grouping_id`
FROM `visits_cells`
ORDER BY (`grouping_id` & 2), `visits__seen_month` ASC NULLS LAST, (`grouping_id` & 1), `visits__seen_week` ASC NULLS LAST;
