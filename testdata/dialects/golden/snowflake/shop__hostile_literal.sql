-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m revenue -b stores.region -w 'stores.region in ('\''O'\'''\''Neil; DROP TABLE x; --'\'', '\''\\'\'', '\''ünï'\'')' -d snowflake
WITH "SALES_ROWS" AS (
  SELECT
    "STORES"."REGION" AS "stores.region",
    ("SALES"."PRICE" * "SALES"."QTY") AS "REVENUE_ARG"
  FROM "SHOP"."SALES" AS "SALES"
  JOIN "SHOP"."STORES" AS "STORES" ON "SALES"."STORE_ID" = "STORES"."ID"
  WHERE ("STORES"."REGION" IN ('O''Neil; DROP TABLE x; --', '\\\\', 'ünï'))
),
"SALES_CELLS" AS (
  SELECT
    "stores.region",
    0 AS "GROUPING_ID",
    sum("REVENUE_ARG") AS "REVENUE"
  FROM "SALES_ROWS"
  GROUP BY "stores.region"
)
SELECT
  "stores.region",
  "REVENUE",
  "GROUPING_ID"
FROM "SALES_CELLS"
ORDER BY "stores.region" ASC NULLS LAST;
