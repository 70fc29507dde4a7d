-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,total_minutes' -b 'visits.seen_month,visits.seen_week' --totals rollup -d mysql
WITH `visits_rows` AS (
  SELECT
    (DATE_SUB(CAST(`visits`.`seen_on` AS DATE), INTERVAL DAYOFMONTH(`visits`.`seen_on`) - 1 DAY)) AS `visits.seen_month`,
    (DATE_SUB(CAST(`visits`.`seen_on` AS DATE), INTERVAL WEEKDAY(`visits`.`seen_on`) DAY)) AS `visits.seen_week`,
    `visits`.`minutes` AS `total_minutes_arg`
  FROM `lab`.`visits` AS `visits`
),
`visits_cells` AS (
  SELECT
    `visits.seen_month`,
    `visits.seen_week`,
    0 AS `grouping_id`,
    count(*) AS `visits_n`,
    sum(`total_minutes_arg`) AS `total_minutes`
  FROM `visits_rows`
  GROUP BY `visits.seen_month`, `visits.seen_week`
  UNION ALL
  SELECT
    `visits.seen_month`,
    NULL AS `visits.seen_week`,
    1 AS `grouping_id`,
    count(*) AS `visits_n`,
    sum(`total_minutes_arg`) AS `total_minutes`
  FROM `visits_rows`
  GROUP BY `visits.seen_month`
  UNION ALL
  SELECT
    NULL AS `visits.seen_month`,
    NULL AS `visits.seen_week`,
    3 AS `grouping_id`,
    count(*) AS `visits_n`,
    sum(`total_minutes_arg`) AS `total_minutes`
  FROM `visits_rows`
)
SELECT
  `visits.seen_month`,
  `visits.seen_week`,
  `visits_n`,
  `total_minutes`,
  `grouping_id`
FROM `visits_cells`
ORDER BY (`grouping_id` & 2), CASE WHEN `visits.seen_month` IS NULL THEN 1 ELSE 0 END, `visits.seen_month` ASC, (`grouping_id` & 1), CASE WHEN `visits.seen_week` IS NULL THEN 1 ELSE 0 END, `visits.seen_week` ASC;
