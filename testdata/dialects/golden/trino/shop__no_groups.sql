-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,items,mid_line,line_sd,line_var' -d trino
WITH "sales_rows" AS (
  SELECT
    ("sales"."price" * "sales"."qty") AS "revenue_arg",
    (("sales"."price" * "sales"."qty")) AS "mid_line_arg"
  FROM "shop"."sales" AS "sales"
),
"sales_ranks" AS (
  SELECT
    "revenue_arg",
    "mid_line_arg",
    "mid_line_arg" AS "mid_line_median_value",
    ROW_NUMBER() OVER (ORDER BY "mid_line_arg" ASC NULLS LAST) AS "mid_line_median_number",
    count("mid_line_arg") OVER (ORDER BY "mid_line_arg" ASC NULLS LAST ROWS BETWEEN UNBOUNDED PRECEDING AND UNBOUNDED FOLLOWING) AS "mid_line_median_count"
  FROM "sales_rows"
),
"sales_cells" AS (
  SELECT
    0 AS "grouping_id",
    sum("revenue_arg") AS "revenue",
    avg(CAST(CASE WHEN 2 * "mid_line_median_number" BETWEEN "mid_line_median_count" AND "mid_line_median_count" + 2 THEN "mid_line_median_value" END AS DOUBLE)) AS "mid_line",
    stddev_samp(CAST("mid_line_arg" AS DOUBLE)) AS "line_sd",
    var_samp(CAST("mid_line_arg" AS DOUBLE)) AS "line_var"
  FROM "sales_ranks"
),
"items_per_sales_rows" AS (
  SELECT
    "sales"."item" AS "sales.item per"
  FROM "shop"."sales" AS "sales"
),
"items_per_sales_cells" AS (
  SELECT
    "sales.item per",
    0 AS "grouping_id"
  FROM "items_per_sales_rows"
  GROUP BY "sales.item per"
),
"items_per_groups" AS (
  SELECT
    "sales.item per",
    "grouping_id"
  FROM "items_per_sales_cells"
),
"items_per" AS (
  SELECT
    "grouping_id",
    count(*) FILTER (WHERE "sales.item per" IS NOT NULL) AS "items"
  FROM "items_per_groups"
  GROUP BY "grouping_id"
)
SELECT
  "sales_cells"."revenue" AS "revenue",
  COALESCE("items_per"."items", 0) AS "items",
  "sales_cells"."mid_line" AS "mid_line",
  "sales_cells"."line_sd" AS "line_sd",
  "sales_cells"."line_var" AS "line_var",
  "sales_cells"."grouping_id"
FROM "sales_cells"
  LEFT JOIN "items_per" ON 1 = 1;
