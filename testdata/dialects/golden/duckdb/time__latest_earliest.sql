-- rollwise sql testdata/exec/time.roll -m 'closing,opening' -b orders.shop --totals grand -d duckdb
WITH "orders_rows" AS (
  SELECT
    "orders"."shop" AS "orders.shop"
  FROM "timed"."orders" AS "orders"
),
"orders_cells" AS (
  SELECT
    "orders.shop",
    GROUPING("orders.shop") AS "grouping_id"
  FROM "orders_rows"
  GROUP BY GROUPING SETS (("orders.shop"), ())
),
"closing_latest_per_orders_rows" AS (
  SELECT
    "orders"."shop" AS "orders.shop",
    "orders"."day" AS "orders.day per",
    "orders"."amount" AS "closing_latest_per_revenue_arg"
  FROM "timed"."orders" AS "orders"
),
"closing_latest_per_orders_cells" AS (
  SELECT
    "orders.shop",
    "orders.day per",
    GROUPING("orders.shop", "orders.day per") AS "grouping_id",
    sum("closing_latest_per_revenue_arg") AS "closing_latest_per_revenue"
  FROM "closing_latest_per_orders_rows"
  GROUP BY GROUPING SETS (("orders.shop", "orders.day per"), ("orders.day per"))
),
"closing_latest_per_groups" AS (
  SELECT
    "orders.shop",
    "orders.day per",
    "grouping_id",
    MAX("orders.day per") OVER (PARTITION BY "grouping_id", "orders.shop") AS "closing_latest_at",
    MIN("orders.day per") OVER (PARTITION BY "grouping_id", "orders.shop") AS "opening_earliest_at",
    "closing_latest_per_revenue" AS "closing_value",
    "closing_latest_per_revenue" AS "opening_value"
  FROM "closing_latest_per_orders_cells"
),
"closing_latest_per" AS (
  SELECT
    "orders.shop",
    "grouping_id",
    max("closing_value") FILTER (WHERE "orders.day per" IS NOT NULL AND "orders.day per" = "closing_latest_at") AS "closing_latest",
    max("opening_value") FILTER (WHERE "orders.day per" IS NOT NULL AND "orders.day per" = "opening_earliest_at") AS "opening_earliest"
  FROM "closing_latest_per_groups"
  GROUP BY "grouping_id", "orders.shop"
)
SELECT
  "orders_cells"."orders.shop",
  "closing_latest_per"."closing_latest" AS "closing",
  "closing_latest_per"."opening_earliest" AS "opening",
  "orders_cells"."grouping_id"
FROM "orders_cells"
  LEFT JOIN "closing_latest_per" ON "closing_latest_per"."grouping_id" = CASE "orders_cells"."grouping_id" WHEN 0 THEN 0 WHEN 1 THEN 2 END
    AND "closing_latest_per"."orders.shop" IS NOT DISTINCT FROM "orders_cells"."orders.shop"
ORDER BY ("orders_cells"."grouping_id" & 1), "orders_cells"."orders.shop" ASC NULLS LAST;
