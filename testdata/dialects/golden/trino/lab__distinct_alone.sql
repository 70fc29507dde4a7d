-- rollwise sql testdata/dialects/lab.roll -m 'patients_seen,urgent_patients' -b patients.ward --totals grand -d trino
WITH "visits_rows" AS (
  SELECT
    "patients"."ward" AS "patients.ward",
    "visits"."patient" AS "patients_seen_arg",
    "visits"."urgent" AS "urgent_patients_if"
  FROM "lab"."visits" AS "visits"
  LEFT JOIN "lab"."patients" AS "patients" ON "visits"."patient" = "patients"."id"
),
"visits_cells" AS (
  SELECT
    "patients.ward",
    grouping("patients.ward") AS "grouping_id",
    count(DISTINCT "patients_seen_arg") AS "patients_seen",
    count(DISTINCT "patients_seen_arg") FILTER (WHERE "urgent_patients_if") AS "urgent_patients"
  FROM "visits_rows"
  GROUP BY GROUPING SETS (("patients.ward"), ())
)
SELECT
  "patients.ward",
  "patients_seen",
  "urgent_patients",
  "grouping_id"
FROM "visits_cells"
ORDER BY bitwise_and("grouping_id", 1), "patients.ward" ASC NULLS LAST;
