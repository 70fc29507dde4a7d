-- rollwise sql testdata/dialects/lab.roll -m visits_n -b 'visits.iso_week,visits.quarter_no' --totals all -d mysql
WITH `visits_rows` AS (
  SELECT
    (WEEK(`visits`.`seen_on`, 3)) AS `visits.iso_week`,
    (EXTRACT(QUARTER FROM `visits`.`seen_on`)) AS `visits.quarter_no`
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
ORDER BY (`grouping_id` & 2), CASE WHEN `visits.iso_week` IS NULL THEN 1 ELSE 0 END, `visits.iso_week` ASC, (`grouping_id` & 1), CASE WHEN `visits.quarter_no` IS NULL THEN 1 ELSE 0 END, `visits.quarter_no` ASC;
