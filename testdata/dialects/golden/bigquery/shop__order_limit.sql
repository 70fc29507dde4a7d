-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m revenue -b sales.item --order 'revenue desc' --limit 2 --totals grand -d bigquery
WITH `sales_rows` AS (
  SELECT
    `sales`.`item` AS `sales__item`,
    (`sales`.`price` * `sales`.`qty`) AS `revenue_arg`
  FROM `shop`.`sales` AS `sales`
),
`sales_cells` AS (
  SELECT
    `sales__item`,
    GROUPING(`sales__item`) AS `grouping_id`,
    sum(`revenue_arg`) AS `revenue`
  FROM `sales_rows`
  GROUP BY GROUPING SETS ((`sales__item`), ())
),
`result` AS (
  SELECT
    `sales__item`,
    `revenue`,
    `grouping_id`
  FROM `sales_cells`
),
`result_ranked` AS (
  SELECT
    `sales__item`,
    `revenue`,
    `grouping_id`,
    count(*) OVER (PARTITION BY `grouping_id` ORDER BY CASE WHEN `grouping_id` = 0 THEN 0 ELSE 1 END, `revenue` DESC NULLS LAST, (`grouping_id` & 1), `sales__item` ASC NULLS LAST ROWS BETWEEN UNBOUNDED PRECEDING AND CURRENT ROW) AS `detail_rank`
  FROM `result`
)
SELECT
  `sales__item`,
  `revenue`,
  `grouping_id`
FROM `result_ranked`
WHERE (`grouping_id` = 0 AND `detail_rank` <= 2)
  OR `grouping_id` = 1
ORDER BY CASE WHEN `grouping_id` = 0 THEN 0 ELSE 1 END, `revenue` DESC NULLS LAST, (`grouping_id` & 1), `sales__item` ASC NULLS LAST;
