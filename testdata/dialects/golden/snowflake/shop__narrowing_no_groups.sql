-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m roses -w 'sales.qty >= 2' -d snowflake
WITH "SALES_ROWS" AS (
  SELECT
    ("SALES"."PRICE" * "SALES"."QTY") AS "ROSES_ARG"
  FROM "SHOP"."SALES" AS "SALES"
  WHERE ("SALES"."QTY" >= 2)
    AND ("SALES"."ITEM" = 'rose')
),
"SALES_CELLS" AS (
  SELECT
    0 AS "GROUPING_ID",
    sum("ROSES_ARG") AS "ROSES"
  FROM "SALES_ROWS"
)
SELECT
  "ROSES",
  "GROUPING_ID"
FROM "SALES_CELLS";
