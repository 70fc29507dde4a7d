-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'store_avg,big_items,chain_store_avg' -b stores.region --totals grand -d duckdb
WITH "sales_rows" AS MATERIALIZED (
  SELECT
    "stores"."region" AS "stores.region",
    "sales"."store_id" AS "sales.store_id per",
    ("sales"."price" * "sales"."qty") AS "store_avg_per_revenue_arg",
    "sales"."item" AS "sales.item per"
  FROM "shop"."sales" AS "sales"
  LEFT JOIN "shop"."stores" AS "stores" ON "sales"."store_id" = "stores"."id"
),
"sales_cells" AS (
  SELECT
    "stores.region",
    GROUPING("stores.region") AS "grouping_id"
  FROM "sales_rows"
  GROUP BY GROUPING SETS (("stores.region"), ())
),
"store_avg_per_sales_cells" AS (
  SELECT
    "stores.region",
    "sales.store_id per",
    GROUPING("stores.region", "sales.store_id per") AS "grouping_id",
    sum("store_avg_per_revenue_arg") AS "store_avg_per_revenue"
  FROM "sales_rows"
  GROUP BY GROUPING SETS (("stores.region", "sales.store_id per"), ("sales.store_id per"))
),
"store_avg_per_groups" AS (
  SELECT
    "stores.region",
    "sales.store_id per",
    "grouping_id",
    "store_avg_per_revenue" AS "store_avg_value"
  FROM "store_avg_per_sales_cells"
),
"store_avg_per" AS (
  SELECT
    "stores.region",
    "grouping_id",
    avg("store_avg_value") FILTER (WHERE "sales.store_id per" IS NOT NULL) AS "store_avg"
  FROM "store_avg_per_groups"
  GROUP BY "grouping_id", "stores.region"
),
"big_items_per_sales_cells" AS (
  SELECT
    "stores.region",
    "sales.item per",
    GROUPING("stores.region", "sales.item per") AS "grouping_id",
    sum("store_avg_per_revenue_arg") AS "big_items_per_revenue"
  FROM "sales_rows"
  GROUP BY GROUPING SETS (("stores.region", "sales.item per"), ("sales.item per"))
),
"big_items_per_groups" AS (
  SELECT
    "stores.region",
    "sales.item per",
    "grouping_id",
    ("big_items_per_revenue" > 16) AS "big_items_keep"
  FROM "big_items_per_sales_cells"
),
"big_items_per" AS (
  SELECT
    "stores.region",
    "grouping_id",
    count(*) FILTER (WHERE "sales.item per" IS NOT NULL AND "big_items_keep") AS "big_items"
  FROM "big_items_per_groups"
  GROUP BY "grouping_id", "stores.region"
),
"store_avg_per_2_sales_rows" AS (
  SELECT
    "sales"."store_id" AS "sales.store_id per",
    ("sales"."price" * "sales"."qty") AS "store_avg_per_2_revenue_arg"
  FROM "shop"."sales" AS "sales"
),
"store_avg_per_2_sales_cells" AS (
  SELECT
    "sales.store_id per",
    0 AS "grouping_id",
    sum("store_avg_per_2_revenue_arg") AS "store_avg_per_2_revenue"
  FROM "store_avg_per_2_sales_rows"
  GROUP BY "sales.store_id per"
),
"store_avg_per_2_groups" AS (
  SELECT
    "sales.store_id per",
    "grouping_id",
    "store_avg_per_2_revenue" AS "store_avg_value_2"
  FROM "store_avg_per_2_sales_cells"
),
"store_avg_per_2" AS (
  SELECT
    "grouping_id",
    avg("store_avg_value_2") FILTER (WHERE "sales.store_id per" IS NOT NULL) AS "store_avg_2"
  FROM "store_avg_per_2_groups"
  GROUP BY "grouping_id"
)
SELECT
  "sales_cells"."stores.region",
  "store_avg_per"."store_avg" AS "store_avg",
  COALESCE("big_items_per"."big_items", 0) AS "big_items",
  "store_avg_per_2"."store_avg_2" AS "chain_store_avg",
  "sales_cells"."grouping_id"
FROM "sales_cells"
  LEFT JOIN "store_avg_per" ON "store_avg_per"."grouping_id" = CASE "sales_cells"."grouping_id" WHEN 0 THEN 0 WHEN 1 THEN 2 END
    AND "store_avg_per"."stores.region" IS NOT DISTINCT FROM "sales_cells"."stores.region"
  LEFT JOIN "big_items_per" ON "big_items_per"."grouping_id" = CASE "sales_cells"."grouping_id" WHEN 0 THEN 0 WHEN 1 THEN 2 END
    AND "big_items_per"."stores.region" IS NOT DISTINCT FROM "sales_cells"."stores.region"
  LEFT JOIN "store_avg_per_2" ON 1 = 1
ORDER BY ("sales_cells"."grouping_id" & 1), "sales_cells"."stores.region" ASC NULLS LAST;
