-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,last_at' -b visits.seen_day -w 'visits.seen_at >= timestamp '\''2024-01-01 00:00:00'\''' -d snowflake
WITH "VISITS_ROWS" AS (
  SELECT
    (DATE_TRUNC('DAY', "VISITS"."SEEN_AT")) AS "visits.seen_day",
    "VISITS"."SEEN_AT" AS "LAST_AT_ARG"
  FROM "LAB"."VISITS" AS "VISITS"
  WHERE ("VISITS"."SEEN_AT" >= CAST('2024-01-01 00:00:00' AS TIMESTAMP_NTZ))
),
"VISITS_CELLS" AS (
  SELECT
    "visits.seen_day",
    0 AS "GROUPING_ID",
    count(*) AS "VISITS_N",
    max("LAST_AT_ARG") AS "LAST_AT"
  FROM "VISITS_ROWS"
  GROUP BY "visits.seen_day"
)
SELECT
  "visits.seen_day",
  "VISITS_N",
  "LAST_AT",
  "GROUPING_ID"
FROM "VISITS_CELLS"
ORDER BY "visits.seen_day" ASC NULLS LAST;
