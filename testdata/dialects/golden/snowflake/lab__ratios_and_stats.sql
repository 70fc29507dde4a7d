-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,total_minutes,avg_minutes,per_visit,urgent_share,fees,fee_per_min,sd_score,var_score,notes' -b patients.ward --totals grand -d snowflake
WITH "VISITS_ROWS" AS (
  SELECT
    "PATIENTS"."WARD" AS "patients.ward",
    "VISITS"."MINUTES" AS "TOTAL_MINUTES_ARG",
    "VISITS"."URGENT" AS "URGENT_N_IF",
    "VISITS"."FEE" AS "FEES_ARG",
    "VISITS"."SCORE" AS "SD_SCORE_ARG",
    "VISITS"."NOTE" AS "NOTES_ARG"
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
    var_samp(CAST("SD_SCORE_ARG" AS FLOAT)) AS "VAR_SCORE",
    count(DISTINCT "NOTES_ARG") AS "NOTES"
  FROM "VISITS_ROWS"
  GROUP BY GROUPING SETS (("patients.ward"), ())
)
SELECT
  "patients.ward",
  "VISITS_N",
  "TOTAL_MINUTES",
  "AVG_MINUTES",
  (CAST("TOTAL_MINUTES" AS FLOAT) / NULLIF("VISITS_N", 0)) AS "PER_VISIT",
  (CAST("URGENT_N" AS FLOAT) / NULLIF("VISITS_N", 0)) AS "URGENT_SHARE",
  "FEES",
  (CAST("FEES" AS FLOAT) / NULLIF("TOTAL_MINUTES", 0)) AS "FEE_PER_MIN",
  "SD_SCORE",
  "VAR_SCORE",
  "NOTES",
  "GROUPING_ID"
FROM "VISITS_CELLS"
ORDER BY BITAND("GROUPING_ID", 1), "patients.ward" ASC NULLS LAST;
