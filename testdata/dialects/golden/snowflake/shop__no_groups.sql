-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,items,mid_line,line_sd,line_var' -d snowflake
WITH "SALES_ROWS" AS (
  SELECT
    ("SALES"."PRICE" * "SALES"."QTY") AS "REVENUE_ARG",
    "SALES"."ITEM" AS "ITEMS_ARG",
    (("SALES"."PRICE" * "SALES"."QTY")) AS "MID_LINE_ARG"
  FROM "SHOP"."SALES" AS "SALES"
),
"SALES_CELLS" AS (
  SELECT
    0 AS "GROUPING_ID",
    sum("REVENUE_ARG") AS "REVENUE",
    count(DISTINCT "ITEMS_ARG") AS "ITEMS",
    median("MID_LINE_ARG") AS "MID_LINE",
    stddev_samp(CAST("MID_LINE_ARG" AS FLOAT)) AS "LINE_SD",
    var_samp(CAST("MID_LINE_ARG" AS FLOAT)) AS "LINE_VAR"
  FROM "SALES_ROWS"
)
SELECT
  "REVENUE",
  "ITEMS",
  "MID_LINE",
  "LINE_SD",
  "LINE_VAR",
  "GROUPING_ID"
FROM "SALES_CELLS";
