-- rollwise sql testdata/dialects/hostile.roll -m 'tot'\''al,n ]--,avg/*x*/' -w '`we"ird'\''; --`.`na'\''me"; DROP` in ('\''O'\'''\''Brien'\'', '\''x'\'''\''; DROP TABLE t; --'\'', '\''back\slash'\'', '\''ends with \'\'', '\''-- comment'\'', '\''/* open'\'', '\''ünï 名 🌱  '\'')' -d bigquery
WITH `we"ird'; --_rows` AS (
  SELECT
    `we"ird'; --`.`val\\ue` AS `tot'al_arg`,
    `we"ird'; --`.`id` AS `n ]--_arg`
  FROM `lab_hostile`.`x"y'z\`w]--` AS `we"ird'; --`
  WHERE (`we"ird'; --`.`na'me"; DROP` IN ('O\'Brien', 'x\'; DROP TABLE t; --', 'back\\slash', 'ends with \\', '-- comment', '/* open', 'ünï 名 🌱  '))
),
`we"ird'; --_cells` AS (
  SELECT
    0 AS `grouping_id`,
    sum(`tot'al_arg`) AS `tot'al`,
    count(`n ]--_arg`) AS `n ]--`
  FROM `we"ird'; --_rows`
)
SELECT
  `tot'al`,
  `n ]--`,
  (CAST(`tot'al` AS FLOAT64) / NULLIF(`n ]--`, 0)) AS `avg/*x*/`,
  `grouping_id`
FROM `we"ird'; --_cells`;
