-- rollwise sql testdata/dialects/hostile.roll --view 'by '\''label'\''' --totals rollup -d bigquery
WITH `we"ird'; --_rows` AS (
  SELECT
    `gr/*oup*/`.`la"bel'` AS `gr__oup____la_bel_`,
    `we"ird'; --`.`üñí 名` AS `we_ird_______üñí_名`,
    `we"ird'; --`.`val\\ue` AS `tot'al_arg`,
    `we"ird'; --`.`na'me"; DROP` AS `names#_arg`
  FROM `lab_hostile`.`x"y'z\`w]--` AS `we"ird'; --`
  LEFT JOIN `lab_hostile`.`g]-- #` AS `gr/*oup*/` ON `we"ird'; --`.`[grp]` = `gr/*oup*/`.`id`
),
`we"ird'; --_cells` AS (
  SELECT
    `gr__oup____la_bel_`,
    `we_ird_______üñí_名`,
    (GROUPING(`gr__oup____la_bel_`) * 2 + GROUPING(`we_ird_______üñí_名`)) AS `grouping_id`,
    sum(`tot'al_arg`) AS `tot'al`,
    count(DISTINCT `names#_arg`) AS `names#`
  FROM `we"ird'; --_rows`
  GROUP BY GROUPING SETS ((`gr__oup____la_bel_`, `we_ird_______üñí_名`), (`gr__oup____la_bel_`), ())
)
SELECT
  `gr__oup____la_bel_`,
  `we_ird_______üñí_名`,
  `tot'al`,
  `names#`,
  `grouping_id`
FROM `we"ird'; --_cells`
ORDER BY (`grouping_id` & 2), `gr__oup____la_bel_` ASC NULLS LAST, (`grouping_id` & 1), `we_ird_______üñí_名` ASC NULLS LAST;
