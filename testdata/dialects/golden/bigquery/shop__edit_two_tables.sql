-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'fee_share,north_share' -b stores.region --totals all -d bigquery
WITH `repairs_rows` AS (
  SELECT
    `stores`.`region` AS `stores__region`,
    `repairs`.`fee` AS `fees_arg`
  FROM `shop`.`repairs` AS `repairs`
  LEFT JOIN `shop`.`stores` AS `stores` ON `repairs`.`store_id` = `stores`.`id`
),
`repairs_cells` AS (
  SELECT
    `stores__region`,
    GROUPING(`stores__region`) AS `grouping_id`,
    sum(`fees_arg`) AS `fees`
  FROM `repairs_rows`
  GROUP BY GROUPING SETS ((`stores__region`), ())
),
`fee_share_repairs_rows` AS (
  SELECT
    `repairs`.`fee` AS `fee_share_fees_arg`
  FROM `shop`.`repairs` AS `repairs`
),
`fee_share_repairs_cells` AS (
  SELECT
    0 AS `grouping_id`,
    sum(`fee_share_fees_arg`) AS `fee_share_fees`
  FROM `fee_share_repairs_rows`
),
`sales_rows` AS (
  SELECT
    `stores`.`region` AS `stores__region`,
    (`sales`.`price` * `sales`.`qty`) AS `north_share_arg`,
    (`stores`.`region` = 'North') AS `north_share_if`
  FROM `shop`.`sales` AS `sales`
  LEFT JOIN `shop`.`stores` AS `stores` ON `sales`.`store_id` = `stores`.`id`
),
`sales_cells` AS (
  SELECT
    `stores__region`,
    GROUPING(`stores__region`) AS `grouping_id`,
    sum(CASE WHEN `north_share_if` THEN `north_share_arg` END) AS `north_share`
  FROM `sales_rows`
  GROUP BY GROUPING SETS ((`stores__region`), ())
),
`north_share_sales_rows` AS (
  SELECT
    (`sales`.`price` * `sales`.`qty`) AS `north_share_revenue_arg`
  FROM `shop`.`sales` AS `sales`
),
`north_share_sales_cells` AS (
  SELECT
    0 AS `grouping_id`,
    sum(`north_share_revenue_arg`) AS `north_share_revenue`
  FROM `north_share_sales_rows`
),
`cells` AS (
  SELECT `grouping_id`, `stores__region` FROM `repairs_cells`
  UNION
  SELECT `grouping_id`, `stores__region` FROM `sales_cells`
)
SELECT
  `cells`.`stores__region`,
  (CAST(`repairs_cells`.`fees` AS FLOAT64) / NULLIF(`fee_share_repairs_cells`.`fee_share_fees`, 0)) AS `fee_share`,
  (CAST(`sales_cells`.`north_share` AS FLOAT64) / NULLIF(`north_share_sales_cells`.`north_share_revenue`, 0)) AS `north_share`,
  `cells`.`grouping_id`
FROM `cells`
  LEFT JOIN `repairs_cells` ON `repairs_cells`.`grouping_id` = `cells`.`grouping_id`
    AND `repairs_cells`.`stores__region` IS NOT DISTINCT FROM `cells`.`stores__region`
  LEFT JOIN `fee_share_repairs_cells` ON 1 = 1
  LEFT JOIN `sales_cells` ON `sales_cells`.`grouping_id` = `cells`.`grouping_id`
    AND `sales_cells`.`stores__region` IS NOT DISTINCT FROM `cells`.`stores__region`
  LEFT JOIN `north_share_sales_cells` ON 1 = 1
ORDER BY (`cells`.`grouping_id` & 1), `cells`.`stores__region` ASC NULLS LAST;
