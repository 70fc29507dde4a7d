-- rollwise sql testdata/dialects/lab.roll -m 'mid_minutes,visits_n' -b patients.ward -d snowflake
WITH "VISITS_ROWS" AS (
  SELECT
    "PATIENTS"."WARD" AS "patients.ward",
    "VISITS"."MINUTES" AS "MID_MINUTES_ARG"
  FROM "LAB"."VISITS" AS "VISITS"
  LEFT JOIN "LAB"."PATIENTS" AS "PATIENTS" ON "VISITS"."PATIENT" = "PATIENTS"."ID"
),
"VISITS_CELLS" AS (
  SELECT
    "patients.ward",
    0 AS "GROUPING_ID",
    median("MID_MINUTES_ARG") AS "MID_MINUTES",
    count(*) AS "VISITS_N"
  FROM "VISITS_ROWS"
  GROUP BY "patients.ward"
)
SELECT
  "patients.ward",
  "MID_MINUTES",
  "VISITS_N",
  "GROUPING_ID"
FROM "VISITS_CELLS"
ORDER BY "patients.ward" ASC NULLS LAST;
