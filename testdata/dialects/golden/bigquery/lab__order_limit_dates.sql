-- rollwise sql testdata/dialects/lab.roll -m total_minutes -b visits.seen_month --order 'total_minutes desc' --limit 3 --totals grand -d bigquery
WITH `visits_rows` AS (
  SELECT
    (DATE_TRUNC(`visits`.`seen_on`, MONTH)) AS `visits__seen_month`,
    `visits`.`minutes` AS `total_minutes_arg`
  FROM `lab`.`visits` AS `visits`
),
`visits_cells` AS (
  SELECT
    `visits__seen_month`,
    GROUPING(`visits__seen_month`) AS `grouping_id`,
    sum(`total_minutes_arg`) AS `total_minutes`
  FROM `visits_rows`
  GROUP BY GROUPING SETS ((`visits__seen_month`), ())
),
`result` AS (
  SELECT
    `visits__seen_month`,
    `total_minutes`,
    `grouping_id`
  FROM `visits_cells`
),
`result_ranked` AS (
  SELECT
    `visits__seen_month`,
    `total_minutes`,
    `grouping_id`,
    count(*) OVER (PARTITION BY `grouping_id` ORDER BY CASE WHEN `grouping_id` = 0 THEN 0 ELSE 1 END, `total_minutes` DESC NULLS LAST, (`grouping_id` & 1), `visits__seen_month` ASC NULLS LAST ROWS BETWEEN UNBOUNDED PRECEDING AND CURRENT ROW) AS `detail_rank`
  FROM `result`
)
SELECT
  `visits__seen_month`,
  `total_minutes`,
  `grouping_id`
FROM `result_ranked`
WHERE (`grouping_id` = 0 AND `detail_rank` <= 3)
  OR `grouping_id` = 1
ORDER BY CASE WHEN `grouping_id` = 0 THEN 0 ELSE 1 END, `total_minutes` DESC NULLS LAST, (`grouping_id` & 1), `visits__seen_month` ASC NULLS LAST;
