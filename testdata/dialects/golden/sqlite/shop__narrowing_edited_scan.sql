-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'north_everywhere,fees' -b stores.region --totals grand -d sqlite
WITH `sales_rows` AS (
  SELECT
    `stores`.`region` AS `stores.region`
  FROM `shop`.`sales` AS `sales`
  LEFT JOIN `shop`.`stores` AS `stores` ON `sales`.`store_id` = `stores`.`id`
),
`sales_cells` AS (
  SELECT
    `stores.region`,
    0 AS `grouping_id`
  FROM `sales_rows`
  GROUP BY `stores.region`
  UNION ALL
  SELECT
    NULL AS `stores.region`,
    1 AS `grouping_id`
),
`north_everywhere_sales_rows` AS (
  SELECT
    (`sales`.`price` * `sales`.`qty`) AS `north_everywhere_revenue_arg`
  FROM `shop`.`sales` AS `sales`
  JOIN `shop`.`stores` AS `stores` ON `sales`.`store_id` = `stores`.`id`
  WHERE (`stores`.`region` = 'North')
),
`north_everywhere_sales_cells` AS (
  SELECT
    0 AS `grouping_id`,
    sum(`north_everywhere_revenue_arg`) AS `north_everywhere_revenue`
  FROM `north_everywhere_sales_rows`
),
`repairs_rows` AS (
  SELECT
    `stores`.`region` AS `stores.region`,
    `repairs`.`fee` AS `fees_arg`
  FROM `shop`.`repairs` AS `repairs`
  LEFT JOIN `shop`.`stores` AS `stores` ON `repairs`.`store_id` = `stores`.`id`
),
`repairs_cells` AS (
  SELECT
    `stores.region`,
    0 AS `grouping_id`,
    sum(`fees_arg`) AS `fees`
  FROM `repairs_rows`
  GROUP BY `stores.region`
  UNION ALL
  SELECT
    NULL AS `stores.region`,
    1 AS `grouping_id`,
    sum(`fees_arg`) AS `fees`
  FROM `repairs_rows`
),
`cells` AS (
  SELECT `grouping_id`, `stores.region` FROM `sales_cells`
  UNION
  SELECT `grouping_id`, `stores.region` FROM `repairs_cells`
)
SELECT
  `cells`.`stores.region`,
  `north_everywhere_sales_cells`.`north_everywhere_revenue` AS `north_everywhere`,
  `repairs_cells`.`fees` AS `fees`,
  `cells`.`grouping_id`
FROM `cells`
  LEFT JOIN `sales_cells` ON `sales_cells`.`grouping_id` = `cells`.`grouping_id`
    AND `sales_cells`.`stores.region` IS `cells`.`stores.region`
  LEFT JOIN `north_everywhere_sales_cells` ON 1 = 1
  LEFT JOIN `repairs_cells` ON `repairs_cells`.`grouping_id` = `cells`.`grouping_id`
    AND `repairs_cells`.`stores.region` IS `cells`.`stores.region`
ORDER BY (`cells`.`grouping_id` & 1), `cells`.`stores.region` ASC NULLS LAST;
