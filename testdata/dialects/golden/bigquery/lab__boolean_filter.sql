-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,fees' -b visits.urgent -w 'visits.urgent or visits.minutes > 40' --totals grand -d bigquery
WITH `visits_rows` AS (
  SELECT
    `visits`.`urgent` AS `visits__urgent`,
    `visits`.`fee` AS `fees_arg`
  FROM `lab`.`visits` AS `visits`
  WHERE (`visits`.`urgent` OR (`visits`.`minutes` > 40))
),
`visits_cells` AS (
  SELECT
    `visits__urgent`,
    GROUPING(`visits__urgent`) AS `grouping_id`,
    count(*) AS `visits_n`,
    sum(`fees_arg`) AS `fees`
  FROM `visits_rows`
  GROUP BY GROUPING SETS ((`visits__urgent`), ())
)
SELECT
  `visits__urgent`,
  `visits_n`,
  `fees`,
  `grouping_id`
FROM `visits_cells`
ORDER BY (`grouping_id` & 1), `visits__urgent` ASC NULLS LAST;
