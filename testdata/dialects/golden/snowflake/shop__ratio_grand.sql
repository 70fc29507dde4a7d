-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,margin_rate' -b stores.region --totals grand -d snowflake
WITH "SALES_ROWS" AS (
  SELECT
    "STORES"."REGION" AS "stores.region",
    ("SALES"."PRICE" * "SALES"."QTY") AS "REVENUE_ARG",
    ("SALES"."COST" * "SALES"."QTY") AS "COST_ARG"
  FROM "SHOP"."SALES" AS "SALES"
  LEFT JOIN "SHOP"."STORES" AS "STORES" ON "SALES"."STORE_ID" = "STORES"."ID"
),
"SALES_CELLS" AS (
  SELECT
    "stores.region",
    GROUPING("stores.region") AS "GROUPING_ID",
    sum("REVENUE_ARG") AS "REVENUE",
    sum("COST_ARG") AS "COST"
  FROM "SALES_ROWS"
  GROUP BY GROUPING SETS (("stores.region"), ())
)
SELECT
  "stores.region",
  "REVENUE",
  (CAST(("REVENUE" - "COST") AS FLOAT) / NULLIF("REVENUE", 0)) AS "MARGIN_RATE",
  "GROUPING_ID"
FROM "SALES_CELLS"
ORDER BY BITAND("GROUPING_ID", 1), "stores.region" ASC NULLS LAST;
