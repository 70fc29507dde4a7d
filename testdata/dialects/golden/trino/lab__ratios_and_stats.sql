-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,total_minutes,avg_minutes,per_visit,urgent_share,fees,fee_per_min,sd_score,var_score,notes' -b patients.ward --totals grand -d trino
WITH "visits_rows" AS (
  SELECT
    "patients"."ward" AS "patients.ward",
    "visits"."minutes" AS "total_minutes_arg",
    "visits"."urgent" AS "urgent_n_if",
    "visits"."fee" AS "fees_arg",
    "visits"."score" AS "sd_score_arg",
    "visits"."note" AS "notes_arg"
  FROM "lab"."visits" AS "visits"
  LEFT JOIN "lab"."patients" AS "patients" ON "visits"."patient" = "patients"."id"
),
"visits_cells" AS (
  SELECT
    "patients.ward",
    grouping("patients.ward") AS "grouping_id",
    count(*) AS "visits_n",
    sum("total_minutes_arg") AS "total_minutes",
    avg(CAST("total_minutes_arg" AS DOUBLE)) AS "avg_minutes",
    count(*) FILTER (WHERE "urgent_n_if") AS "urgent_n",
    sum("fees_arg") AS "fees",
    stddev_samp(CAST("sd_score_arg" AS DOUBLE)) AS "sd_score",
    var_samp(CAST("sd_score_arg" AS DOUBLE)) AS "var_score",
    count(DISTINCT "notes_arg") AS "notes"
  FROM "visits_rows"
  GROUP BY GROUPING SETS (("patients.ward"), ())
)
SELECT
  "patients.ward",
  "visits_n",
  "total_minutes",
  "avg_minutes",
  (CAST("total_minutes" AS DOUBLE) / NULLIF("visits_n", 0)) AS "per_visit",
  (CAST("urgent_n" AS DOUBLE) / NULLIF("visits_n", 0)) AS "urgent_share",
  "fees",
  (CAST("fees" AS DOUBLE) / NULLIF("total_minutes", 0)) AS "fee_per_min",
  "sd_score",
  "var_score",
  "notes",
  "grouping_id"
FROM "visits_cells"
ORDER BY bitwise_and("grouping_id", 1), "patients.ward" ASC NULLS LAST;
