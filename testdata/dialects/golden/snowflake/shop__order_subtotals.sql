-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,units' -b 'stores.region,sales.item' --order 'revenue desc' --limit 3 --totals rollup -d snowflake
WITH "SALES_ROWS" AS (
  SELECT
    "STORES"."REGION" AS "stores.region",
    "SALES"."ITEM" AS "sales.item",
    ("SALES"."PRICE" * "SALES"."QTY") AS "REVENUE_ARG",
    "SALES"."QTY" AS "UNITS_ARG"
  FROM "SHOP"."SALES" AS "SALES"
  LEFT JOIN "SHOP"."STORES" AS "STORES" ON "SALES"."STORE_ID" = "STORES"."ID"
),
"SALES_CELLS" AS (
  SELECT
    "stores.region",
    "sales.item",
    GROUPING("stores.region", "sales.item") AS "GROUPING_ID",
    sum("REVENUE_ARG") AS "REVENUE",
    sum("UNITS_ARG") AS "UNITS"
  FROM "SALES_ROWS"
  GROUP BY GROUPING SETS (("stores.region", "sales.item"), ("stores.region"), ())
),
"RESULT" AS (
  SELECT
    "stores.region",
    "sales.item",
    "REVENUE",
    "UNITS",
    "GROUPING_ID"
  FROM "SALES_CELLS"
),
"RESULT_SORTED" AS (
  SELECT
    "stores.region",
    "sales.item",
    "REVENUE",
    "UNITS",
    "GROUPING_ID",
    max(CASE WHEN BITAND("GROUPING_ID", 1) = 1 THEN "REVENUE" END) OVER (PARTITION BY BITAND("GROUPING_ID", 2), "stores.region") AS "SORT_1"
  FROM "RESULT"
),
"RESULT_RANKED" AS (
  SELECT
    "stores.region",
    "sales.item",
    "REVENUE",
    "UNITS",
    "GROUPING_ID",
    "SORT_1",
    count(*) OVER (PARTITION BY "GROUPING_ID" ORDER BY BITAND("GROUPING_ID", 2), "SORT_1" DESC NULLS LAST, "stores.region" ASC NULLS LAST, BITAND("GROUPING_ID", 1), "REVENUE" DESC NULLS LAST, "sales.item" ASC NULLS LAST ROWS BETWEEN UNBOUNDED PRECEDING AND CURRENT ROW) AS "DETAIL_RANK"
  FROM "RESULT_SORTED"
),
"RESULT_KEPT" AS (
  SELECT
    "stores.region",
    "sales.item",
    "REVENUE",
    "UNITS",
    "GROUPING_ID",
    "SORT_1",
    "DETAIL_RANK",
    min(CASE WHEN "GROUPING_ID" = 0 THEN "DETAIL_RANK" END) OVER (PARTITION BY "stores.region") AS "FIRST_RANK_1"
  FROM "RESULT_RANKED"
)
SELECT
  "stores.region",
  "sales.item",
  "REVENUE",
  "UNITS",
  "GROUPING_ID"
FROM "RESULT_KEPT"
WHERE ("GROUPING_ID" = 0 AND "DETAIL_RANK" <= 3)
  OR ("GROUPING_ID" = 1 AND "FIRST_RANK_1" <= 3)
  OR "GROUPING_ID" = 3
ORDER BY BITAND("GROUPING_ID", 2), "SORT_1" DESC NULLS LAST, "stores.region" ASC NULLS LAST, BITAND("GROUPING_ID", 1), "REVENUE" DESC NULLS LAST, "sales.item" ASC NULLS LAST;
