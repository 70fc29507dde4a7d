-- rollwise sql testdata/dialects/lab.roll -m visits_n -b visits.label -d snowflake
WITH "VISITS_ROWS" AS (
  SELECT
    (((upper("VISITS"."NOTE") || '/') || CAST("VISITS"."MINUTES" AS VARCHAR))) AS "visits.label"
  FROM "LAB"."VISITS" AS "VISITS"
),
"VISITS_CELLS" AS (
  SELECT
    "visits.label",
    0 AS "GROUPING_ID",
    count(*) AS "VISITS_N"
  FROM "VISITS_ROWS"
  GROUP BY "visits.label"
)
SELECT
  "visits.label",
  "VISITS_N",
  "GROUPING_ID"
FROM "VISITS_CELLS"
ORDER BY "visits.label" ASC NULLS LAST;
