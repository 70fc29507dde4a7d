-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m revenue -b stores.region -w 'stores.region in ('\''O'\'''\''Neil; DROP TABLE x; --'\'', '\''\\'\'', '\''ünï'\'')' -d bigquery
WITH `sales_rows` AS (
  SELECT
    `stores`.`region` AS `stores__region`,
    (`sales`.`price` * `sales`.`qty`) AS `revenue_arg`
  FROM `shop`.`sales` AS `sales`
  JOIN `shop`.`stores` AS `stores` ON `sales`.`store_id` = `stores`.`id`
  WHERE (`stores`.`region` IN ('O\'Neil; DROP TABLE x; --', '\\\\', 'ünï'))
),
`sales_cells` AS (
  SELECT
    `stores__region`,
    0 AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`
  FROM `sales_rows`
  GROUP BY `stores__region`
)
SELECT
  `stores__region`,
  `revenue`,
  `grouping_id`
FROM `sales_cells`
ORDER BY `stores__region` ASC NULLS LAST;
