-- rollwise sql testdata/exec/time.roll -m 'revenue,rev_ly,rev_lm' -b orders.month -w 'orders.year = 2025' --totals grand -d bigquery
WITH `orders_rows` AS (
  SELECT
    (DATE_TRUNC(`orders`.`day`, MONTH)) AS `orders__month`,
    `orders`.`amount` AS `revenue_arg`
  FROM `timed`.`orders` AS `orders`
  WHERE ((EXTRACT(YEAR FROM `orders`.`day`)) = 2025)
),
`orders_cells` AS (
  SELECT
    `orders__month`,
    GROUPING(`orders__month`) AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`
  FROM `orders_rows`
  GROUP BY GROUPING SETS ((`orders__month`), ())
),
`rev_ly_orders_rows` AS (
  SELECT
    DATE_TRUNC(DATE_ADD(`orders`.`day`, INTERVAL 12 MONTH), MONTH) AS `orders__month`,
    `orders`.`amount` AS `rev_ly_revenue_arg`
  FROM `timed`.`orders` AS `orders`
  WHERE (EXTRACT(YEAR FROM DATE_ADD(`orders`.`day`, INTERVAL 12 MONTH)) = 2025)
),
`rev_ly_orders_cells` AS (
  SELECT
    `orders__month`,
    GROUPING(`orders__month`) AS `grouping_id`,
    sum(`rev_ly_revenue_arg`) AS `rev_ly_revenue`
  FROM `rev_ly_orders_rows`
  GROUP BY GROUPING SETS ((`orders__month`), ())
),
`rev_lm_orders_rows` AS (
  SELECT
    DATE_TRUNC(DATE_ADD(`orders`.`day`, INTERVAL 1 MONTH), MONTH) AS `orders__month`,
    `orders`.`amount` AS `rev_lm_revenue_arg`
  FROM `timed`.`orders` AS `orders`
  WHERE (EXTRACT(YEAR FROM DATE_ADD(`orders`.`day`, INTERVAL 1 MONTH)) = 2025)
),
`rev_lm_orders_cells` AS (
  SELECT
    `orders__month`,
    GROUPING(`orders__month`) AS `grouping_id`,
    sum(`rev_lm_revenue_arg`) AS `rev_lm_revenue`
  FROM `rev_lm_orders_rows`
  GROUP BY GROUPING SETS ((`orders__month`), ())
)
SELECT
  `orders_cells`.`orders__month`,
  `orders_cells`.`revenue` AS `revenue`,
  `rev_ly_orders_cells`.`rev_ly_revenue` AS `rev_ly`,
  `rev_lm_orders_cells`.`rev_lm_revenue` AS `rev_lm`,
  `orders_cells`.`grouping_id`
FROM `orders_cells`
  LEFT JOIN `rev_ly_orders_cells` ON `rev_ly_orders_cells`.`grouping_id` = `orders_cells`.`grouping_id`
    AND `rev_ly_orders_cells`.`orders__month` IS NOT DISTINCT FROM `orders_cells`.`orders__month`
  LEFT JOIN `rev_lm_orders_cells` ON `rev_lm_orders_cells`.`grouping_id` = `orders_cells`.`grouping_id`
    AND `rev_lm_orders_cells`.`orders__month` IS NOT DISTINCT FROM `orders_cells`.`orders__month`
ORDER BY (`orders_cells`.`grouping_id` & 1), `orders_cells`.`orders__month` ASC NULLS LAST;
