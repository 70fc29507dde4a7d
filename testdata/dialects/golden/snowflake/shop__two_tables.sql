-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,fees,jobs,takings' -b stores.region --totals grand -d snowflake
WITH "SALES_ROWS" AS (
  SELECT
    "STORES"."REGION" AS "stores.region",
    ("SALES"."PRICE" * "SALES"."QTY") AS "REVENUE_ARG"
  FROM "SHOP"."SALES" AS "SALES"
  LEFT JOIN "SHOP"."STORES" AS "STORES" ON "SALES"."STORE_ID" = "STORES"."ID"
),
"SALES_CELLS" AS (
  SELECT
    "stores.region",
    GROUPING("stores.region") AS "GROUPING_ID",
    sum("REVENUE_ARG") AS "REVENUE"
  FROM "SALES_ROWS"
  GROUP BY GROUPING SETS (("stores.region"), ())
),
"REPAIRS_ROWS" AS (
  SELECT
    "STORES"."REGION" AS "stores.region",
    "REPAIRS"."FEE" AS "FEES_ARG",
    "REPAIRS"."ID" AS "JOBS_ARG"
  FROM "SHOP"."REPAIRS" AS "REPAIRS"
  LEFT JOIN "SHOP"."STORES" AS "STORES" ON "REPAIRS"."STORE_ID" = "STORES"."ID"
),
"REPAIRS_CELLS" AS (
  SELECT
    "stores.region",
    GROUPING("stores.region") AS "GROUPING_ID",
    sum("FEES_ARG") AS "FEES",
    count("JOBS_ARG") AS "JOBS"
  FROM "REPAIRS_ROWS"
  GROUP BY GROUPING SETS (("stores.region"), ())
),
"CELLS" AS (
  SELECT "GROUPING_ID", "stores.region" FROM "SALES_CELLS"
  UNION
  SELECT "GROUPING_ID", "stores.region" FROM "REPAIRS_CELLS"
)
SELECT
  "CELLS"."stores.region",
  "SALES_CELLS"."REVENUE" AS "REVENUE",
  "REPAIRS_CELLS"."FEES" AS "FEES",
  COALESCE("REPAIRS_CELLS"."JOBS", 0) AS "JOBS",
  (coalesce("SALES_CELLS"."REVENUE", 0) + coalesce("REPAIRS_CELLS"."FEES", 0)) AS "TAKINGS",
  "CELLS"."GROUPING_ID"
FROM "CELLS"
  LEFT JOIN "SALES_CELLS" ON "SALES_CELLS"."GROUPING_ID" = "CELLS"."GROUPING_ID"
    AND "SALES_CELLS"."stores.region" IS NOT DISTINCT FROM "CELLS"."stores.region"
  LEFT JOIN "REPAIRS_CELLS" ON "REPAIRS_CELLS"."GROUPING_ID" = "CELLS"."GROUPING_ID"
    AND "REPAIRS_CELLS"."stores.region" IS NOT DISTINCT FROM "CELLS"."stores.region"
ORDER BY BITAND("CELLS"."GROUPING_ID", 1), "CELLS"."stores.region" ASC NULLS LAST;
