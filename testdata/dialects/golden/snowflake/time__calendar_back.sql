-- rollwise sql testdata/exec/time.roll -m 'revenue,rev_ly,rev_lm,cal_ly' -b days.mon -w 'days.yr = 2026' --totals grand -d snowflake
WITH "ORDERS_ROWS" AS (
  SELECT
    "DAYS"."MON" AS "days.mon",
    "ORDERS"."AMOUNT" AS "REVENUE_ARG"
  FROM "TIMED"."ORDERS" AS "ORDERS"
  JOIN "TIMED"."DAYS" AS "DAYS" ON "ORDERS"."DAY" = "DAYS"."DAY"
  WHERE ("DAYS"."YR" = 2026)
),
"ORDERS_CELLS" AS (
  SELECT
    "days.mon",
    GROUPING("days.mon") AS "GROUPING_ID",
    sum("REVENUE_ARG") AS "REVENUE"
  FROM "ORDERS_ROWS"
  GROUP BY GROUPING SETS (("days.mon"), ())
),
"REV_LY_ORDERS_ROWS" AS (
  SELECT
    "days moved 1 year"."MON" AS "days.mon",
    "ORDERS"."AMOUNT" AS "REV_LY_REVENUE_ARG"
  FROM "TIMED"."ORDERS" AS "ORDERS"
  JOIN "TIMED"."DAYS" AS "days moved 1 year" ON DATEADD(month, 12, "ORDERS"."DAY") = "days moved 1 year"."DAY"
  WHERE ("days moved 1 year"."YR" = 2026)
),
"REV_LY_ORDERS_CELLS" AS (
  SELECT
    "days.mon",
    GROUPING("days.mon") AS "GROUPING_ID",
    sum("REV_LY_REVENUE_ARG") AS "REV_LY_REVENUE"
  FROM "REV_LY_ORDERS_ROWS"
  GROUP BY GROUPING SETS (("days.mon"), ())
),
"REV_LM_ORDERS_ROWS" AS (
  SELECT
    "days moved 1 month"."MON" AS "days.mon",
    "ORDERS"."AMOUNT" AS "REV_LM_REVENUE_ARG"
  FROM "TIMED"."ORDERS" AS "ORDERS"
  JOIN "TIMED"."DAYS" AS "days moved 1 month" ON DATEADD(month, 1, "ORDERS"."DAY") = "days moved 1 month"."DAY"
  WHERE ("days moved 1 month"."YR" = 2026)
),
"REV_LM_ORDERS_CELLS" AS (
  SELECT
    "days.mon",
    GROUPING("days.mon") AS "GROUPING_ID",
    sum("REV_LM_REVENUE_ARG") AS "REV_LM_REVENUE"
  FROM "REV_LM_ORDERS_ROWS"
  GROUP BY GROUPING SETS (("days.mon"), ())
),
"CAL_LY_ORDERS_ROWS" AS (
  SELECT
    "days moved 1 year for days"."MON" AS "days.mon",
    "ORDERS"."AMOUNT" AS "CAL_LY_REVENUE_ARG"
  FROM "TIMED"."ORDERS" AS "ORDERS"
  JOIN "TIMED"."DAYS" AS "DAYS" ON "ORDERS"."DAY" = "DAYS"."DAY"
  JOIN "TIMED"."DAYS" AS "days moved 1 year for days" ON DATEADD(month, 12, "DAYS"."DAY") = "days moved 1 year for days"."DAY"
  WHERE ("days moved 1 year for days"."YR" = 2026)
),
"CAL_LY_ORDERS_CELLS" AS (
  SELECT
    "days.mon",
    GROUPING("days.mon") AS "GROUPING_ID",
    sum("CAL_LY_REVENUE_ARG") AS "CAL_LY_REVENUE"
  FROM "CAL_LY_ORDERS_ROWS"
  GROUP BY GROUPING SETS (("days.mon"), ())
)
SELECT
  "ORDERS_CELLS"."days.mon",
  "ORDERS_CELLS"."REVENUE" AS "REVENUE",
  "REV_LY_ORDERS_CELLS"."REV_LY_REVENUE" AS "REV_LY",
  "REV_LM_ORDERS_CELLS"."REV_LM_REVENUE" AS "REV_LM",
  "CAL_LY_ORDERS_CELLS"."CAL_LY_REVENUE" AS "CAL_LY",
  "ORDERS_CELLS"."GROUPING_ID"
FROM "ORDERS_CELLS"
  LEFT JOIN "REV_LY_ORDERS_CELLS" ON "REV_LY_ORDERS_CELLS"."GROUPING_ID" = "ORDERS_CELLS"."GROUPING_ID"
    AND "REV_LY_ORDERS_CELLS"."days.mon" IS NOT DISTINCT FROM "ORDERS_CELLS"."days.mon"
  LEFT JOIN "REV_LM_ORDERS_CELLS" ON "REV_LM_ORDERS_CELLS"."GROUPING_ID" = "ORDERS_CELLS"."GROUPING_ID"
    AND "REV_LM_ORDERS_CELLS"."days.mon" IS NOT DISTINCT FROM "ORDERS_CELLS"."days.mon"
  LEFT JOIN "CAL_LY_ORDERS_CELLS" ON "CAL_LY_ORDERS_CELLS"."GROUPING_ID" = "ORDERS_CELLS"."GROUPING_ID"
    AND "CAL_LY_ORDERS_CELLS"."days.mon" IS NOT DISTINCT FROM "ORDERS_CELLS"."days.mon"
ORDER BY BITAND("ORDERS_CELLS"."GROUPING_ID", 1), "ORDERS_CELLS"."days.mon" ASC NULLS LAST;
