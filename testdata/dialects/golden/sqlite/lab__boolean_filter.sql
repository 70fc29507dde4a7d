-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,fees' -b visits.urgent -w 'visits.urgent or visits.minutes > 40' --totals grand -d sqlite
WITH `visits_rows` AS (
  SELECT
    `visits`.`urgent` AS `visits.urgent`,
    `visits`.`fee` AS `fees_arg`
  FROM `lab`.`visits` AS `visits`
  WHERE (`visits`.`urgent` OR (`visits`.`minutes` > 40))
),
`visits_cells` AS (
  SELECT
    `visits.urgent`,
    0 AS `grouping_id`,
    count(*) AS `visits_n`,
    sum(`fees_arg`) AS `fees`
  FROM `visits_rows`
  GROUP BY `visits.urgent`
  UNION ALL
  SELECT
    NULL AS `visits.urgent`,
    1 AS `grouping_id`,
    count(*) AS `visits_n`,
    sum(`fees_arg`) AS `fees`
  FROM `visits_rows`
)
SELECT
  `visits.urgent`,
  `visits_n`,
  `fees`,
  `grouping_id`
FROM `visits_cells`
ORDER BY (`grouping_id` & 1), `visits.urgent` ASC NULLS LAST;
