-- rollwise sql testdata/dialects/lab.roll -m visits_n -b 'visits.iso_week,visits.quarter_no' --totals all -d snowflake
WITH "VISITS_ROWS" AS (
  SELECT
    (EXTRACT(WEEKISO FROM "VISITS"."SEEN_ON")) AS "visits.iso_week",
    (EXTRACT(QUARTER FROM "VISITS"."SEEN_ON")) AS "visits.quarter_no"
  FROM "LAB"."VISITS" AS "VISITS"
),
"VISITS_CELLS" AS (
  SELECT
    "visits.iso_week",
    "visits.quarter_no",
    GROUPING("visits.iso_week", "visits.quarter_no") AS "GROUPING_ID",
    count(*) AS "VISITS_N"
  FROM "VISITS_ROWS"
  GROUP BY GROUPING SETS (("visits.iso_week", "visits.quarter_no"), ("visits.iso_week"), ("visits.quarter_no"), ())
)
SELECT
  "visits.iso_week",
  "visits.quarter_no",
  "VISITS_N",
  "GROUPING_ID"
FROM "VISITS_CELLS"
ORDER BY BITAND("GROUPING_ID", 2), "visits.iso_week" ASC NULLS LAST, BITAND("GROUPING_ID", 1), "visits.quarter_no" ASC NULLS LAST;
