-- rollwise sql testdata/dialects/lab.roll -m visits_n -b 'visits.iso_week,visits.quarter_no' --totals all -d sqlite
WITH `visits_rows` AS (
  SELECT
    (CAST(strftime('%V', `visits`.`seen_on`) AS INTEGER)) AS `visits.iso_week`,
    (((CAST(strftime('%m', `visits`.`seen_on`) AS INTEGER) + 2) / 3)) AS `visits.quarter_no`
  FROM `lab`.`visits` AS `visits`
),
`visits_cells` AS (
  SELECT
    `visits.iso_week`,
    `visits.quarter_no`,
    0 AS `grouping_id`,
    count(*) AS `visits_n`
  FROM `visits_rows`
  GROUP BY `visits.iso_week`, `visits.quarter_no`
  UNION ALL
  SELECT
    `visits.iso_week`,
    NULL AS `visits.quarter_no`,
    1 AS `grouping_id`,
    count(*) AS `visits_n`
  FROM `visits_rows`
  GROUP BY `visits.iso_week`
  UNION ALL
  SELECT
    NULL AS `visits.iso_week`,
    `visits.quarter_no`,
    2 AS `grouping_id`,
    count(*) AS `visits_n`
  FROM `visits_rows`
  GROUP BY `visits.quarter_no`
  UNION ALL
  SELECT
    NULL AS `visits.iso_week`,
    NULL AS `visits.quarter_no`,
    3 AS `grouping_id`,
    count(*) AS `visits_n`
  FROM `visits_rows`
)
SELECT
  `visits.iso_week`,
  `visits.quarter_no`,
  `visits_n`,
  `grouping_id`
FROM `visits_cells`
ORDER BY (`grouping_id` & 2), `visits.iso_week` ASC NULLS LAST, (`grouping_id` & 1), `visits.quarter_no` ASC NULLS LAST;
