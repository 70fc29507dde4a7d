-- rollwise sql testdata/exec/time.roll -m 'revenue,ytd,running,run_shops' -b 'orders.month,orders.shop' -w 'orders.shop <> '\''z'\''' -d bigquery
WITH `orders_rows` AS (
  SELECT
    (DATE_TRUNC(`orders`.`day`, MONTH)) AS `orders__month`,
    `orders`.`shop` AS `orders__shop`,
    `orders`.`amount` AS `revenue_arg`,
    `orders`.`day` AS `ytd_arg`
  FROM `timed`.`orders` AS `orders`
  WHERE (`orders`.`shop` <> 'z')
),
`orders_cells` AS (
  SELECT
    `orders__month`,
    `orders__shop`,
    0 AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`,
    max(`ytd_arg`) AS `ytd`
  FROM `orders_rows`
  GROUP BY `orders__month`, `orders__shop`
),
`run_shops_orders_rows` AS (
  SELECT
    (DATE_TRUNC(`orders`.`day`, MONTH)) AS `orders__month`,
    `orders`.`day` AS `run_shops_arg`
  FROM `timed`.`orders` AS `orders`
),
`run_shops_orders_cells` AS (
  SELECT
    `orders__month`,
    0 AS `grouping_id`,
    max(`run_shops_arg`) AS `run_shops`
  FROM `run_shops_orders_rows`
  GROUP BY `orders__month`
),
`run_shops_orders_2_rows` AS (
  SELECT
    `orders`.`day` AS `run_shops_orders_2_at`,
    `orders`.`amount` AS `run_shops_revenue_arg`
  FROM `timed`.`orders` AS `orders`
),
`run_shops_orders_2_ends` AS (
  SELECT `orders_cells`.`grouping_id`, `orders_cells`.`orders__month`, `orders_cells`.`orders__shop`, `run_shops_orders_cells`.`run_shops` AS `run_shops_orders_2_end`
  FROM `orders_cells`
  LEFT JOIN `run_shops_orders_cells` ON `run_shops_orders_cells`.`orders__month` IS NOT DISTINCT FROM `orders_cells`.`orders__month`
),
`run_shops_orders_2_cells` AS (
  SELECT `a`.`grouping_id`, `a`.`orders__month`, `a`.`orders__shop`, sum(`x`.`run_shops_revenue_arg`) AS `run_shops_revenue`
  FROM `run_shops_orders_2_ends` AS `a`
  JOIN `run_shops_orders_2_rows` AS `x` ON `x`.`run_shops_orders_2_at` <= `a`.`run_shops_orders_2_end`
  GROUP BY `a`.`grouping_id`, `a`.`orders__month`, `a`.`orders__shop`
)
SELECT
  `orders_cells`.`orders__month`,
  `orders_cells`.`orders__shop`,
  `orders_cells`.`revenue` AS `revenue`,
  CASE WHEN `orders_cells`.`ytd` IS NOT NULL THEN sum(`orders_cells`.`revenue`) OVER (PARTITION BY `orders_cells`.`grouping_id`, `orders_cells`.`orders__shop`, DATE_TRUNC(`orders_cells`.`orders__month`, YEAR) ORDER BY `orders_cells`.`orders__month` RANGE BETWEEN UNBOUNDED PRECEDING AND CURRENT ROW) END AS `ytd`,
  CASE WHEN `orders_cells`.`ytd` IS NOT NULL THEN sum(`orders_cells`.`revenue`) OVER (PARTITION BY `orders_cells`.`grouping_id`, `orders_cells`.`orders__shop`, CASE WHEN `orders_cells`.`orders__month` IS NULL THEN 1 ELSE 0 END ORDER BY `orders_cells`.`orders__month` RANGE BETWEEN UNBOUNDED PRECEDING AND CURRENT ROW) END AS `running`,
  `run_shops_orders_2_cells`.`run_shops_revenue` AS `run_shops`,
  `orders_cells`.`grouping_id`
FROM `orders_cells`
  LEFT JOIN `run_shops_orders_cells` ON `run_shops_orders_cells`.`orders__month` IS NOT DISTINCT FROM `orders_cells`.`orders__month`
  LEFT JOIN `run_shops_orders_2_cells` ON `run_shops_orders_2_cells`.`orders__month` IS NOT DISTINCT FROM `orders_cells`.`orders__month`
    AND `run_shops_orders_2_cells`.`orders__shop` IS NOT DISTINCT FROM `orders_cells`.`orders__shop`
ORDER BY `orders_cells`.`orders__month` ASC NULLS LAST, `orders_cells`.`orders__shop` ASC NULLS LAST;
