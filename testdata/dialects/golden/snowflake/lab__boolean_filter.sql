-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,fees' -b visits.urgent -w 'visits.urgent or visits.minutes > 40' --totals grand -d snowflake
WITH "VISITS_ROWS" AS (
  SELECT
    "VISITS"."URGENT" AS "visits.urgent",
    "VISITS"."FEE" AS "FEES_ARG"
  FROM "LAB"."VISITS" AS "VISITS"
  WHERE ("VISITS"."URGENT" OR ("VISITS"."MINUTES" > 40))
),
"VISITS_CELLS" AS (
  SELECT
    "visits.urgent",
    GROUPING("visits.urgent") AS "GROUPING_ID",
    count(*) AS "VISITS_N",
    sum("FEES_ARG") AS "FEES"
  FROM "VISITS_ROWS"
  GROUP BY GROUPING SETS (("visits.urgent"), ())
)
SELECT
  "visits.urgent",
  "VISITS_N",
  "FEES",
  "GROUPING_ID"
FROM "VISITS_CELLS"
ORDER BY BITAND("GROUPING_ID", 1), "visits.urgent" ASC NULLS LAST;
