-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,first_seen,last_at' -b 'visits.seen_year,visits.seen_qtr' -d snowflake
WITH "VISITS_ROWS" AS (
  SELECT
    (DATE_TRUNC('YEAR', "VISITS"."SEEN_ON")) AS "visits.seen_year",
    (DATE_TRUNC('QUARTER', "VISITS"."SEEN_ON")) AS "visits.seen_qtr",
    "VISITS"."SEEN_ON" AS "FIRST_SEEN_ARG",
    "VISITS"."SEEN_AT" AS "LAST_AT_ARG"
  FROM "LAB"."VISITS" AS "VISITS"
),
"VISITS_CELLS" AS (
  SELECT
    "visits.seen_year",
    "visits.seen_qtr",
    0 AS "GROUPING_ID",
    count(*) AS "VISITS_N",
    min("FIRST_SEEN_ARG") AS "FIRST_SEEN",
    max("LAST_AT_ARG") AS "LAST_AT"
  FROM "VISITS_ROWS"
  GROUP BY "visits.seen_year", "visits.seen_qtr"
)
SELECT
  "visits.seen_year",
  "visits.seen_qtr",
  "VISITS_N",
  "FIRST_SEEN",
  "LAST_AT",
  "GROUPING_ID"
FROM "VISITS_CELLS"
ORDER BY "visits.seen_year" ASC NULLS LAST, "visits.seen_qtr" ASC NULLS LAST;
