-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,item_share,rose_rev,region_share,store_avg' -b 'stores.region,sales.item' --totals rollup -d duckdb
WITH "sales_rows" AS MATERIALIZED (
  SELECT
    "stores"."region" AS "stores.region",
    "sales"."item" AS "sales.item",
    ("sales"."price" * "sales"."qty") AS "revenue_arg",
    ("sales"."item" = 'rose') AS "rose_rev_revenue_if_2",
    "sales"."store_id" AS "sales.store_id per"
  FROM "shop"."sales" AS "sales"
  LEFT JOIN "shop"."stores" AS "stores" ON "sales"."store_id" = "stores"."id"
),
"sales_cells" AS (
  SELECT
    "stores.region",
    "sales.item",
    GROUPING("stores.region", "sales.item") AS "grouping_id",
    sum("revenue_arg") AS "revenue",
    sum("revenue_arg") FILTER (WHERE "rose_rev_revenue_if_2") AS "rose_rev_revenue_cell"
  FROM "sales_rows"
  GROUP BY GROUPING SETS (("stores.region", "sales.item"), ("stores.region"), ())
),
"store_avg_per_sales_cells" AS (
  SELECT
    "stores.region",
    "sales.item",
    "sales.store_id per",
    GROUPING("stores.region", "sales.item", "sales.store_id per") AS "grouping_id",
    sum("revenue_arg") AS "store_avg_per_revenue"
  FROM "sales_rows"
  GROUP BY GROUPING SETS (("stores.region", "sales.item", "sales.store_id per"), ("stores.region", "sales.store_id per"), ("sales.store_id per"))
),
"store_avg_per_groups" AS (
  SELECT
    "stores.region",
    "sales.item",
    "sales.store_id per",
    "grouping_id",
    "store_avg_per_revenue" AS "store_avg_value"
  FROM "store_avg_per_sales_cells"
),
"store_avg_per" AS (
  SELECT
    "stores.region",
    "sales.item",
    "grouping_id",
    avg("store_avg_value") FILTER (WHERE "sales.store_id per" IS NOT NULL) AS "store_avg"
  FROM "store_avg_per_groups"
  GROUP BY "grouping_id", "stores.region", "sales.item"
)
SELECT
  "sales_cells"."stores.region",
  "sales_cells"."sales.item",
  "sales_cells"."revenue" AS "revenue",
  ("sales_cells"."revenue" / NULLIF(sum("sales_cells"."revenue") OVER (PARTITION BY "sales_cells"."grouping_id", "sales_cells"."stores.region"), 0)) AS "item_share",
  sum("sales_cells"."rose_rev_revenue_cell") OVER (PARTITION BY "sales_cells"."grouping_id", "sales_cells"."stores.region") AS "rose_rev",
  ("sales_cells"."revenue" / NULLIF(sum("sales_cells"."revenue") OVER (PARTITION BY "sales_cells"."grouping_id", "sales_cells"."sales.item"), 0)) AS "region_share",
  "store_avg_per"."store_avg" AS "store_avg",
  "sales_cells"."grouping_id"
FROM "sales_cells"
  LEFT JOIN "store_avg_per" ON "store_avg_per"."grouping_id" = CASE "sales_cells"."grouping_id" WHEN 0 THEN 0 WHEN 1 THEN 2 WHEN 3 THEN 6 END
    AND "store_avg_per"."stores.region" IS NOT DISTINCT FROM "sales_cells"."stores.region"
    AND "store_avg_per"."sales.item" IS NOT DISTINCT FROM "sales_cells"."sales.item"
ORDER BY ("sales_cells"."grouping_id" & 2), "sales_cells"."stores.region" ASC NULLS LAST, ("sales_cells"."grouping_id" & 1), "sales_cells"."sales.item" ASC NULLS LAST;
