-- rollwise sql testdata/exec/time.roll -m 'revenue,rev_ly,rev_lm,ly_shops' -b 'orders.month,orders.shop' --totals rollup -d mysql
WITH `orders_rows` AS (
  SELECT
    (DATE_SUB(CAST(`orders`.`day` AS DATE), INTERVAL DAYOFMONTH(`orders`.`day`) - 1 DAY)) AS `orders.month`,
    `orders`.`shop` AS `orders.shop`,
    `orders`.`amount` AS `revenue_arg`
  FROM `timed`.`orders` AS `orders`
),
`orders_cells` AS (
  SELECT
    `orders.month`,
    `orders.shop`,
    0 AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`
  FROM `orders_rows`
  GROUP BY `orders.month`, `orders.shop`
  UNION ALL
  SELECT
    `orders.month`,
    NULL AS `orders.shop`,
    1 AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`
  FROM `orders_rows`
  GROUP BY `orders.month`
  UNION ALL
  SELECT
    NULL AS `orders.month`,
    NULL AS `orders.shop`,
    3 AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`
  FROM `orders_rows`
),
`ly_shops_orders_unmoved_rows` AS (
  SELECT
    (DATE_SUB(CAST(`orders`.`day` AS DATE), INTERVAL DAYOFMONTH(`orders`.`day`) - 1 DAY)) AS `orders.month`,
    `orders`.`amount` AS `ly_shops_revenue_arg_2`
  FROM `timed`.`orders` AS `orders`
),
`ly_shops_orders_unmoved_cells` AS (
  SELECT
    `orders.month`,
    0 AS `grouping_id`,
    sum(`ly_shops_revenue_arg_2`) AS `ly_shops_revenue_cell`
  FROM `ly_shops_orders_unmoved_rows`
  GROUP BY `orders.month`
  UNION ALL
  SELECT
    NULL AS `orders.month`,
    1 AS `grouping_id`,
    sum(`ly_shops_revenue_arg_2`) AS `ly_shops_revenue_cell`
  FROM `ly_shops_orders_unmoved_rows`
),
`rev_ly_orders_moved` AS (
  SELECT `grouping_id`, DATE_ADD(`orders.month`, INTERVAL 12 MONTH) AS `orders.month`, `orders.shop`, sum(`revenue`) AS `rev_ly_revenue`
  FROM `orders_cells`
  GROUP BY `grouping_id`, DATE_ADD(`orders.month`, INTERVAL 12 MONTH), `orders.shop`
),
`rev_lm_orders_moved` AS (
  SELECT `grouping_id`, DATE_ADD(`orders.month`, INTERVAL 1 MONTH) AS `orders.month`, `orders.shop`, sum(`revenue`) AS `rev_lm_revenue`
  FROM `orders_cells`
  GROUP BY `grouping_id`, DATE_ADD(`orders.month`, INTERVAL 1 MONTH), `orders.shop`
),
`ly_shops_orders_moved` AS (
  SELECT `grouping_id`, DATE_ADD(`orders.month`, INTERVAL 12 MONTH) AS `orders.month`, sum(`ly_shops_revenue_cell`) AS `ly_shops_revenue`
  FROM `ly_shops_orders_unmoved_cells`
  GROUP BY `grouping_id`, DATE_ADD(`orders.month`, INTERVAL 12 MONTH)
)
SELECT
  `orders_cells`.`orders.month`,
  `orders_cells`.`orders.shop`,
  `orders_cells`.`revenue` AS `revenue`,
  `rev_ly_orders_moved`.`rev_ly_revenue` AS `rev_ly`,
  `rev_lm_orders_moved`.`rev_lm_revenue` AS `rev_lm`,
  `ly_shops_orders_moved`.`ly_shops_revenue` AS `ly_shops`,
  `orders_cells`.`grouping_id`
FROM `orders_cells`
  LEFT JOIN `rev_ly_orders_moved` ON `rev_ly_orders_moved`.`grouping_id` = `orders_cells`.`grouping_id`
    AND `rev_ly_orders_moved`.`orders.month` <=> `orders_cells`.`orders.month`
    AND `rev_ly_orders_moved`.`orders.shop` <=> `orders_cells`.`orders.shop`
  LEFT JOIN `rev_lm_orders_moved` ON `rev_lm_orders_moved`.`grouping_id` = `orders_cells`.`grouping_id`
    AND `rev_lm_orders_moved`.`orders.month` <=> `orders_cells`.`orders.month`
    AND `rev_lm_orders_moved`.`orders.shop` <=> `orders_cells`.`orders.shop`
  LEFT JOIN `ly_shops_orders_moved` ON `ly_shops_orders_moved`.`grouping_id` = CASE `orders_cells`.`grouping_id` WHEN 0 THEN 0 WHEN 1 THEN 0 WHEN 3 THEN 1 END
    AND `ly_shops_orders_moved`.`orders.month` <=> `orders_cells`.`orders.month`
ORDER BY (`orders_cells`.`grouping_id` & 2), CASE WHEN `orders_cells`.`orders.month` IS NULL THEN 1 ELSE 0 END, `orders_cells`.`orders.month` ASC, (`orders_cells`.`grouping_id` & 1), CASE WHEN `orders_cells`.`orders.shop` IS NULL THEN 1 ELSE 0 END, `orders_cells`.`orders.shop` ASC;
