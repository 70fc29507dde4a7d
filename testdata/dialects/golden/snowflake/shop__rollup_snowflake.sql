-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,units' -b 'districts.area,sales.item' --totals rollup -d snowflake
WITH "SALES_ROWS" AS (
  SELECT
    "DISTRICTS"."AREA" AS "districts.area",
    "SALES"."ITEM" AS "sales.item",
    ("SALES"."PRICE" * "SALES"."QTY") AS "REVENUE_ARG",
    "SALES"."QTY" AS "UNITS_ARG"
  FROM "SHOP"."SALES" AS "SALES"
  LEFT JOIN "SHOP"."STORES" AS "STORES" ON "SALES"."STORE_ID" = "STORES"."ID"
  LEFT JOIN "DISTRICTS" AS "DISTRICTS" ON "STORES"."DISTRICT_ID" = "DISTRICTS"."ID"
),
"SALES_CELLS" AS (
  SELECT
    "districts.area",
    "sales.item",
    GROUPING("districts.area", "sales.item") AS "GROUPING_ID",
    sum("REVENUE_ARG") AS "REVENUE",
    sum("UNITS_ARG") AS "UNITS"
  FROM "SALES_ROWS"
  GROUP BY GROUPING SETS (("districts.area", "sales.item"), ("districts.area"), ())
)
SELECT
  "districts.area",
  "sales.item",
  "REVENUE",
  "UNITS",
  "GROUPING_ID"
FROM "SALES_CELLS"
ORDER BY BITAND("GROUPING_ID", 2), "districts.area" ASC NULLS LAST, BITAND("GROUPING_ID", 1), "sales.item" ASC NULLS LAST;
