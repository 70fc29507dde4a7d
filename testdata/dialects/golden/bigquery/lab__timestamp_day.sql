-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,last_at' -b visits.seen_day -w 'visits.seen_at >= timestamp '\''2024-01-01 00:00:00'\''' -d bigquery
WITH `visits_rows` AS (
  SELECT
    (DATETIME_TRUNC(`visits`.`seen_at`, DAY)) AS `visits__seen_day`,
    `visits`.`seen_at` AS `last_at_arg`
  FROM `lab`.`visits` AS `visits`
  WHERE (`visits`.`seen_at` >= DATETIME '2024-01-01 00:00:00')
),
`visits_cells` AS (
  SELECT
    `visits__seen_day`,
    0 AS `grouping_id`,
    count(*) AS `visits_n`,
    max(`last_at_arg`) AS `last_at`
  FROM `visits_rows`
  GROUP BY `visits__seen_day`
)
SELECT
  `visits__seen_day`,
  `visits_n`,
  `last_at`,
  `grouping_id`
FROM `visits_cells`
ORDER BY `visits__seen_day` ASC NULLS LAST;
