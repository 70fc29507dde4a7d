-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,roses,rose_share' -b stores.region -w 'stores.region = '\''North'\'' and sales.qty >= 2' -d snowflake
WITH "SALES_ROWS" AS (
  SELECT
    "STORES"."REGION" AS "stores.region",
    ("SALES"."PRICE" * "SALES"."QTY") AS "REVENUE_ARG",
    ("SALES"."ITEM" = 'rose') AS "ROSES_IF"
  FROM "SHOP"."SALES" AS "SALES"
  JOIN "SHOP"."STORES" AS "STORES" ON "SALES"."STORE_ID" = "STORES"."ID"
  WHERE ("STORES"."REGION" = 'North')
    AND ("SALES"."QTY" >= 2)
),
"SALES_CELLS" AS (
  SELECT
    "stores.region",
    0 AS "GROUPING_ID",
    sum("REVENUE_ARG") AS "REVENUE",
    sum(CASE WHEN "ROSES_IF" THEN "REVENUE_ARG" END) AS "ROSES"
  FROM "SALES_ROWS"
  GROUP BY "stores.region"
)
SELECT
  "stores.region",
  "REVENUE",
  "ROSES",
  (CAST("ROSES" AS FLOAT) / NULLIF("REVENUE", 0)) AS "ROSE_SHARE",
  "GROUPING_ID"
FROM "SALES_CELLS"
ORDER BY "stores.region" ASC NULLS LAST;
