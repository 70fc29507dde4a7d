-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,units' -b 'districts.area,sales.item' --totals rollup -d bigquery
WITH `sales_rows` AS (
  SELECT
    `districts`.`area` AS `districts__area`,
    `sales`.`item` AS `sales__item`,
    (`sales`.`price` * `sales`.`qty`) AS `revenue_arg`,
    `sales`.`qty` AS `units_arg`
  FROM `shop`.`sales` AS `sales`
  LEFT JOIN `shop`.`stores` AS `stores` ON `sales`.`store_id` = `stores`.`id`
  LEFT JOIN `districts` AS `districts` ON `stores`.`district_id` = `districts`.`id`
),
`sales_cells` AS (
  SELECT
    `districts__area`,
    `sales__item`,
    (GROUPING(`districts__area`) * 2 + GROUPING(`sales__item`)) AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`,
    sum(`units_arg`) AS `units`
  FROM `sales_rows`
  GROUP BY GROUPING SETS ((`districts__area`, `sales__item`), (`districts__area`), ())
)
SELECT
  `districts__area`,
  `sales__item`,
  `revenue`,
  `units`,
  `grouping_id`
FROM `sales_cells`
ORDER BY (`grouping_id` & 2), `districts__area` ASC NULLS LAST, (`grouping_id` & 1), `sales__item` ASC NULLS LAST;
