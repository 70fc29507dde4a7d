-- rollwise sql testdata/dialects/hostile.roll -m 'tot'\''al,n ]--' -w $'`we"ird\'; --`.`na\'me"; DROP` in (\'a\nGO\nb\', \'x\r\n  go 5 \r\ny\', \'back\\\nslash\', \'O\'\'Brien\n\', \'O\'\'Brien\')' -d sqlserver
WITH [we"ird'; --_rows] AS (
  SELECT
    [we"ird'; --].[val\ue] AS [tot'al_arg],
    [we"ird'; --].[id] AS [n ]]--_arg]
  FROM [lab_hostile].[x"y'z`w]]--] AS [we"ird'; --]
  WHERE ([we"ird'; --].[na'me"; DROP] IN ((N'a' + NCHAR(10) + N'GO' + NCHAR(10) + N'b'), (N'x' + NCHAR(13) + NCHAR(10) + N'  go 5 ' + NCHAR(13) + NCHAR(10) + N'y'), (N'back\' + NCHAR(10) + N'slash'), (N'O''Brien' + NCHAR(10)), N'O''Brien'))
),
[we"ird'; --_cells] AS (
  SELECT
    0 AS [grouping_id],
    SUM([tot'al_arg]) AS [tot'al],
    COUNT_BIG([n ]]--_arg]) AS [n ]]--]
  FROM [we"ird'; --_rows]
)
SELECT
  [tot'al],
  [n ]]--],
  [grouping_id]
FROM [we"ird'; --_cells];
