-- rollwise sql testdata/dialects/lab.roll -m visits_n -b visits.label -d mysql
WITH `visits_rows` AS (
  SELECT
    (CONCAT(CONCAT(upper(`visits`.`note`), '/'), CAST(`visits`.`minutes` AS CHAR))) AS `visits.label`
  FROM `lab`.`visits` AS `visits`
),
`visits_cells` AS (
  SELECT
    `visits.label`,
    0 AS `grouping_id`,
    count(*) AS `visits_n`
  FROM `visits_rows`
  GROUP BY `visits.label`
)
SELECT
  `visits.label`,
  `visits_n`,
  `grouping_id`
FROM `visits_cells`
ORDER BY CASE WHEN `visits.label` IS NULL THEN 1 ELSE 0 END, `visits.label` ASC;
