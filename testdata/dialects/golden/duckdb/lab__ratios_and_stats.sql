-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,total_minutes,avg_minutes,per_visit,urgent_share,fees,fee_per_min,sd_score,var_score,notes' -b patients.ward --totals grand -d duckdb
WITH "visits_rows" AS MATERIALIZED (
  SELECT
    "patients"."ward" AS "patients.ward",
    "visits"."minutes" AS "total_minutes_arg",
    "visits"."urgent" AS "urgent_n_if",
    "visits"."fee" AS "fees_arg",
    "visits"."score" AS "sd_score_arg",
    "visits"."note" AS "visits.note per"
  FROM "lab"."visits" AS "visits"
  LEFT JOIN "lab"."patients" AS "patients" ON "visits"."patient" = "patients"."id"
),
"visits_cells" AS (
  SELECT
    "patients.ward",
    GROUPING("patients.ward") AS "grouping_id",
    count(*) AS "visits_n",
    sum("total_minutes_arg") AS "total_minutes",
    avg("total_minutes_arg") AS "avg_minutes",
    count(*) FILTER (WHERE "urgent_n_if") AS "urgent_n",
    sum("fees_arg") AS "fees",
    stddev_samp("sd_score_arg") AS "sd_score",
    var_samp("sd_score_arg") AS "var_score"
  FROM "visits_rows"
  GROUP BY GROUPING SETS (("patients.ward"), ())
),
"notes_per_visits_cells" AS (
  SELECT
    "patients.ward",
    "visits.note per",
    GROUPING("patients.ward", "visits.note per") AS "grouping_id"
  FROM "visits_rows"
  GROUP BY GROUPING SETS (("patients.ward", "visits.note per"), ("visits.note per"))
),
"notes_per_groups" AS (
  SELECT
    "patients.ward",
    "visits.note per",
    "grouping_id"
  FROM "notes_per_visits_cells"
),
"notes_per" AS (
  SELECT
    "patients.ward",
    "grouping_id",
    count(*) FILTER (WHERE "visits.note per" IS NOT NULL) AS "notes"
  FROM "notes_per_groups"
  GROUP BY "grouping_id", "patients.ward"
)
SELECT
  "visits_cells"."patients.ward",
  "visits_cells"."visits_n" AS "visits_n",
  "visits_cells"."total_minutes" AS "total_minutes",
  "visits_cells"."avg_minutes" AS "avg_minutes",
  ("visits_cells"."total_minutes" / NULLIF("visits_cells"."visits_n", 0)) AS "per_visit",
  ("visits_cells"."urgent_n" / NULLIF("visits_cells"."visits_n", 0)) AS "urgent_share",
  "visits_cells"."fees" AS "fees",
  ("visits_cells"."fees" / NULLIF("visits_cells"."total_minutes", 0)) AS "fee_per_min",
  "visits_cells"."sd_score" AS "sd_score",
  "visits_cells"."var_score" AS "var_score",
  COALESCE("notes_per"."notes", 0) AS "notes",
  "visits_cells"."grouping_id"
FROM "visits_cells"
  LEFT JOIN "notes_per" ON "notes_per"."grouping_id" = CASE "visits_cells"."grouping_id" WHEN 0 THEN 0 WHEN 1 THEN 2 END
    AND "notes_per"."patients.ward" IS NOT DISTINCT FROM "visits_cells"."patients.ward"
ORDER BY ("visits_cells"."grouping_id" & 1), "visits_cells"."patients.ward" ASC NULLS LAST;
