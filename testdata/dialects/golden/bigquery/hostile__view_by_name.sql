-- rollwise sql testdata/dialects/hostile.roll --view 'by "name"' -d bigquery
WITH `we"ird'; --_rows` AS (
  SELECT
    `we"ird'; --`.`na'me"; DROP` AS `we_ird_______na_me___DROP`,
    `we"ird'; --`.`val\\ue` AS `tot'al_arg`,
    `we"ird'; --`.`id` AS `n ]--_arg`
  FROM `lab_hostile`.`x"y'z\`w]--` AS `we"ird'; --`
),
`we"ird'; --_cells` AS (
  SELECT
    `we_ird_______na_me___DROP`,
    0 AS `grouping_id`,
    sum(`tot'al_arg`) AS `tot'al`,
    count(`n ]--_arg`) AS `n ]--`
  FROM `we"ird'; --_rows`
  GROUP BY `we_ird_______na_me___DROP`
)
SELECT
  `we_ird_______na_me___DROP`,
  `tot'al`,
  `n ]--`,
  (CAST(`tot'al` AS FLOAT64) / NULLIF(`n ]--`, 0)) AS `avg/*x*/`,
  `grouping_id`
FROM `we"ird'; --_cells`
ORDER BY `we_ird_______na_me___DROP` ASC NULLS LAST;
