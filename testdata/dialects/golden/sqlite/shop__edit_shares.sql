-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,item_share,shown_share,rose_fern' -b 'stores.region,sales.item' --totals rollup -w 'sales.item <> '\''tulip'\''' -d sqlite
WITH `sales_rows` AS (
  SELECT
    `stores`.`region` AS `stores.region`,
    `sales`.`item` AS `sales.item`,
    (`sales`.`price` * `sales`.`qty`) AS `revenue_arg`
  FROM `shop`.`sales` AS `sales`
  LEFT JOIN `shop`.`stores` AS `stores` ON `sales`.`store_id` = `stores`.`id`
  WHERE (`sales`.`item` <> 'tulip')
),
`sales_cells` AS (
  SELECT
    `stores.region`,
    `sales.item`,
    0 AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`
  FROM `sales_rows`
  GROUP BY `stores.region`, `sales.item`
  UNION ALL
  SELECT
    `stores.region`,
    NULL AS `sales.item`,
    1 AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`
  FROM `sales_rows`
  GROUP BY `stores.region`
  UNION ALL
  SELECT
    NULL AS `stores.region`,
    NULL AS `sales.item`,
    3 AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`
  FROM `sales_rows`
),
`item_share_sales_rows` AS (
  SELECT
    `stores`.`region` AS `stores.region`,
    (`sales`.`price` * `sales`.`qty`) AS `item_share_revenue_arg`,
    (`sales`.`item` IN ('rose', 'fern')) AS `rose_fern_revenue_if`
  FROM `shop`.`sales` AS `sales`
  LEFT JOIN `shop`.`stores` AS `stores` ON `sales`.`store_id` = `stores`.`id`
),
`item_share_sales_cells` AS (
  SELECT
    `stores.region`,
    0 AS `grouping_id`,
    sum(`item_share_revenue_arg`) AS `item_share_revenue`,
    sum(`item_share_revenue_arg`) FILTER (WHERE `rose_fern_revenue_if`) AS `rose_fern_revenue`
  FROM `item_share_sales_rows`
  GROUP BY `stores.region`
  UNION ALL
  SELECT
    NULL AS `stores.region`,
    1 AS `grouping_id`,
    sum(`item_share_revenue_arg`) AS `item_share_revenue`,
    sum(`item_share_revenue_arg`) FILTER (WHERE `rose_fern_revenue_if`) AS `rose_fern_revenue`
  FROM `item_share_sales_rows`
)
SELECT
  `sales_cells`.`stores.region`,
  `sales_cells`.`sales.item`,
  `sales_cells`.`revenue` AS `revenue`,
  (CAST(`sales_cells`.`revenue` AS REAL) / NULLIF(`item_share_sales_cells`.`item_share_revenue`, 0)) AS `item_share`,
  (CAST(`sales_cells`.`revenue` AS REAL) / NULLIF(sum(`sales_cells`.`revenue`) OVER (PARTITION BY `sales_cells`.`grouping_id`, `sales_cells`.`stores.region`), 0)) AS `shown_share`,
  `item_share_sales_cells`.`rose_fern_revenue` AS `rose_fern`,
  `sales_cells`.`grouping_id`
FROM `sales_cells`
  LEFT JOIN `item_share_sales_cells` ON `item_share_sales_cells`.`grouping_id` = CASE `sales_cells`.`grouping_id` WHEN 0 THEN 0 WHEN 1 THEN 0 WHEN 3 THEN 1 END
    AND `item_share_sales_cells`.`stores.region` IS `sales_cells`.`stores.region`
ORDER BY (`sales_cells`.`grouping_id` & 2), `sales_cells`.`stores.region` ASC NULLS LAST, (`sales_cells`.`grouping_id` & 1), `sales_cells`.`sales.item` ASC NULLS LAST;
