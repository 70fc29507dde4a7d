-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,first_seen,last_at' -b 'visits.seen_year,visits.seen_qtr' -d mysql
WITH `visits_rows` AS (
  SELECT
    (MAKEDATE(YEAR(`visits`.`seen_on`), 1)) AS `visits.seen_year`,
    (MAKEDATE(YEAR(`visits`.`seen_on`), 1) + INTERVAL (QUARTER(`visits`.`seen_on`) - 1) * 3 MONTH) AS `visits.seen_qtr`,
    `visits`.`seen_on` AS `first_seen_arg`,
    `visits`.`seen_at` AS `last_at_arg`
  FROM `lab`.`visits` AS `visits`
),
`visits_cells` AS (
  SELECT
    `visits.seen_year`,
    `visits.seen_qtr`,
    0 AS `grouping_id`,
    count(*) AS `visits_n`,
    min(`first_seen_arg`) AS `first_seen`,
    max(`last_at_arg`) AS `last_at`
  FROM `visits_rows`
  GROUP BY `visits.seen_year`, `visits.seen_qtr`
)
SELECT
  `visits.seen_year`,
  `visits.seen_qtr`,
  `visits_n`,
  `first_seen`,
  `last_at`,
  `grouping_id`
FROM `visits_cells`
ORDER BY CASE WHEN `visits.seen_year` IS NULL THEN 1 ELSE 0 END, `visits.seen_year` ASC, CASE WHEN `visits.seen_qtr` IS NULL THEN 1 ELSE 0 END, `visits.seen_qtr` ASC;
