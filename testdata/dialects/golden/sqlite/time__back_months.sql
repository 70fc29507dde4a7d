-- rollwise sql testdata/exec/time.roll -m 'revenue,rev_ly,rev_lm' -b orders.month -w 'orders.year = 2025' --totals grand -d sqlite
WITH `orders_rows` AS (
  SELECT
    (date(`orders`.`day`, 'start of month')) AS `orders.month`,
    `orders`.`amount` AS `revenue_arg`
  FROM `timed`.`orders` AS `orders`
  WHERE ((CAST(strftime('%Y', `orders`.`day`) AS INTEGER)) = 2025)
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
    date(date(`orders`.`day`, 'start of month', '12 months', '+' || (MIN(CAST(strftime('%d', `orders`.`day`) AS INTEGER), CAST(strftime('%d', date(`orders`.`day`, 'start of month', '13 months', '-1 day')) AS INTEGER)) - 1) || ' days'), 'start of month') AS `orders.month`,
    `orders`.`amount` AS `rev_ly_revenue_arg`
  FROM `timed`.`orders` AS `orders`
  WHERE (CAST(strftime('%Y', date(`orders`.`day`, 'start of month', '12 months', '+' || (MIN(CAST(strftime('%d', `orders`.`day`) AS INTEGER), CAST(strftime('%d', date(`orders`.`day`, 'start of month', '13 months', '-1 day')) AS INTEGER)) - 1) || ' days')) AS INTEGER) = 2025)
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
    date(date(`orders`.`day`, 'start of month', '1 months', '+' || (MIN(CAST(strftime('%d', `orders`.`day`) AS INTEGER), CAST(strftime('%d', date(`orders`.`day`, 'start of month', '2 months', '-1 day')) AS INTEGER)) - 1) || ' days'), 'start of month') AS `orders.month`,
    `orders`.`amount` AS `rev_lm_revenue_arg`
  FROM `timed`.`orders` AS `orders`
  WHERE (CAST(strftime('%Y', date(`orders`.`day`, 'start of month', '1 months', '+' || (MIN(CAST(strftime('%d', `orders`.`day`) AS INTEGER), CAST(strftime('%d', date(`orders`.`day`, 'start of month', '2 months', '-1 day')) AS INTEGER)) - 1) || ' days')) AS INTEGER) = 2025)
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
    AND `rev_ly_orders_cells`.`orders.month` IS `orders_cells`.`orders.month`
  LEFT JOIN `rev_lm_orders_cells` ON `rev_lm_orders_cells`.`grouping_id` = `orders_cells`.`grouping_id`
    AND `rev_lm_orders_cells`.`orders.month` IS `orders_cells`.`orders.month`
ORDER BY (`orders_cells`.`grouping_id` & 1), `orders_cells`.`orders.month` ASC NULLS LAST;
