-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m revenue -b sales.item --order 'revenue desc' --limit 2 -d trino
WITH "sales_rows" AS (
  SELECT
    "sales"."item" AS "sales.item",
    ("sales"."price" * "sales"."qty") AS "revenue_arg"
  FROM "shop"."sales" AS "sales"
),
"sales_cells" AS (
  SELECT
    "sales.item",
    0 AS "grouping_id",
    sum("revenue_arg") AS "revenue"
  FROM "sales_rows"
  GROUP BY "sales.item"
),
"result" AS (
  SELECT
    "sales.item",
    "revenue",
    "grouping_id"
  FROM "sales_cells"
)
SELECT
  "sales.item",
  "revenue",
  "grouping_id"
FROM "result"
ORDER BY "revenue" DESC NULLS LAST, "sales.item" ASC NULLS LAST
LIMIT 2;
