-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,item_share,rose_rev,region_share,store_avg' -b 'stores.region,sales.item' --totals rollup -d bigquery
WITH `sales_rows` AS (
  SELECT
    `stores`.`region` AS `stores__region`,
    `sales`.`item` AS `sales__item`,
    (`sales`.`price` * `sales`.`qty`) AS `revenue_arg`,
    (`sales`.`item` = 'rose') AS `rose_rev_revenue_if_2`,
    `sales`.`store_id` AS `sales__store_id_per`
  FROM `shop`.`sales` AS `sales`
  LEFT JOIN `shop`.`stores` AS `stores` ON `sales`.`store_id` = `stores`.`id`
),
`sales_cells` AS (
  SELECT
    `stores__region`,
    `sales__item`,
    (GROUPING(`stores__region`) * 2 + GROUPING(`sales__item`)) AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`,
    sum(CASE WHEN `rose_rev_revenue_if_2` THEN `revenue_arg` END) AS `rose_rev_revenue_cell`
  FROM `sales_rows`
  GROUP BY GROUPING SETS ((`stores__region`, `sales__item`), (`stores__region`), ())
),
`store_avg_per_sales_cells` AS (
  SELECT
    `stores__region`,
    `sales__item`,
    `sales__store_id_per`,
    (GROUPING(`stores__region`) * 4 + GROUPING(`sales__item`) * 2 + GROUPING(`sales__store_id_per`)) AS `grouping_id`,
    sum(`revenue_arg`) AS `store_avg_per_revenue`
  FROM `sales_rows`
  GROUP BY GROUPING SETS ((`stores__region`, `sales__item`, `sales__store_id_per`), (`stores__region`, `sales__store_id_per`), (`sales__store_id_per`))
),
`store_avg_per_groups` AS (
  SELECT
    `stores__region`,
    `sales__item`,
    `sales__store_id_per`,
    `grouping_id`,
    `store_avg_per_revenue` AS `store_avg_value`
  FROM `store_avg_per_sales_cells`
),
`store_avg_per` AS (
  SELECT
    `stores__region`,
    `sales__item`,
    `grouping_id`,
    avg(CAST(CASE WHEN `sales__store_id_per` IS NOT NULL THEN `store_avg_value` END AS FLOAT64)) AS `store_avg`
  FROM `store_avg_per_groups`
  GROUP BY `grouping_id`, `stores__region`, `sales__item`
)
SELECT
  `sales_cells`.`stores__region`,
  `sales_cells`.`sales__item`,
  `sales_cells`.`revenue` AS `revenue`,
  (CAST(`sales_cells`.`revenue` AS FLOAT64) / NULLIF(sum(`sales_cells`.`revenue`) OVER (PARTITION BY `sales_cells`.`grouping_id`, `sales_cells`.`stores__region`), 0)) AS `item_share`,
  sum(`sales_cells`.`rose_rev_revenue_cell`) OVER (PARTITION BY `sales_cells`.`grouping_id`, `sales_cells`.`stores__region`) AS `rose_rev`,
  (CAST(`sales_cells`.`revenue` AS FLOAT64) / NULLIF(sum(`sales_cells`.`revenue`) OVER (PARTITION BY `sales_cells`.`grouping_id`, `sales_cells`.`sales__item`), 0)) AS `region_share`,
  `store_avg_per`.`store_avg` AS `store_avg`,
  `sales_cells`.`grouping_id`
FROM `sales_cells`
  LEFT JOIN `store_avg_per` ON `store_avg_per`.`grouping_id` = CASE `sales_cells`.`grouping_id` WHEN 0 THEN 0 WHEN 1 THEN 2 WHEN 3 THEN 6 END
    AND `store_avg_per`.`stores__region` IS NOT DISTINCT FROM `sales_cells`.`stores__region`
    AND `store_avg_per`.`sales__item` IS NOT DISTINCT FROM `sales_cells`.`sales__item`
ORDER BY (`sales_cells`.`grouping_id` & 2), `sales_cells`.`stores__region` ASC NULLS LAST, (`sales_cells`.`grouping_id` & 1), `sales_cells`.`sales__item` ASC NULLS LAST;
