-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m lines -b sales.line -w 'sales.line > 5' -d snowflake
WITH "SALES_ROWS" AS (
  SELECT
    (("SALES"."PRICE" * "SALES"."QTY")) AS "sales.line",
    "SALES"."ID" AS "LINES_ARG"
  FROM "SHOP"."SALES" AS "SALES"
  WHERE ((("SALES"."PRICE" * "SALES"."QTY")) > 5)
),
"SALES_CELLS" AS (
  SELECT
    "sales.line",
    0 AS "GROUPING_ID",
    count("LINES_ARG") AS "LINES"
  FROM "SALES_ROWS"
  GROUP BY "sales.line"
)
SELECT
  "sales.line",
  "LINES",
  "GROUPING_ID"
FROM "SALES_CELLS"
ORDER BY "sales.line" ASC NULLS LAST;
