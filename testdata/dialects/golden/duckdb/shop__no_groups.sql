-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,items,mid_line,line_sd,line_var' -d duckdb
WITH "sales_rows" AS (
  SELECT
    ("sales"."price" * "sales"."qty") AS "revenue_arg",
    "sales"."item" AS "items_arg",
    (("sales"."price" * "sales"."qty")) AS "mid_line_arg"
  FROM "shop"."sales" AS "sales"
),
"sales_cells" AS (
  SELECT
    0 AS "grouping_id",
    sum("revenue_arg") AS "revenue",
    count(DISTINCT "items_arg") AS "items",
    median(CAST("mid_line_arg" AS DOUBLE)) AS "mid_line",
    stddev_samp("mid_line_arg") AS "line_sd",
    var_samp("mid_line_arg") AS "line_var"
  FROM "sales_rows"
)
SELECT
  "revenue",
  "items",
  "mid_line",
  "line_sd",
  "line_var",
  "grouping_id"
FROM "sales_cells";
