-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m revenue -b sales.item --order 'revenue desc' --limit 2 -d snowflake
WITH "SALES_ROWS" AS (
  SELECT
    "SALES"."ITEM" AS "sales.item",
    ("SALES"."PRICE" * "SALES"."QTY") AS "REVENUE_ARG"
  FROM "SHOP"."SALES" AS "SALES"
),
"SALES_CELLS" AS (
  SELECT
    "sales.item",
    0 AS "GROUPING_ID",
    sum("REVENUE_ARG") AS "REVENUE"
  FROM "SALES_ROWS"
  GROUP BY "sales.item"
),
"RESULT" AS (
  SELECT
    "sales.item",
    "REVENUE",
    "GROUPING_ID"
  FROM "SALES_CELLS"
)
SELECT
  "sales.item",
  "REVENUE",
  "GROUPING_ID"
FROM "RESULT"
ORDER BY "REVENUE" DESC NULLS LAST, "sales.item" ASC NULLS LAST
LIMIT 2;
