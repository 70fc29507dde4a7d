-- rollwise sql testdata/dialects/hostile.roll --view 'by "name"' -d mysql
WITH `we"ird'; --_rows` AS (
  SELECT
    `we"ird'; --`.`na'me"; DROP` AS `we"ird'; --.na'me"; DROP`,
    `we"ird'; --`.`val\ue` AS `tot'al_arg`,
    `we"ird'; --`.`id` AS `n ]--_arg`
  FROM `lab_hostile`.`x"y'z``w]--` AS `we"ird'; --`
),
`we"ird'; --_cells` AS (
  SELECT
    `we"ird'; --.na'me"; DROP`,
    0 AS `grouping_id`,
    sum(`tot'al_arg`) AS `tot'al`,
    count(`n ]--_arg`) AS `n ]--`
  FROM `we"ird'; --_rows`
  GROUP BY `we"ird'; --.na'me"; DROP`
)
SELECT
  `we"ird'; --.na'me"; DROP`,
  `tot'al`,
  `n ]--`,
  (CAST(`tot'al` AS DOUBLE) / NULLIF(`n ]--`, 0)) AS `avg/*x*/`,
  `grouping_id`
FROM `we"ird'; --_cells`
ORDER BY CASE WHEN `we"ird'; --.na'me"; DROP` IS NULL THEN 1 ELSE 0 END, `we"ird'; --.na'me"; DROP` ASC;
