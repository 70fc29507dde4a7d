-- rollwise sql testdata/exec/time.roll -m 'revenue,rev_ly,rev_lm,ly_shops' -b 'orders.month,orders.shop' --totals rollup -d trino
WITH "orders_rows" AS (
  SELECT
    (date_trunc('month', "orders"."day")) AS "orders.month",
    "orders"."shop" AS "orders.shop",
    "orders"."amount" AS "revenue_arg"
  FROM "timed"."orders" AS "orders"
),
"orders_cells" AS (
  SELECT
    "orders.month",
    "orders.shop",
    grouping("orders.month", "orders.shop") AS "grouping_id",
    sum("revenue_arg") AS "revenue"
  FROM "orders_rows"
  GROUP BY GROUPING SETS (("orders.month", "orders.shop"), ("orders.month"), ())
),
"ly_shops_orders_unmoved_rows" AS (
  SELECT
    (date_trunc('month', "orders"."day")) AS "orders.month",
    "orders"."amount" AS "ly_shops_revenue_arg_2"
  FROM "timed"."orders" AS "orders"
),
"ly_shops_orders_unmoved_cells" AS (
  SELECT
    "orders.month",
    grouping("orders.month") AS "grouping_id",
    sum("ly_shops_revenue_arg_2") AS "ly_shops_revenue_cell"
  FROM "ly_shops_orders_unmoved_rows"
  GROUP BY GROUPING SETS (("orders.month"), ())
),
"rev_ly_orders_moved" AS (
  SELECT "grouping_id", date_add('month', 12, "orders.month") AS "orders.month", "orders.shop", sum("revenue") AS "rev_ly_revenue"
  FROM "orders_cells"
  GROUP BY "grouping_id", date_add('month', 12, "orders.month"), "orders.shop"
),
"rev_lm_orders_moved" AS (
  SELECT "grouping_id", date_add('month', 1, "orders.month") AS "orders.month", "orders.shop", sum("revenue") AS "rev_lm_revenue"
  FROM "orders_cells"
  GROUP BY "grouping_id", date_add('month', 1, "orders.month"), "orders.shop"
),
"ly_shops_orders_moved" AS (
  SELECT "grouping_id", date_add('month', 12, "orders.month") AS "orders.month", sum("ly_shops_revenue_cell") AS "ly_shops_revenue"
  FROM "ly_shops_orders_unmoved_cells"
  GROUP BY "grouping_id", date_add('month', 12, "orders.month")
)
SELECT
  "orders_cells"."orders.month",
  "orders_cells"."orders.shop",
  "orders_cells"."revenue" AS "revenue",
  "rev_ly_orders_moved"."rev_ly_revenue" AS "rev_ly",
  "rev_lm_orders_moved"."rev_lm_revenue" AS "rev_lm",
  "ly_shops_orders_moved"."ly_shops_revenue" AS "ly_shops",
  "orders_cells"."grouping_id"
FROM "orders_cells"
  LEFT JOIN "rev_ly_orders_moved" ON "rev_ly_orders_moved"."grouping_id" = "orders_cells"."grouping_id"
    AND "rev_ly_orders_moved"."orders.month" IS NOT DISTINCT FROM "orders_cells"."orders.month"
    AND "rev_ly_orders_moved"."orders.shop" IS NOT DISTINCT FROM "orders_cells"."orders.shop"
  LEFT JOIN "rev_lm_orders_moved" ON "rev_lm_orders_moved"."grouping_id" = "orders_cells"."grouping_id"
    AND "rev_lm_orders_moved"."orders.month" IS NOT DISTINCT FROM "orders_cells"."orders.month"
    AND "rev_lm_orders_moved"."orders.shop" IS NOT DISTINCT FROM "orders_cells"."orders.shop"
  LEFT JOIN "ly_shops_orders_moved" ON "ly_shops_orders_moved"."grouping_id" = CASE "orders_cells"."grouping_id" WHEN 0 THEN 0 WHEN 1 THEN 0 WHEN 3 THEN 1 END
    AND "ly_shops_orders_moved"."orders.month" IS NOT DISTINCT FROM "orders_cells"."orders.month"
ORDER BY bitwise_and("orders_cells"."grouping_id", 2), "orders_cells"."orders.month" ASC NULLS LAST, bitwise_and("orders_cells"."grouping_id", 1), "orders_cells"."orders.shop" ASC NULLS LAST;
