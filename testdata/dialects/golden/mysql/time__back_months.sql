-- rollwise sql testdata/exec/time.roll -m 'revenue,rev_ly,rev_lm' -b orders.month -w 'orders.year = 2025' --totals grand -d mysql
WITH `orders_rows` AS (
  SELECT
    (DATE_SUB(CAST(`orders`.`day` AS DATE), INTERVAL DAYOFMONTH(`orders`.`day`) - 1 DAY)) AS `orders.month`,
    `orders`.`amount` AS `revenue_arg`
  FROM `timed`.`orders` AS `orders`
  WHERE ((EXTRACT(YEAR FROM `orders`.`day`)) = 2025)
),
`orders_cells` AS (
  SELECT
    `orders.month`,
    0 AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`
  FROM `orders_rows`
  GROUP BY `orders.month`
  UNION ALL
  SELECT
    NULL AS `orders.month`,
    1 AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`
  FROM `orders_rows`
),
`rev_ly_orders_rows` AS (
  SELECT
    DATE_SUB(CAST(DATE_ADD(`orders`.`day`, INTERVAL 12 MONTH) AS DATE), INTERVAL DAYOFMONTH(DATE_ADD(`orders`.`day`, INTERVAL 12 MONTH)) - 1 DAY) AS `orders.month`,
    `orders`.`amount` AS `rev_ly_revenue_arg`
  FROM `timed`.`orders` AS `orders`
  WHERE (EXTRACT(YEAR FROM DATE_ADD(`orders`.`day`, INTERVAL 12 MONTH)) = 2025)
),
`rev_ly_orders_cells` AS (
  SELECT
    `orders.month`,
    0 AS `grouping_id`,
    sum(`rev_ly_revenue_arg`) AS `rev_ly_revenue`
  FROM `rev_ly_orders_rows`
  GROUP BY `orders.month`
  UNION ALL
  SELECT
    NULL AS `orders.month`,
    1 AS `grouping_id`,
    sum(`rev_ly_revenue_arg`) AS `rev_ly_revenue`
  FROM `rev_ly_orders_rows`
),
`rev_lm_orders_rows` AS (
  SELECT
    DATE_SUB(CAST(DATE_ADD(`orders`.`day`, INTERVAL 1 MONTH) AS DATE), INTERVAL DAYOFMONTH(DATE_ADD(`orders`.`day`, INTERVAL 1 MONTH)) - 1 DAY) AS `orders.month`,
    `orders`.`amount` AS `rev_lm_revenue_arg`
  FROM `timed`.`orders` AS `orders`
  WHERE (EXTRACT(YEAR FROM DATE_ADD(`orders`.`day`, INTERVAL 1 MONTH)) = 2025)
),
`rev_lm_orders_cells` AS (
  SELECT
    `orders.month`,
    0 AS `grouping_id`,
    sum(`rev_lm_revenue_arg`) AS `rev_lm_revenue`
  FROM `rev_lm_orders_rows`
  GROUP BY `orders.month`
  UNION ALL
  SELECT
    NULL AS `orders.month`,
    1 AS `grouping_id`,
    sum(`rev_lm_revenue_arg`) AS `rev_lm_revenue`
  FROM `rev_lm_orders_rows`
)
SELECT
  `orders_cells`.`orders.month`,
  `orders_cells`.`revenue` AS `revenue`,
  `rev_ly_orders_cells`.`rev_ly_revenue` AS `rev_ly`,
  `rev_lm_orders_cells`.`rev_lm_revenue` AS `rev_lm`,
  `orders_cells`.`grouping_id`
FROM `orders_cells`
  LEFT JOIN `rev_ly_orders_cells` ON `rev_ly_orders_cells`.`grouping_id` = `orders_cells`.`grouping_id`
    AND `rev_ly_orders_cells`.`orders.month` <=> `orders_cells`.`orders.month`
  LEFT JOIN `rev_lm_orders_cells` ON `rev_lm_orders_cells`.`grouping_id` = `orders_cells`.`grouping_id`
    AND `rev_lm_orders_cells`.`orders.month` <=> `orders_cells`.`orders.month`
ORDER BY (`orders_cells`.`grouping_id` & 1), CASE WHEN `orders_cells`.`orders.month` IS NULL THEN 1 ELSE 0 END, `orders_cells`.`orders.month` ASC;
