-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,total_minutes' -b 'visits.seen_month,visits.seen_week' --totals rollup -d trino
WITH "visits_rows" AS (
  SELECT
    (date_trunc('month', "visits"."seen_on")) AS "visits.seen_month",
    (date_trunc('week', "visits"."seen_on")) AS "visits.seen_week",
    "visits"."minutes" AS "total_minutes_arg"
  FROM "lab"."visits" AS "visits"
),
"visits_cells" AS (
  SELECT
    "visits.seen_month",
    "visits.seen_week",
    grouping("visits.seen_month", "visits.seen_week") AS "grouping_id",
    count(*) AS "visits_n",
    sum("total_minutes_arg") AS "total_minutes"
  FROM "visits_rows"
  GROUP BY GROUPING SETS (("visits.seen_month", "visits.seen_week"), ("visits.seen_month"), ())
)
SELECT
  "visits.seen_month",
  "visits.seen_week",
  "visits_n",
  "total_minutes",
  "grouping_id"
FROM "visits_cells"
ORDER BY bitwise_and("grouping_id", 2), "visits.seen_month" ASC NULLS LAST, bitwise_and("grouping_id", 1), "visits.seen_week" ASC NULLS LAST;
