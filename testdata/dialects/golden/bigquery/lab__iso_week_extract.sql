-- rollwise sql testdata/dialects/lab.roll -m visits_n -b 'visits.iso_week,visits.quarter_no' --totals all -d bigquery
WITH `visits_rows` AS (
  SELECT
    (EXTRACT(ISOWEEK FROM `visits`.`seen_on`)) AS `visits__iso_week`,
    (EXTRACT(QUARTER FROM `visits`.`seen_on`)) AS `visits__quarter_no`
  FROM `lab`.`visits` AS `visits`
),
`visits_cells` AS (
  SELECT
    `visits__iso_week`,
    `visits__quarter_no`,
    (GROUPING(`visits__iso_week`) * 2 + GROUPING(`visits__quarter_no`)) AS `grouping_id`,
    count(*) AS `visits_n`
  FROM `visits_rows`
  GROUP BY GROUPING SETS ((`visits__iso_week`, `visits__quarter_no`), (`visits__iso_week`), (`visits__quarter_no`), ())
)
SELECT
  `visits__iso_week`,
  `visits__quarter_no`,
  `visits_n`,
  `grouping_id`
FROM `visits_cells`
ORDER BY (`grouping_id` & 2), `visits__iso_week` ASC NULLS LAST, (`grouping_id` & 1), `visits__quarter_no` ASC NULLS LAST;
