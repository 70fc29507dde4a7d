-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,items,mid_line,line_sd,line_var' -d snowflake
WITH "SALES_ROWS" AS (
  SELECT
    ("SALES"."PRICE" * "SALES"."QTY") AS "REVENUE_ARG",
    (("SALES"."PRICE" * "SALES"."QTY")) AS "MID_LINE_ARG"
  FROM "SHOP"."SALES" AS "SALES"
),
"SALES_CELLS" AS (
  SELECT
    0 AS "GROUPING_ID",
    sum("REVENUE_ARG") AS "REVENUE",
    median("MID_LINE_ARG") AS "MID_LINE",
    stddev_samp(CAST("MID_LINE_ARG" AS FLOAT)) AS "LINE_SD",
    var_samp(CAST("MID_LINE_ARG" AS FLOAT)) AS "LINE_VAR"
  FROM "SALES_ROWS"
),
"ITEMS_PER_SALES_ROWS" AS (
  SELECT
    "SALES"."ITEM" AS "sales.item per"
  FROM "SHOP"."SALES" AS "SALES"
),
"ITEMS_PER_SALES_CELLS" AS (
  SELECT
    "sales.item per",
    0 AS "GROUPING_ID"
  FROM "ITEMS_PER_SALES_ROWS"
  GROUP BY "sales.item per"
),
"ITEMS_PER_GROUPS" AS (
  SELECT
    "sales.item per",
    "GROUPING_ID"
  FROM "ITEMS_PER_SALES_CELLS"
),
"ITEMS_PER" AS (
  SELECT
    "GROUPING_ID",
    count(CASE WHEN "sales.item per" IS NOT NULL THEN 1 END) AS "ITEMS"
  FROM "ITEMS_PER_GROUPS"
  GROUP BY "GROUPING_ID"
)
SELECT
  "SALES_CELLS"."REVENUE" AS "REVENUE",
  COALESCE("ITEMS_PER"."ITEMS", 0) AS "ITEMS",
  "SALES_CELLS"."MID_LINE" AS "MID_LINE",
  "SALES_CELLS"."LINE_SD" AS "LINE_SD",
  "SALES_CELLS"."LINE_VAR" AS "LINE_VAR",
  "SALES_CELLS"."GROUPING_ID"
FROM "SALES_CELLS"
  LEFT JOIN "ITEMS_PER" ON 1 = 1;
