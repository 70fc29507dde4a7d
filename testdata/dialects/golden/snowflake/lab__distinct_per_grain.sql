-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,patients_seen,patient_minutes,urgent_patients,north_patients' -b 'patients.ward,visits.seen_year' --totals rollup -d snowflake
WITH "VISITS_ROWS" AS (
  SELECT
    "PATIENTS"."WARD" AS "patients.ward",
    (DATE_TRUNC('YEAR', "VISITS"."SEEN_ON")) AS "visits.seen_year",
    "VISITS"."PATIENT" AS "visits.patient per",
    "VISITS"."MINUTES" AS "PATIENTS_SEEN_PER_TOTAL_MINUTES_ARG"
  FROM "LAB"."VISITS" AS "VISITS"
  LEFT JOIN "LAB"."PATIENTS" AS "PATIENTS" ON "VISITS"."PATIENT" = "PATIENTS"."ID"
),
"VISITS_CELLS" AS (
  SELECT
    "patients.ward",
    "visits.seen_year",
    GROUPING("patients.ward", "visits.seen_year") AS "GROUPING_ID",
    count(*) AS "VISITS_N"
  FROM "VISITS_ROWS"
  GROUP BY GROUPING SETS (("patients.ward", "visits.seen_year"), ("patients.ward"), ())
),
"PATIENTS_SEEN_PER_VISITS_CELLS" AS (
  SELECT
    "patients.ward",
    "visits.seen_year",
    "visits.patient per",
    GROUPING("patients.ward", "visits.seen_year", "visits.patient per") AS "GROUPING_ID",
    sum("PATIENTS_SEEN_PER_TOTAL_MINUTES_ARG") AS "PATIENTS_SEEN_PER_TOTAL_MINUTES"
  FROM "VISITS_ROWS"
  GROUP BY GROUPING SETS (("patients.ward", "visits.seen_year", "visits.patient per"), ("patients.ward", "visits.patient per"), ("visits.patient per"))
),
"PATIENTS_SEEN_PER_GROUPS" AS (
  SELECT
    "patients.ward",
    "visits.seen_year",
    "visits.patient per",
    "GROUPING_ID",
    "PATIENTS_SEEN_PER_TOTAL_MINUTES" AS "PATIENT_MINUTES_VALUE"
  FROM "PATIENTS_SEEN_PER_VISITS_CELLS"
),
"PATIENTS_SEEN_PER" AS (
  SELECT
    "patients.ward",
    "visits.seen_year",
    "GROUPING_ID",
    count(CASE WHEN "visits.patient per" IS NOT NULL THEN 1 END) AS "PATIENTS_SEEN",
    avg(CAST(CASE WHEN "visits.patient per" IS NOT NULL THEN "PATIENT_MINUTES_VALUE" END AS FLOAT)) AS "PATIENT_MINUTES"
  FROM "PATIENTS_SEEN_PER_GROUPS"
  GROUP BY "GROUPING_ID", "patients.ward", "visits.seen_year"
),
"URGENT_PATIENTS_PER_VISITS_ROWS" AS (
  SELECT
    "PATIENTS"."WARD" AS "patients.ward",
    (DATE_TRUNC('YEAR', "VISITS"."SEEN_ON")) AS "visits.seen_year",
    "VISITS"."PATIENT" AS "visits.patient per"
  FROM "LAB"."VISITS" AS "VISITS"
  LEFT JOIN "LAB"."PATIENTS" AS "PATIENTS" ON "VISITS"."PATIENT" = "PATIENTS"."ID"
  WHERE "VISITS"."URGENT"
),
"URGENT_PATIENTS_PER_VISITS_CELLS" AS (
  SELECT
    "patients.ward",
    "visits.seen_year",
    "visits.patient per",
    GROUPING("patients.ward", "visits.seen_year", "visits.patient per") AS "GROUPING_ID"
  FROM "URGENT_PATIENTS_PER_VISITS_ROWS"
  GROUP BY GROUPING SETS (("patients.ward", "visits.seen_year", "visits.patient per"), ("patients.ward", "visits.patient per"), ("visits.patient per"))
),
"URGENT_PATIENTS_PER_GROUPS" AS (
  SELECT
    "patients.ward",
    "visits.seen_year",
    "visits.patient per",
    "GROUPING_ID"
  FROM "URGENT_PATIENTS_PER_VISITS_CELLS"
),
"URGENT_PATIENTS_PER" AS (
  SELECT
    "patients.ward",
    "visits.seen_year",
    "GROUPING_ID",
    count(CASE WHEN "visits.patient per" IS NOT NULL THEN 1 END) AS "URGENT_PATIENTS"
  FROM "URGENT_PATIENTS_PER_GROUPS"
  GROUP BY "GROUPING_ID", "patients.ward", "visits.seen_year"
),
"NORTH_PATIENTS_PATIENTS_SEEN_PER_VISITS_ROWS" AS (
  SELECT
    (DATE_TRUNC('YEAR', "VISITS"."SEEN_ON")) AS "visits.seen_year",
    "VISITS"."PATIENT" AS "visits.patient per"
  FROM "LAB"."VISITS" AS "VISITS"
  JOIN "LAB"."PATIENTS" AS "PATIENTS" ON "VISITS"."PATIENT" = "PATIENTS"."ID"
  WHERE ("PATIENTS"."WARD" = 'North')
),
"NORTH_PATIENTS_PATIENTS_SEEN_PER_VISITS_CELLS" AS (
  SELECT
    "visits.seen_year",
    "visits.patient per",
    GROUPING("visits.seen_year", "visits.patient per") AS "GROUPING_ID"
  FROM "NORTH_PATIENTS_PATIENTS_SEEN_PER_VISITS_ROWS"
  GROUP BY GROUPING SETS (("visits.seen_year", "visits.patient per"), ("visits.patient per"))
),
"NORTH_PATIENTS_PATIENTS_SEEN_PER_GROUPS" AS (
  SELECT
    "visits.seen_year",
    "visits.patient per",
    "GROUPING_ID"
  FROM "NORTH_PATIENTS_PATIENTS_SEEN_PER_VISITS_CELLS"
),
"NORTH_PATIENTS_PATIENTS_SEEN_PER" AS (
  SELECT
    "visits.seen_year",
    "GROUPING_ID",
    count(CASE WHEN "visits.patient per" IS NOT NULL THEN 1 END) AS "NORTH_PATIENTS_PATIENTS_SEEN"
  FROM "NORTH_PATIENTS_PATIENTS_SEEN_PER_GROUPS"
  GROUP BY "GROUPING_ID", "visits.seen_year"
)
SELECT
  "VISITS_CELLS"."patients.ward",
  "VISITS_CELLS"."visits.seen_year",
  "VISITS_CELLS"."VISITS_N" AS "VISITS_N",
  COALESCE("PATIENTS_SEEN_PER"."PATIENTS_SEEN", 0) AS "PATIENTS_SEEN",
  "PATIENTS_SEEN_PER"."PATIENT_MINUTES" AS "PATIENT_MINUTES",
  COALESCE("URGENT_PATIENTS_PER"."URGENT_PATIENTS", 0) AS "URGENT_PATIENTS",
  COALESCE("NORTH_PATIENTS_PATIENTS_SEEN_PER"."NORTH_PATIENTS_PATIENTS_SEEN", 0) AS "NORTH_PATIENTS",
  "VISITS_CELLS"."GROUPING_ID"
