-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m units -b 'stores.region,sales.item' --totals all -d snowflake
WITH "SALES_ROWS" AS (
  SELECT
    "STORES"."REGION" AS "stores.region",
    "SALES"."ITEM" AS "sales.item",
    "SALES"."QTY" AS "UNITS_ARG"
  FROM "SHOP"."SALES" AS "SALES"
  LEFT JOIN "SHOP"."STORES" AS "STORES" ON "SALES"."STORE_ID" = "STORES"."ID"
),
"SALES_CELLS" AS (
  SELECT
    "stores.region",
    "sales.item",
    GROUPING("stores.region", "sales.item") AS "GROUPING_ID",
    sum("UNITS_ARG") AS "UNITS"
  FROM "SALES_ROWS"
  GROUP BY GROUPING SETS (("stores.region", "sales.item"), ("stores.region"), ("sales.item"), ())
)
SELECT
  "stores.region",
  "sales.item",
  "UNITS",
  "GROUPING_ID"
FROM "SALES_CELLS"
ORDER BY BITAND("GROUPING_ID", 2), "stores.region" ASC NULLS LAST, BITAND("GROUPING_ID", 1), "sales.item" ASC NULLS LAST;
