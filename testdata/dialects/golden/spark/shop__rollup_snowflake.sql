-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,units' -b 'districts.area,sales.item' --totals rollup -d spark
WITH `sales_rows` AS (
  SELECT
    `districts`.`area` AS `districts.area`,
    `sales`.`item` AS `sales.item`,
    (`sales`.`price` * `sales`.`qty`) AS `revenue_arg`,
    `sales`.`qty` AS `units_arg`
  FROM `shop`.`sales` AS `sales`
  LEFT JOIN `shop`.`stores` AS `stores` ON `sales`.`store_id` = `stores`.`id`
  LEFT JOIN `districts` AS `districts` ON `stores`.`district_id` = `districts`.`id`
),
`sales_cells` AS (
  SELECT
    `districts.area`,
    `sales.item`,
    grouping_id(`districts.area`, `sales.item`) AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`,
    sum(`units_arg`) AS `units`
  FROM `sales_rows`
  GROUP BY GROUPING SETS ((`districts.area`, `sales.item`), (`districts.area`), ())
)
SELECT
  `districts.area`,
  `sales.item`,
  `revenue`,
  `units`,
  `grouping_id`
FROM `sales_cells`
ORDER BY (`grouping_id` & 2), `districts.area` ASC NULLS LAST, (`grouping_id` & 1), `sales.item` ASC NULLS LAST;
