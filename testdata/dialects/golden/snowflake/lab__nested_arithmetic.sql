-- rollwise sql testdata/dialects/lab.roll -m 'nested_arith,visits_n,total_minutes' -b patients.ward --totals grand -d snowflake
WITH "VISITS_ROWS" AS (
  SELECT
    "PATIENTS"."WARD" AS "patients.ward",
    "VISITS"."MINUTES" AS "TOTAL_MINUTES_ARG"
  FROM "LAB"."VISITS" AS "VISITS"
  LEFT JOIN "LAB"."PATIENTS" AS "PATIENTS" ON "VISITS"."PATIENT" = "PATIENTS"."ID"
),
"VISITS_CELLS" AS (
  SELECT
    "patients.ward",
    GROUPING("patients.ward") AS "GROUPING_ID",
    count(*) AS "VISITS_N",
    sum("TOTAL_MINUTES_ARG") AS "TOTAL_MINUTES"
  FROM "VISITS_ROWS"
  GROUP BY GROUPING SETS (("patients.ward"), ())
)
SELECT
  "patients.ward",
  ("VISITS_N" - ("TOTAL_MINUTES" - "VISITS_N") - "VISITS_N" * ("VISITS_N" - 2) + CAST(coalesce("TOTAL_MINUTES" - 100, 0) AS FLOAT) / NULLIF(("VISITS_N" - 6), 0)) AS "NESTED_ARITH",
  "VISITS_N",
  "TOTAL_MINUTES",
  "GROUPING_ID"
FROM "VISITS_CELLS"
ORDER BY BITAND("GROUPING_ID", 1), "patients.ward" ASC NULLS LAST;
