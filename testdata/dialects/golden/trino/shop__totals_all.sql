-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m units -b 'stores.region,sales.item' --totals all -d trino
WITH "sales_rows" AS (
  SELECT
    "stores"."region" AS "stores.region",
    "sales"."item" AS "sales.item",
    "sales"."qty" AS "units_arg"
  FROM "shop"."sales" AS "sales"
  LEFT JOIN "shop"."stores" AS "stores" ON "sales"."store_id" = "stores"."id"
),
"sales_cells" AS (
  SELECT
    "stores.region",
    "sales.item",
    grouping("stores.region", "sales.item") AS "grouping_id",
    sum("units_arg") AS "units"
  FROM "sales_rows"
  GROUP BY GROUPING SETS (("stores.region", "sales.item"), ("stores.region"), ("sales.item"), ())
)
SELECT
  "stores.region",
  "sales.item",
  "units",
  "grouping_id"
FROM "sales_cells"
ORDER BY bitwise_and("grouping_id", 2), "stores.region" ASC NULLS LAST, bitwise_and("grouping_id", 1), "sales.item" ASC NULLS LAST;
