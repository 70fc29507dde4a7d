-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,fees,jobs,takings' -b stores.region --totals grand -d bigquery
WITH `sales_rows` AS (
  SELECT
    `stores`.`region` AS `stores__region`,
    (`sales`.`price` * `sales`.`qty`) AS `revenue_arg`
  FROM `shop`.`sales` AS `sales`
  LEFT JOIN `shop`.`stores` AS `stores` ON `sales`.`store_id` = `stores`.`id`
),
`sales_cells` AS (
  SELECT
    `stores__region`,
    GROUPING(`stores__region`) AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`
  FROM `sales_rows`
  GROUP BY GROUPING SETS ((`stores__region`), ())
),
`repairs_rows` AS (
  SELECT
    `stores`.`region` AS `stores__region`,
    `repairs`.`fee` AS `fees_arg`,
    `repairs`.`id` AS `jobs_arg`
  FROM `shop`.`repairs` AS `repairs`
  LEFT JOIN `shop`.`stores` AS `stores` ON `repairs`.`store_id` = `stores`.`id`
),
`repairs_cells` AS (
  SELECT
    `stores__region`,
    GROUPING(`stores__region`) AS `grouping_id`,
    sum(`fees_arg`) AS `fees`,
    count(`jobs_arg`) AS `jobs`
  FROM `repairs_rows`
  GROUP BY GROUPING SETS ((`stores__region`), ())
),
`cells` AS (
  SELECT `grouping_id`, `stores__region` FROM `sales_cells`
  UNION
  SELECT `grouping_id`, `stores__region` FROM `repairs_cells`
)
SELECT
  `cells`.`stores__region`,
  `sales_cells`.`revenue` AS `revenue`,
  `repairs_cells`.`fees` AS `fees`,
  COALESCE(`repairs_cells`.`jobs`, 0) AS `jobs`,
  (coalesce(`sales_cells`.`revenue`, 0) + coalesce(`repairs_cells`.`fees`, 0)) AS `takings`,
  `cells`.`grouping_id`
FROM `cells`
  LEFT JOIN `sales_cells` ON `sales_cells`.`grouping_id` = `cells`.`grouping_id`
    AND `sales_cells`.`stores__region` IS NOT DISTINCT FROM `cells`.`stores__region`
  LEFT JOIN `repairs_cells` ON `repairs_cells`.`grouping_id` = `cells`.`grouping_id`
    AND `repairs_cells`.`stores__region` IS NOT DISTINCT FROM `cells`.`stores__region`
ORDER BY (`cells`.`grouping_id` & 1), `cells`.`stores__region` ASC NULLS LAST;
