-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'store_avg,big_items,chain_store_avg' -b stores.region --totals grand -d snowflake
WITH "SALES_ROWS" AS (
  SELECT
    "STORES"."REGION" AS "stores.region",
    "SALES"."STORE_ID" AS "sales.store_id per",
    ("SALES"."PRICE" * "SALES"."QTY") AS "STORE_AVG_PER_REVENUE_ARG",
    "SALES"."ITEM" AS "sales.item per"
  FROM "SHOP"."SALES" AS "SALES"
  LEFT JOIN "SHOP"."STORES" AS "STORES" ON "SALES"."STORE_ID" = "STORES"."ID"
),
"SALES_CELLS" AS (
  SELECT
    "stores.region",
    GROUPING("stores.region") AS "GROUPING_ID"
  FROM "SALES_ROWS"
  GROUP BY GROUPING SETS (("stores.region"), ())
),
"STORE_AVG_PER_SALES_CELLS" AS (
  SELECT
    "stores.region",
    "sales.store_id per",
    GROUPING("stores.region", "sales.store_id per") AS "GROUPING_ID",
    sum("STORE_AVG_PER_REVENUE_ARG") AS "STORE_AVG_PER_REVENUE"
  FROM "SALES_ROWS"
  GROUP BY GROUPING SETS (("stores.region", "sales.store_id per"), ("sales.store_id per"))
),
"STORE_AVG_PER_GROUPS" AS (
  SELECT
    "stores.region",
    "sales.store_id per",
    "GROUPING_ID",
    "STORE_AVG_PER_REVENUE" AS "STORE_AVG_VALUE"
  FROM "STORE_AVG_PER_SALES_CELLS"
),
"STORE_AVG_PER" AS (
  SELECT
    "stores.region",
    "GROUPING_ID",
    avg(CAST(CASE WHEN "sales.store_id per" IS NOT NULL THEN "STORE_AVG_VALUE" END AS FLOAT)) AS "STORE_AVG"
  FROM "STORE_AVG_PER_GROUPS"
  GROUP BY "GROUPING_ID", "stores.region"
),
"BIG_ITEMS_PER_SALES_CELLS" AS (
  SELECT
    "stores.region",
    "sales.item per",
    GROUPING("stores.region", "sales.item per") AS "GROUPING_ID",
    sum("STORE_AVG_PER_REVENUE_ARG") AS "BIG_ITEMS_PER_REVENUE"
  FROM "SALES_ROWS"
  GROUP BY GROUPING SETS (("stores.region", "sales.item per"), ("sales.item per"))
),
"BIG_ITEMS_PER_GROUPS" AS (
  SELECT
    "stores.region",
    "sales.item per",
    "GROUPING_ID",
    ("BIG_ITEMS_PER_REVENUE" > 16) AS "BIG_ITEMS_KEEP"
  FROM "BIG_ITEMS_PER_SALES_CELLS"
),
"BIG_ITEMS_PER" AS (
  SELECT
    "stores.region",
    "GROUPING_ID",
    count(CASE WHEN "sales.item per" IS NOT NULL AND "BIG_ITEMS_KEEP" THEN 1 END) AS "BIG_ITEMS"
  FROM "BIG_ITEMS_PER_GROUPS"
  GROUP BY "GROUPING_ID", "stores.region"
),
"STORE_AVG_PER_2_SALES_ROWS" AS (
  SELECT
    "SALES"."STORE_ID" AS "sales.store_id per",
    ("SALES"."PRICE" * "SALES"."QTY") AS "STORE_AVG_PER_2_REVENUE_ARG"
  FROM "SHOP"."SALES" AS "SALES"
),
"STORE_AVG_PER_2_SALES_CELLS" AS (
  SELECT
    "sales.store_id per",
    0 AS "GROUPING_ID",
    sum("STORE_AVG_PER_2_REVENUE_ARG") AS "STORE_AVG_PER_2_REVENUE"
  FROM "STORE_AVG_PER_2_SALES_ROWS"
  GROUP BY "sales.store_id per"
),
"STORE_AVG_PER_2_GROUPS" AS (
  SELECT
    "sales.store_id per",
    "GROUPING_ID",
    "STORE_AVG_PER_2_REVENUE" AS "STORE_AVG_VALUE_2"
  FROM "STORE_AVG_PER_2_SALES_CELLS"
),
"STORE_AVG_PER_2" AS (
  SELECT
    "GROUPING_ID",
    avg(CAST(CASE WHEN "sales.store_id per" IS NOT NULL THEN "STORE_AVG_VALUE_2" END AS FLOAT)) AS "STORE_AVG_2"
  FROM "STORE_AVG_PER_2_GROUPS"
  GROUP BY "GROUPING_ID"
)
SELECT
  "SALES_CELLS"."stores.region",
  "STORE_AVG_PER"."STORE_AVG" AS "STORE_AVG",
  COALESCE("BIG_ITEMS_PER"."BIG_ITEMS", 0) AS "BIG_ITEMS",
  "STORE_AVG_PER_2"."STORE_AVG_2" AS "CHAIN_STORE_AVG",
  "SALES_CELLS"."GROUPING_ID"
FROM "SALES_CELLS"
  LEFT JOIN "STORE_AVG_PER" ON "STORE_AVG_PER"."GROUPING_ID" = CASE "SALES_CELLS"."GROUPING_ID" WHEN 0 THEN 0 WHEN 1 THEN 2 END
    AND "STORE_AVG_PER"."stores.region" IS NOT DISTINCT FROM "SALES_CELLS"."stores.region"
  LEFT JOIN "BIG_ITEMS_PER" ON "BIG_ITEMS_PER"."GROUPING_ID" = CASE "SALES_CELLS"."GROUPING_ID" WHEN 0 THEN 0 WHEN 1 THEN 2 END
    AND "BIG_ITEMS_PER"."stores.region" IS NOT DISTINCT FROM "SALES_CELLS"."stores.region"
  LEFT JOIN "STORE_AVG_PER_2" ON 1 = 1
ORDER BY BITAND("SALES_CELLS"."GROUPING_ID", 1), "SALES_CELLS"."stores.region" ASC NULLS LAST;
