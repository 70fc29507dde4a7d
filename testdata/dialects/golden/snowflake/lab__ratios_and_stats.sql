-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,total_minutes,avg_minutes,per_visit,urgent_share,fees,fee_per_min,sd_score,var_score,notes' -b patients.ward --totals grand -d snowflake
WITH "VISITS_ROWS" AS (
  SELECT
    "PATIENTS"."WARD" AS "patients.ward",
    "VISITS"."MINUTES" AS "TOTAL_MINUTES_ARG",
    "VISITS"."URGENT" AS "URGENT_N_IF",
    "VISITS"."FEE" AS "FEES_ARG",
    "VISITS"."SCORE" AS "SD_SCORE_ARG",
    "VISITS"."NOTE" AS "visits.note per"
  FROM "LAB"."VISITS" AS "VISITS"
  LEFT JOIN "LAB"."PATIENTS" AS "PATIENTS" ON "VISITS"."PATIENT" = "PATIENTS"."ID"
),
"VISITS_CELLS" AS (
  SELECT
    "patients.ward",
    GROUPING("patients.ward") AS "GROUPING_ID",
    count(*) AS "VISITS_N",
    sum("TOTAL_MINUTES_ARG") AS "TOTAL_MINUTES",
    avg(CAST("TOTAL_MINUTES_ARG" AS FLOAT)) AS "AVG_MINUTES",
    count(CASE WHEN "URGENT_N_IF" THEN 1 END) AS "URGENT_N",
    sum("FEES_ARG") AS "FEES",
    stddev_samp(CAST("SD_SCORE_ARG" AS FLOAT)) AS "SD_SCORE",
    var_samp(CAST("SD_SCORE_ARG" AS FLOAT)) AS "VAR_SCORE"
  FROM "VISITS_ROWS"
  GROUP BY GROUPING SETS (("patients.ward"), ())
),
"NOTES_PER_VISITS_CELLS" AS (
  SELECT
    "patients.ward",
    "visits.note per",
    GROUPING("patients.ward", "visits.note per") AS "GROUPING_ID"
  FROM "VISITS_ROWS"
  GROUP BY GROUPING SETS (("patients.ward", "visits.note per"), ("visits.note per"))
),
"NOTES_PER_GROUPS" AS (
  SELECT
    "patients.ward",
    "visits.note per",
    "GROUPING_ID"
  FROM "NOTES_PER_VISITS_CELLS"
),
"NOTES_PER" AS (
  SELECT
    "patients.ward",
    "GROUPING_ID",
    count(CASE WHEN "visits.note per" IS NOT NULL THEN 1 END) AS "NOTES"
  FROM "NOTES_PER_GROUPS"
  GROUP BY "GROUPING_ID", "patients.ward"
)
SELECT
  "VISITS_CELLS"."patients.ward",
  "VISITS_CELLS"."VISITS_N" AS "VISITS_N",
  "VISITS_CELLS"."TOTAL_MINUTES" AS "TOTAL_MINUTES",
  "VISITS_CELLS"."AVG_MINUTES" AS "AVG_MINUTES",
  (CAST("VISITS_CELLS"."TOTAL_MINUTES" AS FLOAT) / NULLIF("VISITS_CELLS"."VISITS_N", 0)) AS "PER_VISIT",
  (CAST("VISITS_CELLS"."URGENT_N" AS FLOAT) / NULLIF("VISITS_CELLS"."VISITS_N", 0)) AS "URGENT_SHARE",
  "VISITS_CELLS"."FEES" AS "FEES",
  (CAST("VISITS_CELLS"."FEES" AS FLOAT) / NULLIF("VISITS_CELLS"."TOTAL_MINUTES", 0)) AS "FEE_PER_MIN",
  "VISITS_CELLS"."SD_SCORE" AS "SD_SCORE",
  "VISITS_CELLS"."VAR_SCORE" AS "VAR_SCORE",
  COALESCE("NOTES_PER"."NOTES", 0) AS "NOTES",
  "VISITS_CELLS"."GROUPING_ID"
FROM "VISITS_CELLS"
  LEFT JOIN "NOTES_PER" ON "NOTES_PER"."GROUPING_ID" = CASE "VISITS_CELLS"."GROUPING_ID" WHEN 0 THEN 0 WHEN 1 THEN 2 END
    AND "NOTES_PER"."patients.ward" IS NOT DISTINCT FROM "VISITS_CELLS"."patients.ward"
ORDER BY BITAND("VISITS_CELLS"."GROUPING_ID", 1), "VISITS_CELLS"."patients.ward" ASC NULLS LAST;
