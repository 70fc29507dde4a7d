-- rollwise sql testdata/exec/time.roll -m 'revenue,rev_ly,rev_lm' -b orders.month -w 'orders.year = 2025' --totals grand -d duckdb
WITH "orders_rows" AS (
  SELECT
    (CAST(date_trunc('month', "orders"."day") AS DATE)) AS "orders.month",
    "orders"."amount" AS "revenue_arg"
  FROM "timed"."orders" AS "orders"
  WHERE ((EXTRACT(YEAR FROM "orders"."day")) = 2025)
),
"orders_cells" AS (
  SELECT
    "orders.month",
    GROUPING("orders.month") AS "grouping_id",
    sum("revenue_arg") AS "revenue"
  FROM "orders_rows"
  GROUP BY GROUPING SETS (("orders.month"), ())
),
"rev_ly_orders_rows" AS (
  SELECT
    CAST(date_trunc('month', CAST(("orders"."day" + INTERVAL '12 month') AS DATE)) AS DATE) AS "orders.month",
    "orders"."amount" AS "rev_ly_revenue_arg"
  FROM "timed"."orders" AS "orders"
  WHERE (EXTRACT(YEAR FROM CAST(("orders"."day" + INTERVAL '12 month') AS DATE)) = 2025)
),
"rev_ly_orders_cells" AS (
  SELECT
    "orders.month",
    GROUPING("orders.month") AS "grouping_id",
    sum("rev_ly_revenue_arg") AS "rev_ly_revenue"
  FROM "rev_ly_orders_rows"
  GROUP BY GROUPING SETS (("orders.month"), ())
),
"rev_lm_orders_rows" AS (
  SELECT
    CAST(date_trunc('month', CAST(("orders"."day" + INTERVAL '1 month') AS DATE)) AS DATE) AS "orders.month",
    "orders"."amount" AS "rev_lm_revenue_arg"
  FROM "timed"."orders" AS "orders"
  WHERE (EXTRACT(YEAR FROM CAST(("orders"."day" + INTERVAL '1 month') AS DATE)) = 2025)
),
"rev_lm_orders_cells" AS (
  SELECT
    "orders.month",
    GROUPING("orders.month") AS "grouping_id",
    sum("rev_lm_revenue_arg") AS "rev_lm_revenue"
  FROM "rev_lm_orders_rows"
  GROUP BY GROUPING SETS (("orders.month"), ())
)
SELECT
  "orders_cells"."orders.month",
  "orders_cells"."revenue" AS "revenue",
  "rev_ly_orders_cells"."rev_ly_revenue" AS "rev_ly",
  "rev_lm_orders_cells"."rev_lm_revenue" AS "rev_lm",
  "orders_cells"."grouping_id"
FROM "orders_cells"
  LEFT JOIN "rev_ly_orders_cells" ON "rev_ly_orders_cells"."grouping_id" = "orders_cells"."grouping_id"
    AND "rev_ly_orders_cells"."orders.month" IS NOT DISTINCT FROM "orders_cells"."orders.month"
  LEFT JOIN "rev_lm_orders_cells" ON "rev_lm_orders_cells"."grouping_id" = "orders_cells"."grouping_id"
    AND "rev_lm_orders_cells"."orders.month" IS NOT DISTINCT FROM "orders_cells"."orders.month"
ORDER BY ("orders_cells"."grouping_id" & 1), "orders_cells"."orders.month" ASC NULLS LAST;
