-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m units -b 'stores.region,sales.item' --totals all -d bigquery
WITH `sales_rows` AS (
  SELECT
    `stores`.`region` AS `stores__region`,
    `sales`.`item` AS `sales__item`,
    `sales`.`qty` AS `units_arg`
  FROM `shop`.`sales` AS `sales`
  LEFT JOIN `shop`.`stores` AS `stores` ON `sales`.`store_id` = `stores`.`id`
),
`sales_cells` AS (
  SELECT
    `stores__region`,
    `sales__item`,
    (GROUPING(`stores__region`) * 2 + GROUPING(`sales__item`)) AS `grouping_id`,
    sum(`units_arg`) AS `units`
  FROM `sales_rows`
  GROUP BY GROUPING SETS ((`stores__region`, `sales__item`), (`stores__region`), (`sales__item`), ())
)
SELECT
  `stores__region`,
  `sales__item`,
  `units`,
  `grouping_id`
FROM `sales_cells`
ORDER BY (`grouping_id` & 2), `stores__region` ASC NULLS LAST, (`grouping_id` & 1), `sales__item` ASC NULLS LAST;
