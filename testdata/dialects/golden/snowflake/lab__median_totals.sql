-- rollwise sql testdata/dialects/lab.roll -m 'mid_minutes,urgent_mid,patient_mid' -b patients.ward --totals rollup -d snowflake
WITH "VISITS_ROWS" AS (
  SELECT
    "PATIENTS"."WARD" AS "patients.ward",
    "VISITS"."MINUTES" AS "MID_MINUTES_ARG",
    "VISITS"."URGENT" AS "URGENT_MID_IF",
    "VISITS"."PATIENT" AS "visits.patient per"
  FROM "LAB"."VISITS" AS "VISITS"
  LEFT JOIN "LAB"."PATIENTS" AS "PATIENTS" ON "VISITS"."PATIENT" = "PATIENTS"."ID"
),
"VISITS_CELLS" AS (
  SELECT
    "patients.ward",
    GROUPING("patients.ward") AS "GROUPING_ID",
    median("MID_MINUTES_ARG") AS "MID_MINUTES",
    median(CASE WHEN "URGENT_MID_IF" THEN "MID_MINUTES_ARG" END) AS "URGENT_MID"
  FROM "VISITS_ROWS"
  GROUP BY GROUPING SETS (("patients.ward"), ())
),
"PATIENT_MID_PER_VISITS_CELLS" AS (
  SELECT
    "patients.ward",
    "visits.patient per",
    GROUPING("patients.ward", "visits.patient per") AS "GROUPING_ID",
    sum("MID_MINUTES_ARG") AS "PATIENT_MID_PER_TOTAL_MINUTES"
  FROM "VISITS_ROWS"
  GROUP BY GROUPING SETS (("patients.ward", "visits.patient per"), ("visits.patient per"))
),
"PATIENT_MID_PER_GROUPS" AS (
  SELECT
    "patients.ward",
    "visits.patient per",
    "GROUPING_ID",
    "PATIENT_MID_PER_TOTAL_MINUTES" AS "PATIENT_MID_VALUE"
  FROM "PATIENT_MID_PER_VISITS_CELLS"
),
"PATIENT_MID_PER" AS (
  SELECT
    "patients.ward",
    "GROUPING_ID",
    median(CASE WHEN "visits.patient per" IS NOT NULL THEN "PATIENT_MID_VALUE" END) AS "PATIENT_MID"
  FROM "PATIENT_MID_PER_GROUPS"
  GROUP BY "GROUPING_ID", "patients.ward"
)
SELECT
  "VISITS_CELLS"."patients.ward",
  "VISITS_CELLS"."MID_MINUTES" AS "MID_MINUTES",
  "VISITS_CELLS"."URGENT_MID" AS "URGENT_MID",
  "PATIENT_MID_PER"."PATIENT_MID" AS "PATIENT_MID",
  "VISITS_CELLS"."GROUPING_ID"
FROM "VISITS_CELLS"
  LEFT JOIN "PATIENT_MID_PER" ON "PATIENT_MID_PER"."GROUPING_ID" = CASE "VISITS_CELLS"."GROUPING_ID" WHEN 0 THEN 0 WHEN 1 THEN 2 END
    AND "PATIENT_MID_PER"."patients.ward" IS NOT DISTINCT FROM "VISITS_CELLS"."patients.ward"
ORDER BY BITAND("VISITS_CELLS"."GROUPING_ID", 1), "VISITS_CELLS"."patients.ward" ASC NULLS LAST;
