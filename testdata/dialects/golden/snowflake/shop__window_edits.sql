-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,item_share,rose_rev,region_share,store_avg' -b 'stores.region,sales.item' --totals rollup -d snowflake
WITH "SALES_ROWS" AS (
  SELECT
    "STORES"."REGION" AS "stores.region",
    "SALES"."ITEM" AS "sales.item",
    ("SALES"."PRICE" * "SALES"."QTY") AS "REVENUE_ARG",
    ("SALES"."ITEM" = 'rose') AS "ROSE_REV_REVENUE_IF_2",
    "SALES"."STORE_ID" AS "sales.store_id per"
  FROM "SHOP"."SALES" AS "SALES"
  LEFT JOIN "SHOP"."STORES" AS "STORES" ON "SALES"."STORE_ID" = "STORES"."ID"
),
"SALES_CELLS" AS (
  SELECT
    "stores.region",
    "sales.item",
    GROUPING("stores.region", "sales.item") AS "GROUPING_ID",
    sum("REVENUE_ARG") AS "REVENUE",
    sum(CASE WHEN "ROSE_REV_REVENUE_IF_2" THEN "REVENUE_ARG" END) AS "ROSE_REV_REVENUE_CELL"
  FROM "SALES_ROWS"
  GROUP BY GROUPING SETS (("stores.region", "sales.item"), ("stores.region"), ())
),
"STORE_AVG_PER_SALES_CELLS" AS (
  SELECT
    "stores.region",
    "sales.item",
    "sales.store_id per",
    GROUPING("stores.region", "sales.item", "sales.store_id per") AS "GROUPING_ID",
    sum("REVENUE_ARG") AS "STORE_AVG_PER_REVENUE"
  FROM "SALES_ROWS"
  GROUP BY GROUPING SETS (("stores.region", "sales.item", "sales.store_id per"), ("stores.region", "sales.store_id per"), ("sales.store_id per"))
),
"STORE_AVG_PER_GROUPS" AS (
  SELECT
    "stores.region",
    "sales.item",
    "sales.store_id per",
    "GROUPING_ID",
    "STORE_AVG_PER_REVENUE" AS "STORE_AVG_VALUE"
  FROM "STORE_AVG_PER_SALES_CELLS"
),
"STORE_AVG_PER" AS (
  SELECT
    "stores.region",
    "sales.item",
    "GROUPING_ID",
    avg(CAST(CASE WHEN "sales.store_id per" IS NOT NULL THEN "STORE_AVG_VALUE" END AS FLOAT)) AS "STORE_AVG"
  FROM "STORE_AVG_PER_GROUPS"
  GROUP BY "GROUPING_ID", "stores.region", "sales.item"
)
SELECT
  "SALES_CELLS"."stores.region",
  "SALES_CELLS"."sales.item",
  "SALES_CELLS"."REVENUE" AS "REVENUE",
  (CAST("SALES_CELLS"."REVENUE" AS FLOAT) / NULLIF(sum("SALES_CELLS"."REVENUE") OVER (PARTITION BY "SALES_CELLS"."GROUPING_ID", "SALES_CELLS"."stores.region"), 0)) AS "ITEM_SHARE",
  sum("SALES_CELLS"."ROSE_REV_REVENUE_CELL") OVER (PARTITION BY "SALES_CELLS"."GROUPING_ID", "SALES_CELLS"."stores.region") AS "ROSE_REV",
  (CAST("SALES_CELLS"."REVENUE" AS FLOAT) / NULLIF(sum("SALES_CELLS"."REVENUE") OVER (PARTITION BY "SALES_CELLS"."GROUPING_ID", "SALES_CELLS"."sales.item"), 0)) AS "REGION_SHARE",
  "STORE_AVG_PER"."STORE_AVG" AS "STORE_AVG",
  "SALES_CELLS"."GROUPING_ID"
FROM "SALES_CELLS"
  LEFT JOIN "STORE_AVG_PER" ON "STORE_AVG_PER"."GROUPING_ID" = CASE "SALES_CELLS"."GROUPING_ID" WHEN 0 THEN 0 WHEN 1 THEN 2 WHEN 3 THEN 6 END
    AND "STORE_AVG_PER"."stores.region" IS NOT DISTINCT FROM "SALES_CELLS"."stores.region"
    AND "STORE_AVG_PER"."sales.item" IS NOT DISTINCT FROM "SALES_CELLS"."sales.item"
ORDER BY BITAND("SALES_CELLS"."GROUPING_ID", 2), "SALES_CELLS"."stores.region" ASC NULLS LAST, BITAND("SALES_CELLS"."GROUPING_ID", 1), "SALES_CELLS"."sales.item" ASC NULLS LAST;
