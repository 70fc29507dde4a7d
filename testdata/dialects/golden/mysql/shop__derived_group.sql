-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m lines -b sales.line -w 'sales.line > 5' -d mysql
WITH `sales_rows` AS (
  SELECT
    ((`sales`.`price` * `sales`.`qty`)) AS `sales.line`,
    `sales`.`id` AS `lines_arg`
  FROM `shop`.`sales` AS `sales`
  WHERE (((`sales`.`price` * `sales`.`qty`)) > 5)
),
`sales_cells` AS (
  SELECT
    `sales.line`,
    0 AS `grouping_id`,
    count(`lines_arg`) AS `lines`
  FROM `sales_rows`
  GROUP BY `sales.line`
)
SELECT
  `sales.line`,
  `lines`,
  `grouping_id`
FROM `sales_cells`
ORDER BY CASE WHEN `sales.line` IS NULL THEN 1 ELSE 0 END, `sales.line` ASC;
