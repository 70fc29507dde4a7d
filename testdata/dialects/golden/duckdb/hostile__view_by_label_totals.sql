-- rollwise sql testdata/dialects/hostile.roll --view 'by '\''label'\''' --totals rollup -d duckdb
WITH "we""ird'; --_rows" AS MATERIALIZED (
  SELECT
    "gr/*oup*/"."la""bel'" AS "gr/*oup*/.la""bel'",
    "we""ird'; --"."üñí 名" AS "we""ird'; --.üñí 名",
    "we""ird'; --"."val\ue" AS "tot'al_arg",
    "we""ird'; --"."na'me""; DROP" AS "we""ird'; --.na'me""; DROP per"
  FROM "lab_hostile"."x""y'z`w]--" AS "we""ird'; --"
  LEFT JOIN "lab_hostile"."g]-- #" AS "gr/*oup*/" ON "we""ird'; --"."[grp]" = "gr/*oup*/"."id"
),
"we""ird'; --_cells" AS (
  SELECT
    "gr/*oup*/.la""bel'",
    "we""ird'; --.üñí 名",
    GROUPING("gr/*oup*/.la""bel'", "we""ird'; --.üñí 名") AS "grouping_id",
    sum("tot'al_arg") AS "tot'al"
  FROM "we""ird'; --_rows"
  GROUP BY GROUPING SETS (("gr/*oup*/.la""bel'", "we""ird'; --.üñí 名"), ("gr/*oup*/.la""bel'"), ())
),
"names#_per_we""ird'; --_cells" AS (
  SELECT
    "gr/*oup*/.la""bel'",
    "we""ird'; --.üñí 名",
    "we""ird'; --.na'me""; DROP per",
    GROUPING("gr/*oup*/.la""bel'", "we""ird'; --.üñí 名", "we""ird'; --.na'me""; DROP per") AS "grouping_id"
  FROM "we""ird'; --_rows"
  GROUP BY GROUPING SETS (("gr/*oup*/.la""bel'", "we""ird'; --.üñí 名", "we""ird'; --.na'me""; DROP per"), ("gr/*oup*/.la""bel'", "we""ird'; --.na'me""; DROP per"), ("we""ird'; --.na'me""; DROP per"))
),
"names#_per_groups" AS (
  SELECT
    "gr/*oup*/.la""bel'",
    "we""ird'; --.üñí 名",
    "we""ird'; --.na'me""; DROP per",
    "grouping_id"
  FROM "names#_per_we""ird'; --_cells"
),
"names#_per" AS (
  SELECT
    "gr/*oup*/.la""bel'",
    "we""ird'; --.üñí 名",
    "grouping_id",
    count(*) FILTER (WHERE "we""ird'; --.na'me""; DROP per" IS NOT NULL) AS "names#"
  FROM "names#_per_groups"
  GROUP BY "grouping_id", "gr/*oup*/.la""bel'", "we""ird'; --.üñí 名"
)
SELECT
  "we""ird'; --_cells"."gr/*oup*/.la""bel'",
  "we""ird'; --_cells"."we""ird'; --.üñí 名",
  "we""ird'; --_cells"."tot'al" AS "tot'al",
  COALESCE("names#_per"."names#", 0) AS "names#",
  "we""ird'; --_cells"."grouping_id"
FROM "we""ird'; --_cells"
  LEFT JOIN "names#_per" ON "names#_per"."grouping_id" = CASE "we""ird'; --_cells"."grouping_id" WHEN 0 THEN 0 WHEN 1 THEN 2 WHEN 3 THEN 6 END
    AND "names#_per"."gr/*oup*/.la""bel'" IS NOT DISTINCT FROM "we""ird'; --_cells"."gr/*oup*/.la""bel'"
    AND "names#_per"."we""ird'; --.üñí 名" IS NOT DISTINCT FROM "we""ird'; --_cells"."we""ird'; --.üñí 名"
ORDER BY ("we""ird'; --_cells"."grouping_id" & 2), "we""ird'; --_cells"."gr/*oup*/.la""bel'" ASC NULLS LAST, ("we""ird'; --_cells"."grouping_id" & 1), "we""ird'; --_cells"."we""ird'; --.üñí 名" ASC NULLS LAST;
