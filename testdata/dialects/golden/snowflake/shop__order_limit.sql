-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m revenue -b sales.item --order 'revenue desc' --limit 2 --totals grand -d snowflake
WITH "SALES_ROWS" AS (
  SELECT
    "SALES"."ITEM" AS "sales.item",
    ("SALES"."PRICE" * "SALES"."QTY") AS "REVENUE_ARG"
  FROM "SHOP"."SALES" AS "SALES"
),
"SALES_CELLS" AS (
  SELECT
    "sales.item",
    GROUPING("sales.item") AS "GROUPING_ID",
    sum("REVENUE_ARG") AS "REVENUE"
  FROM "SALES_ROWS"
  GROUP BY GROUPING SETS (("sales.item"), ())
),
"RESULT" AS (
  SELECT
    "sales.item",
    "REVENUE",
    "GROUPING_ID"
  FROM "SALES_CELLS"
),
"RESULT_RANKED" AS (
  SELECT
    "sales.item",
    "REVENUE",
    "GROUPING_ID",
    count(*) OVER (PARTITION BY "GROUPING_ID" ORDER BY CASE WHEN "GROUPING_ID" = 0 THEN 0 ELSE 1 END, "REVENUE" DESC NULLS LAST, BITAND("GROUPING_ID", 1), "sales.item" ASC NULLS LAST ROWS BETWEEN UNBOUNDED PRECEDING AND CURRENT ROW) AS "DETAIL_RANK"
  FROM "RESULT"
)
SELECT
  "sales.item",
  "REVENUE",
  "GROUPING_ID"
FROM "RESULT_RANKED"
WHERE ("GROUPING_ID" = 0 AND "DETAIL_RANK" <= 2)
  OR "GROUPING_ID" = 1
ORDER BY CASE WHEN "GROUPING_ID" = 0 THEN 0 ELSE 1 END, "REVENUE" DESC NULLS LAST, BITAND("GROUPING_ID", 1), "sales.item" ASC NULLS LAST;
