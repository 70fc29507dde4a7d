-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,total_minutes' -b 'visits.seen_month,visits.seen_week' --totals rollup -d snowflake
WITH "VISITS_ROWS" AS (
  SELECT
    (DATE_TRUNC('MONTH', "VISITS"."SEEN_ON")) AS "visits.seen_month",
    (DATE_TRUNC('WEEK', "VISITS"."SEEN_ON")) AS "visits.seen_week",
    "VISITS"."MINUTES" AS "TOTAL_MINUTES_ARG"
  FROM "LAB"."VISITS" AS "VISITS"
),
"VISITS_CELLS" AS (
  SELECT
    "visits.seen_month",
    "visits.seen_week",
    GROUPING("visits.seen_month", "visits.seen_week") AS "GROUPING_ID",
    count(*) AS "VISITS_N",
    sum("TOTAL_MINUTES_ARG") AS "TOTAL_MINUTES"
  FROM "VISITS_ROWS"
  GROUP BY GROUPING SETS (("visits.seen_month", "visits.seen_week"), ("visits.seen_month"), ())
)
SELECT
  "visits.seen_month",
  "visits.seen_week",
  "VISITS_N",
  "TOTAL_MINUTES",
  "GROUPING_ID"
FROM "VISITS_CELLS"
ORDER BY BITAND("GROUPING_ID", 2), "visits.seen_month" ASC NULLS LAST, BITAND("GROUPING_ID", 1), "visits.seen_week" ASC NULLS LAST;
