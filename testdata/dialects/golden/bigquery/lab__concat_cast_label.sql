-- rollwise sql testdata/dialects/lab.roll -m visits_n -b visits.label -d bigquery
WITH `visits_rows` AS (
  SELECT
    (((upper(`visits`.`note`) || '/') || CAST(`visits`.`minutes` AS STRING))) AS `visits__label`
  FROM `lab`.`visits` AS `visits`
),
`visits_cells` AS (
  SELECT
    `visits__label`,
    0 AS `grouping_id`,
    count(*) AS `visits_n`
  FROM `visits_rows`
  GROUP BY `visits__label`
)
SELECT
  `visits__label`,
  `visits_n`,
  `grouping_id`
FROM `visits_cells`
ORDER BY `visits__label` ASC NULLS LAST;