FROM "VISITS_CELLS"
  LEFT JOIN "PATIENTS_SEEN_PER" ON "PATIENTS_SEEN_PER"."GROUPING_ID" = CASE "VISITS_CELLS"."GROUPING_ID" WHEN 0 THEN 0 WHEN 1 THEN 2 WHEN 3 THEN 6 END
    AND "PATIENTS_SEEN_PER"."patients.ward" IS NOT DISTINCT FROM "VISITS_CELLS"."patients.ward"
    AND "PATIENTS_SEEN_PER"."visits.seen_year" IS NOT DISTINCT FROM "VISITS_CELLS"."visits.seen_year"
  LEFT JOIN "URGENT_PATIENTS_PER" ON "URGENT_PATIENTS_PER"."GROUPING_ID" = CASE "VISITS_CELLS"."GROUPING_ID" WHEN 0 THEN 0 WHEN 1 THEN 2 WHEN 3 THEN 6 END
    AND "URGENT_PATIENTS_PER"."patients.ward" IS NOT DISTINCT FROM "VISITS_CELLS"."patients.ward"
    AND "URGENT_PATIENTS_PER"."visits.seen_year" IS NOT DISTINCT FROM "VISITS_CELLS"."visits.seen_year"
  LEFT JOIN "NORTH_PATIENTS_PATIENTS_SEEN_PER" ON "NORTH_PATIENTS_PATIENTS_SEEN_PER"."GROUPING_ID" = CASE "VISITS_CELLS"."GROUPING_ID" WHEN 0 THEN 0 WHEN 1 THEN 2 WHEN 3 THEN 2 END
    AND "NORTH_PATIENTS_PATIENTS_SEEN_PER"."visits.seen_year" IS NOT DISTINCT FROM "VISITS_CELLS"."visits.seen_year"
ORDER BY BITAND("VISITS_CELLS"."GROUPING_ID", 2), "VISITS_CELLS"."patients.ward" ASC NULLS LAST, BITAND("VISITS_CELLS"."GROUPING_ID", 1), "VISITS_CELLS"."visits.seen_year" ASC NULLS LAST;
