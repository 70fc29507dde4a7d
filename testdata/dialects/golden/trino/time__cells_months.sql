-- rollwise sql testdata/exec/time.roll -m 'revenue,ytd,running,run_shops' -b 'orders.month,orders.shop' -w 'orders.shop <> '\''z'\''' -d trino
WITH "orders_rows" AS (
  SELECT
    (date_trunc('month', "orders"."day")) AS "orders.month",
    "orders"."shop" AS "orders.shop",
    "orders"."amount" AS "revenue_arg",
    "orders"."day" AS "ytd_arg"
  FROM "timed"."orders" AS "orders"
  WHERE ("orders"."shop" <> 'z')
),
"orders_cells" AS (
  SELECT
    "orders.month",
    "orders.shop",
    0 AS "grouping_id",
    sum("revenue_arg") AS "revenue",
    max("ytd_arg") AS "ytd"
  FROM "orders_rows"
  GROUP BY "orders.month", "orders.shop"
),
"run_shops_orders_rows" AS (
  SELECT
    (date_trunc('month', "orders"."day")) AS "orders.month",
    "orders"."day" AS "run_shops_arg"
  FROM "timed"."orders" AS "orders"
),
"run_shops_orders_cells" AS (
  SELECT
    "orders.month",
    0 AS "grouping_id",
    max("run_shops_arg") AS "run_shops"
  FROM "run_shops_orders_rows"
  GROUP BY "orders.month"
),
"run_shops_orders_2_rows" AS (
  SELECT
    "orders"."day" AS "run_shops_orders_2_at",
    "orders"."amount" AS "run_shops_revenue_arg"
  FROM "timed"."orders" AS "orders"
),
"run_shops_orders_2_ends" AS (
  SELECT "orders_cells"."grouping_id", "orders_cells"."orders.month", "orders_cells"."orders.shop", "run_shops_orders_cells"."run_shops" AS "run_shops_orders_2_end"
  FROM "orders_cells"
  LEFT JOIN "run_shops_orders_cells" ON "run_shops_orders_cells"."orders.month" IS NOT DISTINCT FROM "orders_cells"."orders.month"
),
"run_shops_orders_2_cells" AS (
  SELECT "a"."grouping_id", "a"."orders.month", "a"."orders.shop", sum("x"."run_shops_revenue_arg") AS "run_shops_revenue"
  FROM "run_shops_orders_2_ends" AS "a"
  JOIN "run_shops_orders_2_rows" AS "x" ON "x"."run_shops_orders_2_at" <= "a"."run_shops_orders_2_end"
  GROUP BY "a"."grouping_id", "a"."orders.month", "a"."orders.shop"
)
SELECT
  "orders_cells"."orders.month",
  "orders_cells"."orders.shop",
  "orders_cells"."revenue" AS "revenue",
  CASE WHEN "orders_cells"."ytd" IS NOT NULL THEN sum("orders_cells"."revenue") OVER (PARTITION BY "orders_cells"."grouping_id", "orders_cells"."orders.shop", date_trunc('year', "orders_cells"."orders.month") ORDER BY "orders_cells"."orders.month" RANGE BETWEEN UNBOUNDED PRECEDING AND CURRENT ROW) END AS "ytd",
  CASE WHEN "orders_cells"."ytd" IS NOT NULL THEN sum("orders_cells"."revenue") OVER (PARTITION BY "orders_cells"."grouping_id", "orders_cells"."orders.shop", CASE WHEN "orders_cells"."orders.month" IS NULL THEN 1 ELSE 0 END ORDER BY "orders_cells"."orders.month" RANGE BETWEEN UNBOUNDED PRECEDING AND CURRENT ROW) END AS "running",
  "run_shops_orders_2_cells"."run_shops_revenue" AS "run_shops",
  "orders_cells"."grouping_id"
FROM "orders_cells"
  LEFT JOIN "run_shops_orders_cells" ON "run_shops_orders_cells"."orders.month" IS NOT DISTINCT FROM "orders_cells"."orders.month"
  LEFT JOIN "run_shops_orders_2_cells" ON "run_shops_orders_2_cells"."orders.month" IS NOT DISTINCT FROM "orders_cells"."orders.month"
    AND "run_shops_orders_2_cells"."orders.shop" IS NOT DISTINCT FROM "orders_cells"."orders.shop"
ORDER BY "orders_cells"."orders.month" ASC NULLS LAST, "orders_cells"."orders.shop" ASC NULLS LAST;
