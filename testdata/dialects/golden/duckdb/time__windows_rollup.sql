-- rollwise sql testdata/exec/time.roll -m 'ytd,running,last3' -b 'orders.shop,orders.month' --totals rollup -d duckdb
WITH "orders_rows" AS (
  SELECT
    "orders"."shop" AS "orders.shop",
    (CAST(date_trunc('month', "orders"."day") AS DATE)) AS "orders.month",
    "orders"."day" AS "ytd_arg"
  FROM "timed"."orders" AS "orders"
),
"orders_cells" AS (
  SELECT
    "orders.shop",
    "orders.month",
    GROUPING("orders.shop", "orders.month") AS "grouping_id",
    max("ytd_arg") AS "ytd"
  FROM "orders_rows"
  GROUP BY GROUPING SETS (("orders.shop", "orders.month"), ("orders.shop"), ())
),
"ytd_orders_rows" AS (
  SELECT
    "orders"."shop" AS "orders.shop",
    "orders"."day" AS "ytd_orders_at",
    "orders"."amount" AS "ytd_revenue_arg"
  FROM "timed"."orders" AS "orders"
),
"ytd_orders_ends" AS (
  SELECT "orders_cells"."grouping_id", "orders_cells"."orders.shop", "orders_cells"."orders.month", "orders_cells"."ytd" AS "ytd_orders_end"
  FROM "orders_cells"
),
"ytd_orders_cells" AS (
  SELECT "a"."grouping_id", "a"."orders.shop", "a"."orders.month", sum("x"."ytd_revenue_arg") AS "ytd_revenue"
  FROM "ytd_orders_ends" AS "a"
  JOIN "ytd_orders_rows" AS "x" ON "x"."ytd_orders_at" <= "a"."ytd_orders_end"
    AND "x"."ytd_orders_at" >= CAST(date_trunc('year', "a"."ytd_orders_end") AS DATE)
    AND (("a"."grouping_id" & 2) <> 0 OR "x"."orders.shop" IS NOT DISTINCT FROM "a"."orders.shop")
  GROUP BY "a"."grouping_id", "a"."orders.shop", "a"."orders.month"
),
"running_orders_rows" AS (
  SELECT
    "orders"."shop" AS "orders.shop",
    "orders"."day" AS "running_orders_at",
    "orders"."amount" AS "running_revenue_arg"
  FROM "timed"."orders" AS "orders"
),
"running_orders_ends" AS (
  SELECT "orders_cells"."grouping_id", "orders_cells"."orders.shop", "orders_cells"."orders.month", "orders_cells"."ytd" AS "running_orders_end"
  FROM "orders_cells"
),
"running_orders_cells" AS (
  SELECT "a"."grouping_id", "a"."orders.shop", "a"."orders.month", sum("x"."running_revenue_arg") AS "running_revenue"
  FROM "running_orders_ends" AS "a"
  JOIN "running_orders_rows" AS "x" ON "x"."running_orders_at" <= "a"."running_orders_end"
    AND (("a"."grouping_id" & 2) <> 0 OR "x"."orders.shop" IS NOT DISTINCT FROM "a"."orders.shop")
  GROUP BY "a"."grouping_id", "a"."orders.shop", "a"."orders.month"
),
"last3_orders_rows" AS (
  SELECT
    "orders"."shop" AS "orders.shop",
    "orders"."day" AS "last3_orders_at",
    "orders"."amount" AS "last3_revenue_arg"
  FROM "timed"."orders" AS "orders"
),
"last3_orders_ends" AS (
  SELECT "orders_cells"."grouping_id", "orders_cells"."orders.shop", "orders_cells"."orders.month", "orders_cells"."ytd" AS "last3_orders_end"
  FROM "orders_cells"
),
"last3_orders_cells" AS (
  SELECT "a"."grouping_id", "a"."orders.shop", "a"."orders.month", sum("x"."last3_revenue_arg") AS "last3_revenue"
  FROM "last3_orders_ends" AS "a"
  JOIN "last3_orders_rows" AS "x" ON "x"."last3_orders_at" <= "a"."last3_orders_end"
    AND "x"."last3_orders_at" > CAST(("a"."last3_orders_end" + INTERVAL '-3 month') AS DATE)
    AND (("a"."grouping_id" & 2) <> 0 OR "x"."orders.shop" IS NOT DISTINCT FROM "a"."orders.shop")
  GROUP BY "a"."grouping_id", "a"."orders.shop", "a"."orders.month"
)
SELECT
  "orders_cells"."orders.shop",
  "orders_cells"."orders.month",
  "ytd_orders_cells"."ytd_revenue" AS "ytd",
  "running_orders_cells"."running_revenue" AS "running",
  "last3_orders_cells"."last3_revenue" AS "last3",
  "orders_cells"."grouping_id"
FROM "orders_cells"
  LEFT JOIN "ytd_orders_cells" ON "ytd_orders_cells"."grouping_id" = "orders_cells"."grouping_id"
    AND "ytd_orders_cells"."orders.shop" IS NOT DISTINCT FROM "orders_cells"."orders.shop"
    AND "ytd_orders_cells"."orders.month" IS NOT DISTINCT FROM "orders_cells"."orders.month"
  LEFT JOIN "running_orders_cells" ON "running_orders_cells"."grouping_id" = "orders_cells"."grouping_id"
    AND "running_orders_cells"."orders.shop" IS NOT DISTINCT FROM "orders_cells"."orders.shop"
    AND "running_orders_cells"."orders.month" IS NOT DISTINCT FROM "orders_cells"."orders.month"
  LEFT JOIN "last3_orders_cells" ON "last3_orders_cells"."grouping_id" = "orders_cells"."grouping_id"
    AND "last3_orders_cells"."orders.shop" IS NOT DISTINCT FROM "orders_cells"."orders.shop"
    AND "last3_orders_cells"."orders.month" IS NOT DISTINCT FROM "orders_cells"."orders.month"
ORDER BY ("orders_cells"."grouping_id" & 2), "orders_cells"."orders.shop" ASC NULLS LAST, ("orders_cells"."grouping_id" & 1), "orders_cells"."orders.month" ASC NULLS LAST;
