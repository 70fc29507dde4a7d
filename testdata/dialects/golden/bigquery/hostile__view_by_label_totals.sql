-- rollwise sql testdata/dialects/hostile.roll --view 'by '\''label'\''' --totals rollup -d bigquery
WITH `we"ird'; --_rows` AS (
  SELECT
    `gr/*oup*/`.`la"bel'` AS `gr__oup____la_bel_`,
    `we"ird'; --`.`üñí 名` AS `we_ird_______üñí_名`,
    `we"ird'; --`.`val\\ue` AS `tot'al_arg`,
    `we"ird'; --`.`na'me"; DROP` AS `we_ird_______na_me___DROP_per`
  FROM `lab_hostile`.`x"y'z\`w]--` AS `we"ird'; --`
  LEFT JOIN `lab_hostile`.`g]-- #` AS `gr/*oup*/` ON `we"ird'; --`.`[grp]` = `gr/*oup*/`.`id`
),
`we"ird'; --_cells` AS (
  SELECT
    `gr__oup____la_bel_`,
    `we_ird_______üñí_名`,
    (GROUPING(`gr__oup____la_bel_`) * 2 + GROUPING(`we_ird_______üñí_名`)) AS `grouping_id`,
    sum(`tot'al_arg`) AS `tot'al`
  FROM `we"ird'; --_rows`
  GROUP BY GROUPING SETS ((`gr__oup____la_bel_`, `we_ird_______üñí_名`), (`gr__oup____la_bel_`), ())
),
`names#_per_we"ird'; --_cells` AS (
  SELECT
    `gr__oup____la_bel_`,
    `we_ird_______üñí_名`,
    `we_ird_______na_me___DROP_per`,
    (GROUPING(`gr__oup____la_bel_`) * 4 + GROUPING(`we_ird_______üñí_名`) * 2 + GROUPING(`we_ird_______na_me___DROP_per`)) AS `grouping_id`
  FROM `we"ird'; --_rows`
  GROUP BY GROUPING SETS ((`gr__oup____la_bel_`, `we_ird_______üñí_名`, `we_ird_______na_me___DROP_per`), (`gr__oup____la_bel_`, `we_ird_______na_me___DROP_per`), (`we_ird_______na_me___DROP_per`))
),
`names#_per_groups` AS (
  SELECT
    `gr__oup____la_bel_`,
    `we_ird_______üñí_名`,
    `we_ird_______na_me___DROP_per`,
    `grouping_id`
  FROM `names#_per_we"ird'; --_cells`
),
`names#_per` AS (
  SELECT
    `gr__oup____la_bel_`,
    `we_ird_______üñí_名`,
    `grouping_id`,
    count(CASE WHEN `we_ird_______na_me___DROP_per` IS NOT NULL THEN 1 END) AS `names#`
  FROM `names#_per_groups`
  GROUP BY `grouping_id`, `gr__oup____la_bel_`, `we_ird_______üñí_名`
)
SELECT
  `we"ird'; --_cells`.`gr__oup____la_bel_`,
  `we"ird'; --_cells`.`we_ird_______üñí_名`,
  `we"ird'; --_cells`.`tot'al` AS `tot'al`,
  COALESCE(`names#_per`.`names#`, 0) AS `names#`,
  `we"ird'; --_cells`.`grouping_id`
FROM `we"ird'; --_cells`
  LEFT JOIN `names#_per` ON `names#_per`.`grouping_id` = CASE `we"ird'; --_cells`.`grouping_id` WHEN 0 THEN 0 WHEN 1 THEN 2 WHEN 3 THEN 6 END
    AND `names#_per`.`gr__oup____la_bel_` IS NOT DISTINCT FROM `we"ird'; --_cells`.`gr__oup____la_bel_`
    AND `names#_per`.`we_ird_______üñí_名` IS NOT DISTINCT FROM `we"ird'; --_cells`.`we_ird_______üñí_名`
ORDER BY (`we"ird'; --_cells`.`grouping_id` & 2), `we"ird'; --_cells`.`gr__oup____la_bel_` ASC NULLS LAST, (`we"ird'; --_cells`.`grouping_id` & 1), `we"ird'; --_cells`.`we_ird_______üñí_名` ASC NULLS LAST;
