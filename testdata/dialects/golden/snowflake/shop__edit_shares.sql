-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,item_share,shown_share,rose_fern' -b 'stores.region,sales.item' --totals rollup -w 'sales.item <> '\''tulip'\''' -d snowflake
WITH "SALES_ROWS" AS (
  SELECT
    "STORES"."REGION" AS "stores.region",
    "SALES"."ITEM" AS "sales.item",
    ("SALES"."PRICE" * "SALES"."QTY") AS "REVENUE_ARG"
  FROM "SHOP"."SALES" AS "SALES"
  LEFT JOIN "SHOP"."STORES" AS "STORES" ON "SALES"."STORE_ID" = "STORES"."ID"
  WHERE ("SALES"."ITEM" <> 'tulip')
),
"SALES_CELLS" AS (
  SELECT
    "stores.region",
    "sales.item",
    GROUPING("stores.region", "sales.item") AS "GROUPING_ID",
    sum("REVENUE_ARG") AS "REVENUE"
  FROM "SALES_ROWS"
  GROUP BY GROUPING SETS (("stores.region", "sales.item"), ("stores.region"), ())
),
"ITEM_SHARE_SALES_ROWS" AS (
  SELECT
    "STORES"."REGION" AS "stores.region",
    ("SALES"."PRICE" * "SALES"."QTY") AS "ITEM_SHARE_REVENUE_ARG",
    ("SALES"."ITEM" IN ('rose', 'fern')) AS "ROSE_FERN_REVENUE_IF"
  FROM "SHOP"."SALES" AS "SALES"
  LEFT JOIN "SHOP"."STORES" AS "STORES" ON "SALES"."STORE_ID" = "STORES"."ID"
),
"ITEM_SHARE_SALES_CELLS" AS (
  SELECT
    "stores.region",
    GROUPING("stores.region") AS "GROUPING_ID",
    sum("ITEM_SHARE_REVENUE_ARG") AS "ITEM_SHARE_REVENUE",
    sum(CASE WHEN "ROSE_FERN_REVENUE_IF" THEN "ITEM_SHARE_REVENUE_ARG" END) AS "ROSE_FERN_REVENUE"
  FROM "ITEM_SHARE_SALES_ROWS"
  GROUP BY GROUPING SETS (("stores.region"), ())
)
SELECT
  "SALES_CELLS"."stores.region",
  "SALES_CELLS"."sales.item",
  "SALES_CELLS"."REVENUE" AS "REVENUE",
  (CAST("SALES_CELLS"."REVENUE" AS FLOAT) / NULLIF("ITEM_SHARE_SALES_CELLS"."ITEM_SHARE_REVENUE", 0)) AS "ITEM_SHARE",
  (CAST("SALES_CELLS"."REVENUE" AS FLOAT) / NULLIF(sum("SALES_CELLS"."REVENUE") OVER (PARTITION BY "SALES_CELLS"."GROUPING_ID", "SALES_CELLS"."stores.region"), 0)) AS "SHOWN_SHARE",
  "ITEM_SHARE_SALES_CELLS"."ROSE_FERN_REVENUE" AS "ROSE_FERN",
  "SALES_CELLS"."GROUPING_ID"
FROM "SALES_CELLS"
  LEFT JOIN "ITEM_SHARE_SALES_CELLS" ON "ITEM_SHARE_SALES_CELLS"."GROUPING_ID" = CASE "SALES_CELLS"."GROUPING_ID" WHEN 0 THEN 0 WHEN 1 THEN 0 WHEN 3 THEN 1 END
    AND "ITEM_SHARE_SALES_CELLS"."stores.region" IS NOT DISTINCT FROM "SALES_CELLS"."stores.region"
ORDER BY BITAND("SALES_CELLS"."GROUPING_ID", 2), "SALES_CELLS"."stores.region" ASC NULLS LAST, BITAND("SALES_CELLS"."GROUPING_ID", 1), "SALES_CELLS"."sales.item" ASC NULLS LAST;
