-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,roses,rose_share' -b stores.region -w 'stores.region = '\''North'\'' and sales.qty >= 2' -d spark
WITH `sales_rows` AS (
  SELECT
    `stores`.`region` AS `stores.region`,
    (`sales`.`price` * `sales`.`qty`) AS `revenue_arg`,
    (`sales`.`item` = 'rose') AS `roses_if`
  FROM `shop`.`sales` AS `sales`
  JOIN `shop`.`stores` AS `stores` ON `sales`.`store_id` = `stores`.`id`
  WHERE (`stores`.`region` = 'North')
    AND (`sales`.`qty` >= 2)
),
`sales_cells` AS (
  SELECT
    `stores.region`,
    0 AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`,
    sum(`revenue_arg`) FILTER (WHERE `roses_if`) AS `roses`
  FROM `sales_rows`
  GROUP BY `stores.region`
)
SELECT
  `stores.region`,
  `revenue`,
  `roses`,
  (CAST(`roses` AS DOUBLE) / NULLIF(`revenue`, 0)) AS `rose_share`,
  `grouping_id`
FROM `sales_cells`
ORDER BY `stores.region` ASC NULLS LAST;
