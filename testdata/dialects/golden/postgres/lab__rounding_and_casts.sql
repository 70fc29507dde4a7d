-- rollwise sql testdata/dialects/lab.roll -m 'rounded_sum,rounded2_sum,fee_ints' -b visits.id -d postgres
WITH "visits_rows" AS (
  SELECT
    "visits"."id" AS "visits.id",
    (CAST(round(CAST("visits"."score" AS NUMERIC)) AS DOUBLE PRECISION)) AS "rounded_sum_arg",
    (CAST(round(CAST("visits"."score" AS NUMERIC), 2) AS DOUBLE PRECISION)) AS "rounded2_sum_arg",
    (CAST("visits"."fee" AS BIGINT)) AS "fee_ints_arg"
  FROM "lab"."visits" AS "visits"
),
"visits_cells" AS (
  SELECT
    "visits.id",
    0 AS "grouping_id",
    sum("rounded_sum_arg") AS "rounded_sum",
    sum("rounded2_sum_arg") AS "rounded2_sum",
    sum("fee_ints_arg") AS "fee_ints"
  FROM "visits_rows"
  GROUP BY "visits.id"
)
SELECT
  "visits.id",
  "rounded_sum",
  "rounded2_sum",
  "fee_ints",
  "grouping_id"
FROM "visits_cells"
ORDER BY "visits.id" ASC NULLS LAST;
