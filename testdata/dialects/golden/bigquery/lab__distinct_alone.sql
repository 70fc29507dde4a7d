-- rollwise sql testdata/dialects/lab.roll -m 'patients_seen,urgent_patients' -b patients.ward --totals grand -d bigquery
WITH `visits_rows` AS (
  SELECT
    `patients`.`ward` AS `patients__ward`,
    `visits`.`patient` AS `patients_seen_arg`,
    `visits`.`urgent` AS `urgent_patients_if`
  FROM `lab`.`visits` AS `visits`
  LEFT JOIN `lab`.`patients` AS `patients` ON `visits`.`patient` = `patients`.`id`
),
`visits_cells` AS (
  SELECT
    `patients__ward`,
    GROUPING(`patients__ward`) AS `grouping_id`,
    count(DISTINCT `patients_seen_arg`) AS `patients_seen`,
    count(DISTINCT CASE WHEN `urgent_patients_if` THEN `patients_seen_arg` END) AS `urgent_patients`
  FROM `visits_rows`
  GROUP BY GROUPING SETS ((`patients__ward`), ())
)
SELECT
  `patients__ward`,
  `patients_seen`,
  `urgent_patients`,
  `grouping_id`
FROM `visits_cells`
ORDER BY (`grouping_id` & 1), `patients__ward` ASC NULLS LAST;
