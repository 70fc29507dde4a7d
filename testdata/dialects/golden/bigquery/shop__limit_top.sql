-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m revenue -b sales.item --order 'revenue desc' --limit 2 -d bigquery
WITH `sales_rows` AS (
  SELECT
    `sales`.`item` AS `sales__item`,
    (`sales`.`price` * `sales`.`qty`) AS `revenue_arg`
  FROM `shop`.`sales` AS `sales`
),
`sales_cells` AS (
  SELECT
    `sales__item`,
    0 AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`
  FROM `sales_rows`
  GROUP BY `sales__item`
),
`result` AS (
  SELECT
    `sales__item`,
    `revenue`,
    `grouping_id`
  FROM `sales_cells`
)
SELECT
  `sales__item`,
  `revenue`,
  `grouping_id`
FROM `result`
ORDER BY `revenue` DESC NULLS LAST, `sales__item` ASC NULLS LAST
LIMIT 2;
