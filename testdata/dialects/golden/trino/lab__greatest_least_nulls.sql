-- rollwise sql testdata/dialects/lab.roll -m 'top_longest,low_shortest' -b visits.id -d trino
WITH "visits_rows" AS (
  SELECT
    "visits"."id" AS "visits.id",
    (greatest(COALESCE("visits"."score", CAST("visits"."minutes" AS DOUBLE)), COALESCE(CAST("visits"."minutes" AS DOUBLE), "visits"."score"))) AS "top_longest_arg",
    (least(COALESCE("visits"."score", CAST("visits"."minutes" AS DOUBLE)), COALESCE(CAST("visits"."minutes" AS DOUBLE), "visits"."score"))) AS "low_shortest_arg"
  FROM "lab"."visits" AS "visits"
),
"visits_cells" AS (
  SELECT
    "visits.id",
    0 AS "grouping_id",
    max("top_longest_arg") AS "top_longest",
    min("low_shortest_arg") AS "low_shortest"
  FROM "visits_rows"
  GROUP BY "visits.id"
)
SELECT
  "visits.id",
  "top_longest",
  "low_shortest",
  "grouping_id"
FROM "visits_cells"
ORDER BY "visits.id" ASC NULLS LAST;
