-- rollwise sql testdata/exec/time.roll -m 'revenue,rev_ly,rev_lm,cal_ly' -b days.mon -w 'days.yr = 2026' --totals grand -d trino
WITH "orders_rows" AS (
  SELECT
    "days"."mon" AS "days.mon",
    "orders"."amount" AS "revenue_arg"
  FROM "timed"."orders" AS "orders"
  JOIN "timed"."days" AS "days" ON "orders"."day" = "days"."day"
  WHERE ("days"."yr" = 2026)
),
"orders_cells" AS (
  SELECT
    "days.mon",
    grouping("days.mon") AS "grouping_id",
    sum("revenue_arg") AS "revenue"
  FROM "orders_rows"
  GROUP BY GROUPING SETS (("days.mon"), ())
),
"rev_ly_orders_rows" AS (
  SELECT
    "days moved 1 year"."mon" AS "days.mon",
    "orders"."amount" AS "rev_ly_revenue_arg"
  FROM "timed"."orders" AS "orders"
  JOIN "timed"."days" AS "days moved 1 year" ON date_add('month', 12, "orders"."day") = "days moved 1 year"."day"
  WHERE ("days moved 1 year"."yr" = 2026)
),
"rev_ly_orders_cells" AS (
  SELECT
    "days.mon",
    grouping("days.mon") AS "grouping_id",
    sum("rev_ly_revenue_arg") AS "rev_ly_revenue"
  FROM "rev_ly_orders_rows"
  GROUP BY GROUPING SETS (("days.mon"), ())
),
"rev_lm_orders_rows" AS (
  SELECT
    "days moved 1 month"."mon" AS "days.mon",
    "orders"."amount" AS "rev_lm_revenue_arg"
  FROM "timed"."orders" AS "orders"
  JOIN "timed"."days" AS "days moved 1 month" ON date_add('month', 1, "orders"."day") = "days moved 1 month"."day"
  WHERE ("days moved 1 month"."yr" = 2026)
),
"rev_lm_orders_cells" AS (
  SELECT
    "days.mon",
    grouping("days.mon") AS "grouping_id",
    sum("rev_lm_revenue_arg") AS "rev_lm_revenue"
  FROM "rev_lm_orders_rows"
  GROUP BY GROUPING SETS (("days.mon"), ())
),
"cal_ly_orders_rows" AS (
  SELECT
    "days moved 1 year for days"."mon" AS "days.mon",
    "orders"."amount" AS "cal_ly_revenue_arg"
  FROM "timed"."orders" AS "orders"
  JOIN "timed"."days" AS "days" ON "orders"."day" = "days"."day"
  JOIN "timed"."days" AS "days moved 1 year for days" ON date_add('month', 12, "days"."day") = "days moved 1 year for days"."day"
  WHERE ("days moved 1 year for days"."yr" = 2026)
),
"cal_ly_orders_cells" AS (
  SELECT
    "days.mon",
    grouping("days.mon") AS "grouping_id",
    sum("cal_ly_revenue_arg") AS "cal_ly_revenue"
  FROM "cal_ly_orders_rows"
  GROUP BY GROUPING SETS (("days.mon"), ())
)
SELECT
  "orders_cells"."days.mon",
  "orders_cells"."revenue" AS "revenue",
  "rev_ly_orders_cells"."rev_ly_revenue" AS "rev_ly",
  "rev_lm_orders_cells"."rev_lm_revenue" AS "rev_lm",
  "cal_ly_orders_cells"."cal_ly_revenue" AS "cal_ly",
  "orders_cells"."grouping_id"
FROM "orders_cells"
  LEFT JOIN "rev_ly_orders_cells" ON "rev_ly_orders_cells"."grouping_id" = "orders_cells"."grouping_id"
    AND "rev_ly_orders_cells"."days.mon" IS NOT DISTINCT FROM "orders_cells"."days.mon"
  LEFT JOIN "rev_lm_orders_cells" ON "rev_lm_orders_cells"."grouping_id" = "orders_cells"."grouping_id"
    AND "rev_lm_orders_cells"."days.mon" IS NOT DISTINCT FROM "orders_cells"."days.mon"
  LEFT JOIN "cal_ly_orders_cells" ON "cal_ly_orders_cells"."grouping_id" = "orders_cells"."grouping_id"
    AND "cal_ly_orders_cells"."days.mon" IS NOT DISTINCT FROM "orders_cells"."days.mon"
ORDER BY bitwise_and("orders_cells"."grouping_id", 1), "orders_cells"."days.mon" ASC NULLS LAST;
