-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m units -b 'stores.region,sales.item' --totals all -d mysql
WITH `sales_rows` AS (
  SELECT
    `stores`.`region` AS `stores.region`,
    `sales`.`item` AS `sales.item`,
    `sales`.`qty` AS `units_arg`
  FROM `shop`.`sales` AS `sales`
  LEFT JOIN `shop`.`stores` AS `stores` ON `sales`.`store_id` = `stores`.`id`
),
`sales_cells` AS (
  SELECT
    `stores.region`,
    `sales.item`,
    0 AS `grouping_id`,
    sum(`units_arg`) AS `units`
  FROM `sales_rows`
  GROUP BY `stores.region`, `sales.item`
  UNION ALL
  SELECT
    `stores.region`,
    NULL AS `sales.item`,
    1 AS `grouping_id`,
    sum(`units_arg`) AS `units`
  FROM `sales_rows`
  GROUP BY `stores.region`
  UNION ALL
  SELECT
    NULL AS `stores.region`,
    `sales.item`,
    2 AS `grouping_id`,
    sum(`units_arg`) AS `units`
  FROM `sales_rows`
  GROUP BY `sales.item`
  UNION ALL
  SELECT
    NULL AS `stores.region`,
    NULL AS `sales.item`,
    3 AS `grouping_id`,
    sum(`units_arg`) AS `units`
  FROM `sales_rows`
)
SELECT
  `stores.region`,
  `sales.item`,
  `units`,
  `grouping_id`
FROM `sales_cells`
ORDER BY (`grouping_id` & 2), CASE WHEN `stores.region` IS NULL THEN 1 ELSE 0 END, `stores.region` ASC, (`grouping_id` & 1), CASE WHEN `sales.item` IS NULL THEN 1 ELSE 0 END, `sales.item` ASC;
