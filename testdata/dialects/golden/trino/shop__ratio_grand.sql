-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,margin_rate' -b stores.region --totals grand -d trino
WITH "sales_rows" AS (
  SELECT
    "stores"."region" AS "stores.region",
    ("sales"."price" * "sales"."qty") AS "revenue_arg",
    ("sales"."cost" * "sales"."qty") AS "cost_arg"
  FROM "shop"."sales" AS "sales"
  LEFT JOIN "shop"."stores" AS "stores" ON "sales"."store_id" = "stores"."id"
),
"sales_cells" AS (
  SELECT
    "stores.region",
    grouping("stores.region") AS "grouping_id",
    sum("revenue_arg") AS "revenue",
    sum("cost_arg") AS "cost"
  FROM "sales_rows"
  GROUP BY GROUPING SETS (("stores.region"), ())
)
SELECT
  "stores.region",
  "revenue",
  (CAST(("revenue" - "cost") AS DOUBLE) / NULLIF("revenue", 0)) AS "margin_rate",
  "grouping_id"
FROM "sales_cells"
ORDER BY bitwise_and("grouping_id", 1), "stores.region" ASC NULLS LAST;
