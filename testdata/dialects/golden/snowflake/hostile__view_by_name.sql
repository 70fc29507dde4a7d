-- rollwise sql testdata/dialects/hostile.roll --view 'by "name"' -d snowflake
WITH "we""ird'; --_rows" AS (
  SELECT
    "we""ird'; --"."na'me""; DROP" AS "we""ird'; --.na'me""; DROP",
    "we""ird'; --"."val\ue" AS "tot'al_arg",
    "we""ird'; --"."ID" AS "n ]--_arg"
  FROM "LAB_HOSTILE"."x""y'z`w]--" AS "we""ird'; --"
),
"we""ird'; --_cells" AS (
  SELECT
    "we""ird'; --.na'me""; DROP",
    0 AS "GROUPING_ID",
    sum("tot'al_arg") AS "tot'al",
    count("n ]--_arg") AS "n ]--"
  FROM "we""ird'; --_rows"
  GROUP BY "we""ird'; --.na'me""; DROP"
)
SELECT
  "we""ird'; --.na'me""; DROP",
  "tot'al",
  "n ]--",
  (CAST("tot'al" AS FLOAT) / NULLIF("n ]--", 0)) AS "avg/*x*/",
  "GROUPING_ID"
FROM "we""ird'; --_cells"
ORDER BY "we""ird'; --.na'me""; DROP" ASC NULLS LAST;
