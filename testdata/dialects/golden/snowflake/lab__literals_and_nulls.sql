-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,safe_ratio' -b visits.note -w 'visits.note in ('\''O'\'''\''Brien'\'', '\''back\slash'\'', '\''ünï 名'\'') or visits.note is null or visits.seen_on between date '\''2024-02-29'\'' and date '\''2024-03-31'\''' -d snowflake
WITH "VISITS_ROWS" AS (
  SELECT
    "VISITS"."NOTE" AS "visits.note",
    "VISITS"."MINUTES" AS "TOTAL_MINUTES_ARG"
  FROM "LAB"."VISITS" AS "VISITS"
  WHERE ((("VISITS"."NOTE" IN ('O''Brien', 'back\\slash', 'ünï 名')) OR ("VISITS"."NOTE" IS NULL)) OR (("VISITS"."SEEN_ON" >= CAST('2024-02-29' AS DATE)) AND ("VISITS"."SEEN_ON" <= CAST('2024-03-31' AS DATE))))
),
"VISITS_CELLS" AS (
  SELECT
    "visits.note",
    0 AS "GROUPING_ID",
    count(*) AS "VISITS_N",
    sum("TOTAL_MINUTES_ARG") AS "TOTAL_MINUTES"
  FROM "VISITS_ROWS"
  GROUP BY "visits.note"
)
SELECT
  "visits.note",
  "VISITS_N",
  (CAST(coalesce(nullif("TOTAL_MINUTES", 0), 1) AS FLOAT) / NULLIF(abs(("VISITS_N" - 100)), 0)) AS "SAFE_RATIO",
  "GROUPING_ID"
FROM "VISITS_CELLS"
ORDER BY "visits.note" ASC NULLS LAST;
