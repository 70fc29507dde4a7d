-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,patients_seen,patient_minutes,urgent_patients,north_patients' -b 'patients.ward,visits.seen_year' --totals rollup -d duckdb
WITH "visits_rows" AS MATERIALIZED (
  SELECT
    "patients"."ward" AS "patients.ward",
    (CAST(date_trunc('year', "visits"."seen_on") AS DATE)) AS "visits.seen_year",
    "visits"."patient" AS "visits.patient per",
    "visits"."minutes" AS "patients_seen_per_total_minutes_arg"
  FROM "lab"."visits" AS "visits"
  LEFT JOIN "lab"."patients" AS "patients" ON "visits"."patient" = "patients"."id"
),
"visits_cells" AS (
  SELECT
    "patients.ward",
    "visits.seen_year",
    GROUPING("patients.ward", "visits.seen_year") AS "grouping_id",
    count(*) AS "visits_n"
  FROM "visits_rows"
  GROUP BY GROUPING SETS (("patients.ward", "visits.seen_year"), ("patients.ward"), ())
),
"patients_seen_per_visits_cells" AS (
  SELECT
    "patients.ward",
    "visits.seen_year",
    "visits.patient per",
    GROUPING("patients.ward", "visits.seen_year", "visits.patient per") AS "grouping_id",
    sum("patients_seen_per_total_minutes_arg") AS "patients_seen_per_total_minutes"
  FROM "visits_rows"
  GROUP BY GROUPING SETS (("patients.ward", "visits.seen_year", "visits.patient per"), ("patients.ward", "visits.patient per"), ("visits.patient per"))
),
"patients_seen_per_groups" AS (
  SELECT
    "patients.ward",
    "visits.seen_year",
    "visits.patient per",
    "grouping_id",
    "patients_seen_per_total_minutes" AS "patient_minutes_value"
  FROM "patients_seen_per_visits_cells"
),
"patients_seen_per" AS (
  SELECT
    "patients.ward",
    "visits.seen_year",
    "grouping_id",
    count(*) FILTER (WHERE "visits.patient per" IS NOT NULL) AS "patients_seen",
    avg("patient_minutes_value") FILTER (WHERE "visits.patient per" IS NOT NULL) AS "patient_minutes"
  FROM "patients_seen_per_groups"
  GROUP BY "grouping_id", "patients.ward", "visits.seen_year"
),
"urgent_patients_per_visits_rows" AS (
  SELECT
    "patients"."ward" AS "patients.ward",
    (CAST(date_trunc('year', "visits"."seen_on") AS DATE)) AS "visits.seen_year",
    "visits"."patient" AS "visits.patient per"
  FROM "lab"."visits" AS "visits"
  LEFT JOIN "lab"."patients" AS "patients" ON "visits"."patient" = "patients"."id"
  WHERE "visits"."urgent"
),
"urgent_patients_per_visits_cells" AS (
  SELECT
    "patients.ward",
    "visits.seen_year",
    "visits.patient per",
    GROUPING("patients.ward", "visits.seen_year", "visits.patient per") AS "grouping_id"
  FROM "urgent_patients_per_visits_rows"
  GROUP BY GROUPING SETS (("patients.ward", "visits.seen_year", "visits.patient per"), ("patients.ward", "visits.patient per"), ("visits.patient per"))
),
"urgent_patients_per_groups" AS (
  SELECT
    "patients.ward",
    "visits.seen_year",
    "visits.patient per",
    "grouping_id"
  FROM "urgent_patients_per_visits_cells"
),
"urgent_patients_per" AS (
  SELECT
    "patients.ward",
    "visits.seen_year",
    "grouping_id",
    count(*) FILTER (WHERE "visits.patient per" IS NOT NULL) AS "urgent_patients"
  FROM "urgent_patients_per_groups"
  GROUP BY "grouping_id", "patients.ward", "visits.seen_year"
),
"north_patients_patients_seen_per_visits_rows" AS (
  SELECT
    (CAST(date_trunc('year', "visits"."seen_on") AS DATE)) AS "visits.seen_year",
    "visits"."patient" AS "visits.patient per"
  FROM "lab"."visits" AS "visits"
  JOIN "lab"."patients" AS "patients" ON "visits"."patient" = "patients"."id"
  WHERE ("patients"."ward" = 'North')
),
"north_patients_patients_seen_per_visits_cells" AS (
  SELECT
    "visits.seen_year",
    "visits.patient per",
    GROUPING("visits.seen_year", "visits.patient per") AS "grouping_id"
  FROM "north_patients_patients_seen_per_visits_rows"
  GROUP BY GROUPING SETS (("visits.seen_year", "visits.patient per"), ("visits.patient per"))
),
"north_patients_patients_seen_per_groups" AS (
  SELECT
    "visits.seen_year",
    "visits.patient per",
    "grouping_id"
  FROM "north_patients_patients_seen_per_visits_cells"
),
"north_patients_patients_seen_per" AS (
  SELECT
    "visits.seen_year",
    "grouping_id",
    count(*) FILTER (WHERE "visits.patient per" IS NOT NULL) AS "north_patients_patients_seen"
  FROM "north_patients_patients_seen_per_groups"
  GROUP BY "grouping_id", "visits.seen_year"
)
SELECT
  "visits_cells"."patients.ward",
  "visits_cells"."visits.seen_year",
  "visits_cells"."visits_n" AS "visits_n",
  COALESCE("patients_seen_per"."patients_seen", 0) AS "patients_seen",
  "patients_seen_per"."patient_minutes" AS "patient_minutes",
  COALESCE("urgent_patients_per"."urgent_patients", 0) AS "urgent_patients",
  COALESCE("north_patients_patients_seen_per"."north_patients_patients_seen", 0) AS "north_patients",
  "visits_cells"."grouping_id"
FROM "visits_cells"
  LEFT JOIN "patients_seen_per" ON "patients_seen_per"."grouping_id" = CASE "visits_cells"."grouping_id" WHEN 0 THEN 0 WHEN 1 THEN 2 WHEN 3 THEN 6 END
    AND "patients_seen_per"."patients.ward" IS NOT DISTINCT FROM "visits_cells"."patients.ward"
    AND "patients_seen_per"."visits.seen_year" IS NOT DISTINCT FROM "visits_cells"."visits.seen_year"
  LEFT JOIN "urgent_patients_per" ON "urgent_patients_per"."grouping_id" = CASE "visits_cells"."grouping_id" WHEN 0 THEN 0 WHEN 1 THEN 2 WHEN 3 THEN 6 END
    AND "urgent_patients_per"."patients.ward" IS NOT DISTINCT FROM "visits_cells"."patients.ward"
    AND "urgent_patients_per"."visits.seen_year" IS NOT DISTINCT FROM "visits_cells"."visits.seen_year"
  LEFT JOIN "north_patients_patients_seen_per" ON "north_patients_patients_seen_per"."grouping_id" = CASE "visits_cells"."grouping_id" WHEN 0 THEN 0 WHEN 1 THEN 2 WHEN 3 THEN 2 END
    AND "north_patients_patients_seen_per"."visits.seen_year" IS NOT DISTINCT FROM "visits_cells"."visits.seen_year"
ORDER BY ("visits_cells"."grouping_id" & 2), "visits_cells"."patients.ward" ASC NULLS LAST, ("visits_cells"."grouping_id" & 1), "visits_cells"."visits.seen_year" ASC NULLS LAST;
