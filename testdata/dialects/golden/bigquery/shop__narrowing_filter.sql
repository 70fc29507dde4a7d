-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,roses,rose_share' -b stores.region -w 'stores.region = '\''North'\'' and sales.qty >= 2' -d bigquery
WITH `sales_rows` AS (
  SELECT
    `stores`.`region` AS `stores__region`,
    (`sales`.`price` * `sales`.`qty`) AS `revenue_arg`,
    (`sales`.`item` = 'rose') AS `roses_if`
  FROM `shop`.`sales` AS `sales`
  JOIN `shop`.`stores` AS `stores` ON `sales`.`store_id` = `stores`.`id`
  WHERE (`stores`.`region` = 'North')
    AND (`sales`.`qty` >= 2)
),
`sales_cells` AS (
  SELECT
    `stores__region`,
    0 AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`,
    sum(CASE WHEN `roses_if` THEN `revenue_arg` END) AS `roses`
  FROM `sales_rows`
  GROUP BY `stores__region`
)
SELECT
  `stores__region`,
  `revenue`,
  `roses`,
  (CAST(`roses` AS FLOAT64) / NULLIF(`revenue`, 0)) AS `rose_share`,
  `grouping_id`
FROM `sales_cells`
ORDER BY `stores__region` ASC NULLS LAST;
