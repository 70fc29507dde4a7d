-- rollwise sql testdata/exec/time.roll -m 'revenue,rev_ly,rev_lm,ly_shops' -b 'orders.month,orders.shop' --totals rollup -d bigquery
WITH `orders_rows` AS (
  SELECT
    (DATE_TRUNC(`orders`.`day`, MONTH)) AS `orders__month`,
    `orders`.`shop` AS `orders__shop`,
    `orders`.`amount` AS `revenue_arg`
  FROM `timed`.`orders` AS `orders`
),
`orders_cells` AS (
  SELECT
    `orders__month`,
    `orders__shop`,
    (GROUPING(`orders__month`) * 2 + GROUPING(`orders__shop`)) AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`
  FROM `orders_rows`
  GROUP BY GROUPING SETS ((`orders__month`, `orders__shop`), (`orders__month`), ())
),
`ly_shops_orders_unmoved_rows` AS (
  SELECT
    (DATE_TRUNC(`orders`.`day`, MONTH)) AS `orders__month`,
    `orders`.`amount` AS `ly_shops_revenue_arg_2`
  FROM `timed`.`orders` AS `orders`
),
`ly_shops_orders_unmoved_cells` AS (
  SELECT
    `orders__month`,
    GROUPING(`orders__month`) AS `grouping_id`,
    sum(`ly_shops_revenue_arg_2`) AS `ly_shops_revenue_cell`
  FROM `ly_shops_orders_unmoved_rows`
  GROUP BY GROUPING SETS ((`orders__month`), ())
),
`rev_ly_orders_moved` AS (
  SELECT `grouping_id`, DATE_ADD(`orders__month`, INTERVAL 12 MONTH) AS `orders__month`, `orders__shop`, sum(`revenue`) AS `rev_ly_revenue`
  FROM `orders_cells`
  GROUP BY `grouping_id`, DATE_ADD(`orders__month`, INTERVAL 12 MONTH), `orders__shop`
),
`rev_lm_orders_moved` AS (
  SELECT `grouping_id`, DATE_ADD(`orders__month`, INTERVAL 1 MONTH) AS `orders__month`, `orders__shop`, sum(`revenue`) AS `rev_lm_revenue`
  FROM `orders_cells`
  GROUP BY `grouping_id`, DATE_ADD(`orders__month`, INTERVAL 1 MONTH), `orders__shop`
),
`ly_shops_orders_moved` AS (
  SELECT `grouping_id`, DATE_ADD(`orders__month`, INTERVAL 12 MONTH) AS `orders__month`, sum(`ly_shops_revenue_cell`) AS `ly_shops_revenue`
  FROM `ly_shops_orders_unmoved_cells`
  GROUP BY `grouping_id`, DATE_ADD(`orders__month`, INTERVAL 12 MONTH)
)
SELECT
  `orders_cells`.`orders__month`,
  `orders_cells`.`orders__shop`,
  `orders_cells`.`revenue` AS `revenue`,
  `rev_ly_orders_moved`.`rev_ly_revenue` AS `rev_ly`,
  `rev_lm_orders_moved`.`rev_lm_revenue` AS `rev_lm`,
  `ly_shops_orders_moved`.`ly_shops_revenue` AS `ly_shops`,
  `orders_cells`.`grouping_id`
FROM `orders_cells`
  LEFT JOIN `rev_ly_orders_moved` ON `rev_ly_orders_moved`.`grouping_id` = `orders_cells`.`grouping_id`
    AND `rev_ly_orders_moved`.`orders__month` IS NOT DISTINCT FROM `orders_cells`.`orders__month`
    AND `rev_ly_orders_moved`.`orders__shop` IS NOT DISTINCT FROM `orders_cells`.`orders__shop`
  LEFT JOIN `rev_lm_orders_moved` ON `rev_lm_orders_moved`.`grouping_id` = `orders_cells`.`grouping_id`
    AND `rev_lm_orders_moved`.`orders__month` IS NOT DISTINCT FROM `orders_cells`.`orders__month`
    AND `rev_lm_orders_moved`.`orders__shop` IS NOT DISTINCT FROM `orders_cells`.`orders__shop`
  LEFT JOIN `ly_shops_orders_moved` ON `ly_shops_orders_moved`.`grouping_id` = CASE `orders_cells`.`grouping_id` WHEN 0 THEN 0 WHEN 1 THEN 0 WHEN 3 THEN 1 END
    AND `ly_shops_orders_moved`.`orders__month` IS NOT DISTINCT FROM `orders_cells`.`orders__month`
ORDER BY (`orders_cells`.`grouping_id` & 2), `orders_cells`.`orders__month` ASC NULLS LAST, (`orders_cells`.`grouping_id` & 1), `orders_cells`.`orders__shop` ASC NULLS LAST;
