-- rollwise sql testdata/dialects/lab.roll -m 'patients_seen,urgent_patients' -b patients.ward --totals grand -d snowflake
WITH "VISITS_ROWS" AS (
  SELECT
    "PATIENTS"."WARD" AS "patients.ward",
    "VISITS"."PATIENT" AS "PATIENTS_SEEN_ARG",
    "VISITS"."URGENT" AS "URGENT_PATIENTS_IF"
  FROM "LAB"."VISITS" AS "VISITS"
  LEFT JOIN "LAB"."PATIENTS" AS "PATIENTS" ON "VISITS"."PATIENT" = "PATIENTS"."ID"
),
"VISITS_CELLS" AS (
  SELECT
    "patients.ward",
    GROUPING("patients.ward") AS "GROUPING_ID",
    count(DISTINCT "PATIENTS_SEEN_ARG") AS "PATIENTS_SEEN",
    count(DISTINCT CASE WHEN "URGENT_PATIENTS_IF" THEN "PATIENTS_SEEN_ARG" END) AS "URGENT_PATIENTS"
  FROM "VISITS_ROWS"
  GROUP BY GROUPING SETS (("patients.ward"), ())
)
SELECT
  "patients.ward",
  "PATIENTS_SEEN",
  "URGENT_PATIENTS",
  "GROUPING_ID"
FROM "VISITS_CELLS"
ORDER BY BITAND("GROUPING_ID", 1), "patients.ward" ASC NULLS LAST;
