-- rollwise sql testdata/dialects/lab.roll -m 'mid_minutes,urgent_mid,patient_mid' -b patients.ward --totals rollup -d duckdb
WITH "visits_rows" AS MATERIALIZED (
  SELECT
    "patients"."ward" AS "patients.ward",
    "visits"."minutes" AS "mid_minutes_arg",
    "visits"."urgent" AS "urgent_mid_if",
    "visits"."patient" AS "visits.patient per"
  FROM "lab"."visits" AS "visits"
  LEFT JOIN "lab"."patients" AS "patients" ON "visits"."patient" = "patients"."id"
),
"visits_cells" AS (
  SELECT
    "patients.ward",
    GROUPING("patients.ward") AS "grouping_id",
    median(CAST("mid_minutes_arg" AS DOUBLE)) AS "mid_minutes",
    median(CAST("mid_minutes_arg" AS DOUBLE)) FILTER (WHERE "urgent_mid_if") AS "urgent_mid"
  FROM "visits_rows"
  GROUP BY GROUPING SETS (("patients.ward"), ())
),
"patient_mid_per_visits_cells" AS (
  SELECT
    "patients.ward",
    "visits.patient per",
    GROUPING("patients.ward", "visits.patient per") AS "grouping_id",
    sum("mid_minutes_arg") AS "patient_mid_per_total_minutes"
  FROM "visits_rows"
  GROUP BY GROUPING SETS (("patients.ward", "visits.patient per"), ("visits.patient per"))
),
"patient_mid_per_groups" AS (
  SELECT
    "patients.ward",
    "visits.patient per",
    "grouping_id",
    "patient_mid_per_total_minutes" AS "patient_mid_value"
  FROM "patient_mid_per_visits_cells"
),
"patient_mid_per" AS (
  SELECT
    "patients.ward",
    "grouping_id",
    median(CAST("patient_mid_value" AS DOUBLE)) FILTER (WHERE "visits.patient per" IS NOT NULL) AS "patient_mid"
  FROM "patient_mid_per_groups"
  GROUP BY "grouping_id", "patients.ward"
)
SELECT
  "visits_cells"."patients.ward",
  "visits_cells"."mid_minutes" AS "mid_minutes",
  "visits_cells"."urgent_mid" AS "urgent_mid",
  "patient_mid_per"."patient_mid" AS "patient_mid",
  "visits_cells"."grouping_id"
FROM "visits_cells"
  LEFT JOIN "patient_mid_per" ON "patient_mid_per"."grouping_id" = CASE "visits_cells"."grouping_id" WHEN 0 THEN 0 WHEN 1 THEN 2 END
    AND "patient_mid_per"."patients.ward" IS NOT DISTINCT FROM "visits_cells"."patients.ward"
ORDER BY ("visits_cells"."grouping_id" & 1), "visits_cells"."patients.ward" ASC NULLS LAST;
