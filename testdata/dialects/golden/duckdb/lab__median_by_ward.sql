-- rollwise sql testdata/dialects/lab.roll -m 'mid_minutes,visits_n' -b patients.ward -d duckdb
WITH "visits_rows" AS (
  SELECT
    "patients"."ward" AS "patients.ward",
    "visits"."minutes" AS "mid_minutes_arg"
  FROM "lab"."visits" AS "visits"
  LEFT JOIN "lab"."patients" AS "patients" ON "visits"."patient" = "patients"."id"
),
"visits_cells" AS (
  SELECT
    "patients.ward",
    0 AS "grouping_id",
    median(CAST("mid_minutes_arg" AS DOUBLE)) AS "mid_minutes",
    count(*) AS "visits_n"
  FROM "visits_rows"
  GROUP BY "patients.ward"
)
SELECT
  "patients.ward",
  "mid_minutes",
  "visits_n",
  "grouping_id"
FROM "visits_cells"
ORDER BY "patients.ward" ASC NULLS LAST;
