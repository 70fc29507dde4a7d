-- rollwise sql testdata/exec/time.roll -m 'closing,opening' -b orders.shop --totals grand -d bigquery
WITH `orders_rows` AS (
  SELECT
    `orders`.`shop` AS `orders__shop`
  FROM `timed`.`orders` AS `orders`
),
`orders_cells` AS (
  SELECT
    `orders__shop`,
    GROUPING(`orders__shop`) AS `grouping_id`
  FROM `orders_rows`
  GROUP BY GROUPING SETS ((`orders__shop`), ())
),
`closing_latest_per_orders_rows` AS (
  SELECT
    `orders`.`shop` AS `orders__shop`,
    `orders`.`day` AS `orders__day_per`,
    `orders`.`amount` AS `closing_latest_per_revenue_arg`
  FROM `timed`.`orders` AS `orders`
),
`closing_latest_per_orders_cells` AS (
  SELECT
    `orders__shop`,
    `orders__day_per`,
    (GROUPING(`orders__shop`) * 2 + GROUPING(`orders__day_per`)) AS `grouping_id`,
    sum(`closing_latest_per_revenue_arg`) AS `closing_latest_per_revenue`
  FROM `closing_latest_per_orders_rows`
  GROUP BY GROUPING SETS ((`orders__shop`, `orders__day_per`), (`orders__day_per`))
),
`closing_latest_per_groups` AS (
  SELECT
    `orders__shop`,
    `orders__day_per`,
    `grouping_id`,
    MAX(`orders__day_per`) OVER (PARTITION BY `grouping_id`, `orders__shop`) AS `closing_latest_at`,
    MIN(`orders__day_per`) OVER (PARTITION BY `grouping_id`, `orders__shop`) AS `opening_earliest_at`,
    `closing_latest_per_revenue` AS `closing_value`,
    `closing_latest_per_revenue` AS `opening_value`
  FROM `closing_latest_per_orders_cells`
),
`closing_latest_per` AS (
  SELECT
    `orders__shop`,
    `grouping_id`,
    max(CASE WHEN `orders__day_per` IS NOT NULL AND `orders__day_per` = `closing_latest_at` THEN `closing_value` END) AS `closing_latest`,
    max(CASE WHEN `orders__day_per` IS NOT NULL AND `orders__day_per` = `opening_earliest_at` THEN `opening_value` END) AS `opening_earliest`
  FROM `closing_latest_per_groups`
  GROUP BY `grouping_id`, `orders__shop`
)
SELECT
  `orders_cells`.`orders__shop`,
  `closing_latest_per`.`closing_latest` AS `closing`,
  `closing_latest_per`.`opening_earliest` AS `opening`,
  `orders_cells`.`grouping_id`
FROM `orders_cells`
  LEFT JOIN `closing_latest_per` ON `closing_latest_per`.`grouping_id` = CASE `orders_cells`.`grouping_id` WHEN 0 THEN 0 WHEN 1 THEN 2 END
    AND `closing_latest_per`.`orders__shop` IS NOT DISTINCT FROM `orders_cells`.`orders__shop`
ORDER BY (`orders_cells`.`grouping_id` & 1), `orders_cells`.`orders__shop` ASC NULLS LAST;
