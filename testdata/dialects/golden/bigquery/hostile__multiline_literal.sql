-- rollwise sql testdata/dialects/hostile.roll -m 'tot'\''al,n ]--' -w $'`we"ird\'; --`.`na\'me"; DROP` in (\'a\nGO\nb\', \'x\r\n  go 5 \r\ny\', \'back\\\nslash\', \'O\'\'Brien\n\', \'O\'\'Brien\')' -d bigquery
WITH `we"ird'; --_rows` AS (
  SELECT
    `we"ird'; --`.`val\\ue` AS `tot'al_arg`,
    `we"ird'; --`.`id` AS `n ]--_arg`
  FROM `lab_hostile`.`x"y'z\`w]--` AS `we"ird'; --`
  WHERE (`we"ird'; --`.`na'me"; DROP` IN ('a\nGO\nb', 'x\r\n  go 5 \r\ny', 'back\\\nslash', 'O\'Brien\n', 'O\'Brien'))
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
  `grouping_id`
FROM `we"ird'; --_cells`;
