-- rollwise sql testdata/dialects/hostile.roll --view 'by '\''label'\''' --totals rollup -d snowflake
WITH "we""ird'; --_rows" AS (
  SELECT
    "gr/*oup*/"."la""bel'" AS "gr/*oup*/.la""bel'",
    "we""ird'; --"."üñí 名" AS "we""ird'; --.üñí 名",
    "we""ird'; --"."val\ue" AS "tot'al_arg",
    "we""ird'; --"."na'me""; DROP" AS "names#_arg"
  FROM "LAB_HOSTILE"."x""y'z`w]--" AS "we""ird'; --"
  LEFT JOIN "LAB_HOSTILE"."g]-- #" AS "gr/*oup*/" ON "we""ird'; --"."[grp]" = "gr/*oup*/"."ID"
),
"we""ird'; --_cells" AS (
  SELECT
    "gr/*oup*/.la""bel'",
    "we""ird'; --.üñí 名",
    GROUPING("gr/*oup*/.la""bel'", "we""ird'; --.üñí 名") AS "GROUPING_ID",
    sum("tot'al_arg") AS "tot'al",
    count(DISTINCT "names#_arg") AS "names#"
  FROM "we""ird'; --_rows"
  GROUP BY GROUPING SETS (("gr/*oup*/.la""bel'", "we""ird'; --.üñí 名"), ("gr/*oup*/.la""bel'"), ())
)
SELECT
  "gr/*oup*/.la""bel'",
  "we""ird'; --.üñí 名",
  "tot'al",
  "names#",
  "GROUPING_ID"
FROM "we""ird'; --_cells"
ORDER BY BITAND("GROUPING_ID", 2), "gr/*oup*/.la""bel'" ASC NULLS LAST, BITAND("GROUPING_ID", 1), "we""ird'; --.üñí 名" ASC NULLS LAST;
