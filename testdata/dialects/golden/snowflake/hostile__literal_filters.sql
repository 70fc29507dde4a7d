-- rollwise sql testdata/dialects/hostile.roll -m 'tot'\''al,n ]--,avg/*x*/' -w '`we"ird'\''; --`.`na'\''me"; DROP` in ('\''O'\'''\''Brien'\'', '\''x'\'''\''; DROP TABLE t; --'\'', '\''back\slash'\'', '\''ends with \'\'', '\''-- comment'\'', '\''/* open'\'', '\''ünï 名 🌱  '\'')' -d snowflake
WITH "we""ird'; --_rows" AS (
  SELECT
    "we""ird'; --"."val\ue" AS "tot'al_arg",
    "we""ird'; --"."ID" AS "n ]--_arg"
  FROM "LAB_HOSTILE"."x""y'z`w]--" AS "we""ird'; --"
  WHERE ("we""ird'; --"."na'me""; DROP" IN ('O''Brien', 'x''; DROP TABLE t; --', 'back\\slash', 'ends with \\', '-- comment', '/* open', 'ünï 名 🌱  '))
),
"we""ird'; --_cells" AS (
  SELECT
    0 AS "GROUPING_ID",
    sum("tot'al_arg") AS "tot'al",
    count("n ]--_arg") AS "n ]--"
  FROM "we""ird'; --_rows"
)
SELECT
  "tot'al",
  "n ]--",
  (CAST("tot'al" AS FLOAT) / NULLIF("n ]--", 0)) AS "avg/*x*/",
  "GROUPING_ID"
FROM "we""ird'; --_cells";
