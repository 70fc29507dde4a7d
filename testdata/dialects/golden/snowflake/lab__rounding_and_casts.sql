-- rollwise sql testdata/dialects/lab.roll -m 'rounded_sum,rounded2_sum,fee_ints' -b visits.id -d snowflake
WITH "VISITS_ROWS" AS (
  SELECT
    "VISITS"."ID" AS "visits.id",
    (round("VISITS"."SCORE")) AS "ROUNDED_SUM_ARG",
    (round("VISITS"."SCORE", 2)) AS "ROUNDED2_SUM_ARG",
    (CAST("VISITS"."FEE" AS NUMBER(38, 0))) AS "FEE_INTS_ARG"
  FROM "LAB"."VISITS" AS "VISITS"
),
"VISITS_CELLS" AS (
  SELECT
    "visits.id",
    0 AS "GROUPING_ID",
    sum("ROUNDED_SUM_ARG") AS "ROUNDED_SUM",
    sum("ROUNDED2_SUM_ARG") AS "ROUNDED2_SUM",
    sum("FEE_INTS_ARG") AS "FEE_INTS"
  FROM "VISITS_ROWS"
  GROUP BY "visits.id"
)
SELECT
  "visits.id",
  "ROUNDED_SUM",
  "ROUNDED2_SUM",
  "FEE_INTS",
  "GROUPING_ID"
FROM "VISITS_CELLS"
ORDER BY "visits.id" ASC NULLS LAST;
