-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m lines -b sales.line -w 'sales.line > 5' -d bigquery
WITH `sales_rows` AS (
  SELECT
    ((`sales`.`price` * `sales`.`qty`)) AS `sales__line`,
    `sales`.`id` AS `lines_arg`
  FROM `shop`.`sales` AS `sales`
  WHERE (((`sales`.`price` * `sales`.`qty`)) > 5)
),
`sales_cells` AS (
  SELECT
    `sales__line`,
    0 AS `grouping_id`,
    count(`lines_arg`) AS `lines`
  FROM `sales_rows`
  GROUP BY `sales__line`
)
SELECT
  `sales__line`,
  `lines`,
  `grouping_id`
FROM `sales_cells`
ORDER BY `sales__line` ASC NULLS LAST;
