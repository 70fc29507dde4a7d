-- rollwise sql testdata/dialects/lab.roll -m 'top_longest,low_shortest' -b visits.id -d snowflake
WITH "VISITS_ROWS" AS (
  SELECT
    "VISITS"."ID" AS "visits.id",
    (GREATEST_IGNORE_NULLS("VISITS"."SCORE", CAST("VISITS"."MINUTES" AS FLOAT))) AS "TOP_LONGEST_ARG",
    (LEAST_IGNORE_NULLS("VISITS"."SCORE", CAST("VISITS"."MINUTES" AS FLOAT))) AS "LOW_SHORTEST_ARG"
  FROM "LAB"."VISITS" AS "VISITS"
),
"VISITS_CELLS" AS (
  SELECT
    "visits.id",
    0 AS "GROUPING_ID",
    max("TOP_LONGEST_ARG") AS "TOP_LONGEST",
    min("LOW_SHORTEST_ARG") AS "LOW_SHORTEST"
  FROM "VISITS_ROWS"
  GROUP BY "visits.id"
)
SELECT
  "visits.id",
  "TOP_LONGEST",
  "LOW_SHORTEST",
  "GROUPING_ID"
FROM "VISITS_CELLS"
ORDER BY "visits.id" ASC NULLS LAST;
