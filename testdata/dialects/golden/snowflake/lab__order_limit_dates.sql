-- rollwise sql testdata/dialects/lab.roll -m total_minutes -b visits.seen_month --order 'total_minutes desc' --limit 3 --totals grand -d snowflake
WITH "VISITS_ROWS" AS (
  SELECT
    (DATE_TRUNC('MONTH', "VISITS"."SEEN_ON")) AS "visits.seen_month",
    "VISITS"."MINUTES" AS "TOTAL_MINUTES_ARG"
  FROM "LAB"."VISITS" AS "VISITS"
),
"VISITS_CELLS" AS (
  SELECT
    "visits.seen_month",
    GROUPING("visits.seen_month") AS "GROUPING_ID",
    sum("TOTAL_MINUTES_ARG") AS "TOTAL_MINUTES"
  FROM "VISITS_ROWS"
  GROUP BY GROUPING SETS (("visits.seen_month"), ())
),
"RESULT" AS (
  SELECT
    "visits.seen_month",
    "TOTAL_MINUTES",
    "GROUPING_ID"
  FROM "VISITS_CELLS"
),
"RESULT_RANKED" AS (
  SELECT
    "visits.seen_month",
    "TOTAL_MINUTES",
    "GROUPING_ID",
    count(*) OVER (PARTITION BY "GROUPING_ID" ORDER BY CASE WHEN "GROUPING_ID" = 0 THEN 0 ELSE 1 END, "TOTAL_MINUTES" DESC NULLS LAST, BITAND("GROUPING_ID", 1), "visits.seen_month" ASC NULLS LAST ROWS BETWEEN UNBOUNDED PRECEDING AND CURRENT ROW) AS "DETAIL_RANK"
  FROM "RESULT"
)
SELECT
  "visits.seen_month",
  "TOTAL_MINUTES",
  "GROUPING_ID"
FROM "RESULT_RANKED"
WHERE ("GROUPING_ID" = 0 AND "DETAIL_RANK" <= 3)
  OR "GROUPING_ID" = 1
ORDER BY CASE WHEN "GROUPING_ID" = 0 THEN 0 ELSE 1 END, "TOTAL_MINUTES" DESC NULLS LAST, BITAND("GROUPING_ID", 1), "visits.seen_month" ASC NULLS LAST;
