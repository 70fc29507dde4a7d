-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,margin_rate' -b stores.region --totals grand -d bigquery
WITH `sales_rows` AS (
  SELECT
    `stores`.`region` AS `stores__region`,
    (`sales`.`price` * `sales`.`qty`) AS `revenue_arg`,
    (`sales`.`cost` * `sales`.`qty`) AS `cost_arg`
  FROM `shop`.`sales` AS `sales`
  LEFT JOIN `shop`.`stores` AS `stores` ON `sales`.`store_id` = `stores`.`id`
),
`sales_cells` AS (
  SELECT
    `stores__region`,
    GROUPING(`stores__region`) AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`,
    sum(`cost_arg`) AS `cost`
  FROM `sales_rows`
  GROUP BY GROUPING SETS ((`stores__region`), ())
)
SELECT
  `stores__region`,
  `revenue`,
  (CAST((`revenue` - `cost`) AS FLOAT64) / NULLIF(`revenue`, 0)) AS `margin_rate`,
  `grouping_id`
FROM `sales_cells`
ORDER BY (`grouping_id` & 1), `stores__region` ASC NULLS LAST;
