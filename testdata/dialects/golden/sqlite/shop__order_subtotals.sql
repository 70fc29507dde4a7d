-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,units' -b 'stores.region,sales.item' --order 'revenue desc' --limit 3 --totals rollup -d sqlite
WITH `sales_rows` AS (
  SELECT
    `stores`.`region` AS `stores.region`,
    `sales`.`item` AS `sales.item`,
    (`sales`.`price` * `sales`.`qty`) AS `revenue_arg`,
    `sales`.`qty` AS `units_arg`
  FROM `shop`.`sales` AS `sales`
  LEFT JOIN `shop`.`stores` AS `stores` ON `sales`.`store_id` = `stores`.`id`
),
`sales_cells` AS (
  SELECT
    `stores.region`,
    `sales.item`,
    0 AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`,
    sum(`units_arg`) AS `units`
  FROM `sales_rows`
  GROUP BY `stores.region`, `sales.item`
  UNION ALL
  SELECT
    `stores.region`,
    NULL AS `sales.item`,
    1 AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`,
    sum(`units_arg`) AS `units`
  FROM `sales_rows`
  GROUP BY `stores.region`
  UNION ALL
  SELECT
    NULL AS `stores.region`,
    NULL AS `sales.item`,
    3 AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`,
    sum(`units_arg`) AS `units`
  FROM `sales_rows`
),
`result` AS (
  SELECT
    `stores.region`,
    `sales.item`,
    `revenue`,
    `units`,
    `grouping_id`
  FROM `sales_cells`
),
`result_sorted` AS (
  SELECT
    `stores.region`,
    `sales.item`,
    `revenue`,
    `units`,
    `grouping_id`,
    max(CASE WHEN (`grouping_id` & 1) = 1 THEN `revenue` END) OVER (PARTITION BY (`grouping_id` & 2), `stores.region`) AS `sort_1`
  FROM `result`
),
`result_ranked` AS (
  SELECT
    `stores.region`,
    `sales.item`,
    `revenue`,
    `units`,
    `grouping_id`,
    `sort_1`,
    count(*) OVER (PARTITION BY `grouping_id` ORDER BY (`grouping_id` & 2), `sort_1` DESC NULLS LAST, `stores.region` ASC NULLS LAST, (`grouping_id` & 1), `revenue` DESC NULLS LAST, `sales.item` ASC NULLS LAST ROWS BETWEEN UNBOUNDED PRECEDING AND CURRENT ROW) AS `detail_rank`
  FROM `result_sorted`
),
`result_kept` AS (
  SELECT
    `stores.region`,
    `sales.item`,
    `revenue`,
    `units`,
    `grouping_id`,
    `sort_1`,
    `detail_rank`,
    min(CASE WHEN `grouping_id` = 0 THEN `detail_rank` END) OVER (PARTITION BY `stores.region`) AS `first_rank_1`
  FROM `result_ranked`
)
SELECT
  `stores.region`,
  `sales.item`,
  `revenue`,
  `units`,
  `grouping_id`
FROM `result_kept`
WHERE (`grouping_id` = 0 AND `detail_rank` <= 3)
  OR (`grouping_id` = 1 AND `first_rank_1` <= 3)
  OR `grouping_id` = 3
ORDER BY (`grouping_id` & 2), `sort_1` DESC NULLS LAST, `stores.region` ASC NULLS LAST, (`grouping_id` & 1), `revenue` DESC NULLS LAST, `sales.item` ASC NULLS LAST;
