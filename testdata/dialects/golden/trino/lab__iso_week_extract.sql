-- rollwise sql testdata/dialects/lab.roll -m visits_n -b 'visits.iso_week,visits.quarter_no' --totals all -d trino
WITH "visits_rows" AS (
  SELECT
    (EXTRACT(WEEK FROM "visits"."seen_on")) AS "visits.iso_week",
    (EXTRACT(QUARTER FROM "visits"."seen_on")) AS "visits.quarter_no"
  FROM "lab"."visits" AS "visits"
),
"visits_cells" AS (
  SELECT
    "visits.iso_week",
    "visits.quarter_no",
    grouping("visits.iso_week", "visits.quarter_no") AS "grouping_id",
    count(*) AS "visits_n"
  FROM "visits_rows"
  GROUP BY GROUPING SETS (("visits.iso_week", "visits.quarter_no"), ("visits.iso_week"), ("visits.quarter_no"), ())
)
SELECT
  "visits.iso_week",
  "visits.quarter_no",
  "visits_n",
  "grouping_id"
FROM "visits_cells"
ORDER BY bitwise_and("grouping_id", 2), "visits.iso_week" ASC NULLS LAST, bitwise_and("grouping_id", 1), "visits.quarter_no" ASC NULLS LAST;
