-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,first_seen,last_at' -b 'visits.seen_year,visits.seen_qtr' -d bigquery
WITH `visits_rows` AS (
  SELECT
    (DATE_TRUNC(`visits`.`seen_on`, YEAR)) AS `visits__seen_year`,
    (DATE_TRUNC(`visits`.`seen_on`, QUARTER)) AS `visits__seen_qtr`,
    `visits`.`seen_on` AS `first_seen_arg`,
    `visits`.`seen_at` AS `last_at_arg`
  FROM `lab`.`visits` AS `visits`
),
`visits_cells` AS (
  SELECT
    `visits__seen_year`,
    `visits__seen_qtr`,
    0 AS `grouping_id`,
    count(*) AS `visits_n`,
    min(`first_seen_arg`) AS `first_seen`,
    max(`last_at_arg`) AS `last_at`
  FROM `visits_rows`
  GROUP BY `visits__seen_year`, `visits__seen_qtr`
)
SELECT
  `visits__seen_year`,
  `visits__seen_qtr`,
  `visits_n`,
  `first_seen`,
  `last_at`,
  `grouping_id`
FROM `visits_cells`
ORDER BY `visits__seen_year` ASC NULLS LAST, `visits__seen_qtr` ASC NULLS LAST;
