-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m roses -w 'sales.qty >= 2' -d postgres
WITH "sales_rows" AS (
  SELECT
    ("sales"."price" * "sales"."qty") AS "roses_arg"
  FROM "shop"."sales" AS "sales"
  WHERE ("sales"."qty" >= 2)
    AND ("sales"."item" = 'rose')
),
"sales_cells" AS (
  SELECT
    0 AS "grouping_id",
    sum("roses_arg") AS "roses"
  FROM "sales_rows"
)
SELECT
  "roses",
  "grouping_id"
FROM "sales_cells";
