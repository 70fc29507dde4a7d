-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,item_share,shown_share,rose_fern' -b 'stores.region,sales.item' --totals rollup -w 'sales.item <> '\''tulip'\''' -d bigquery
WITH `sales_rows` AS (
  SELECT
    `stores`.`region` AS `stores__region`,
    `sales`.`item` AS `sales__item`,
    (`sales`.`price` * `sales`.`qty`) AS `revenue_arg`
  FROM `shop`.`sales` AS `sales`
  LEFT JOIN `shop`.`stores` AS `stores` ON `sales`.`store_id` = `stores`.`id`
  WHERE (`sales`.`item` <> 'tulip')
),
`sales_cells` AS (
  SELECT
    `stores__region`,
    `sales__item`,
    (GROUPING(`stores__region`) * 2 + GROUPING(`sales__item`)) AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`
  FROM `sales_rows`
  GROUP BY GROUPING SETS ((`stores__region`, `sales__item`), (`stores__region`), ())
),
`item_share_sales_rows` AS (
  SELECT
    `stores`.`region` AS `stores__region`,
    (`sales`.`price` * `sales`.`qty`) AS `item_share_revenue_arg`,
    (`sales`.`item` IN ('rose', 'fern')) AS `rose_fern_revenue_if`
  FROM `shop`.`sales` AS `sales`
  LEFT JOIN `shop`.`stores` AS `stores` ON `sales`.`store_id` = `stores`.`id`
),
`item_share_sales_cells` AS (
  SELECT
    `stores__region`,
    GROUPING(`stores__region`) AS `grouping_id`,
    sum(`item_share_revenue_arg`) AS `item_share_revenue`,
    sum(CASE WHEN `rose_fern_revenue_if` THEN `item_share_revenue_arg` END) AS `rose_fern_revenue`
  FROM `item_share_sales_rows`
  GROUP BY GROUPING SETS ((`stores__region`), ())
)
SELECT
  `sales_cells`.`stores__region`,
  `sales_cells`.`sales__item`,
  `sales_cells`.`revenue` AS `revenue`,
  (CAST(`sales_cells`.`revenue` AS FLOAT64) / NULLIF(`item_share_sales_cells`.`item_share_revenue`, 0)) AS `item_share`,
  (CAST(`sales_cells`.`revenue` AS FLOAT64) / NULLIF(sum(`sales_cells`.`revenue`) OVER (PARTITION BY `sales_cells`.`grouping_id`, `sales_cells`.`stores__region`), 0)) AS `shown_share`,
  `item_share_sales_cells`.`rose_fern_revenue` AS `rose_fern`,
  `sales_cells`.`grouping_id`
FROM `sales_cells`
  LEFT JOIN `item_share_sales_cells` ON `item_share_sales_cells`.`grouping_id` = CASE `sales_cells`.`grouping_id` WHEN 0 THEN 0 WHEN 1 THEN 0 WHEN 3 THEN 1 END
    AND `item_share_sales_cells`.`stores__region` IS NOT DISTINCT FROM `sales_cells`.`stores__region`
ORDER BY (`sales_cells`.`grouping_id` & 2), `sales_cells`.`stores__region` ASC NULLS LAST, (`sales_cells`.`grouping_id` & 1), `sales_cells`.`sales__item` ASC NULLS LAST;
