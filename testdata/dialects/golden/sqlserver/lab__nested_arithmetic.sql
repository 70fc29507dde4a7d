-- rollwise sql testdata/dialects/lab.roll -m 'nested_arith,visits_n,total_minutes' -b patients.ward --totals grand -d sqlserver
WITH [visits_rows] AS (
  SELECT
    [patients].[ward] AS [patients.ward],
    [visits].[minutes] AS [total_minutes_arg]
  FROM [lab].[visits] AS [visits]
  LEFT JOIN [lab].[patients] AS [patients] ON [visits].[patient] = [patients].[id]
),
[visits_cells] AS (
  SELECT
    [patients.ward],
    GROUPING_ID([patients.ward]) AS [grouping_id],
    COUNT_BIG(*) AS [visits_n],
    SUM([total_minutes_arg]) AS [total_minutes]
  FROM [visits_rows]
  GROUP BY GROUPING SETS (([patients.ward]), ())
)
SELECT
  [patients.ward],
  ([visits_n] - ([total_minutes] - [visits_n]) - [visits_n] * ([visits_n] - 2) + CAST(COALESCE([total_minutes] - 100, 0) AS FLOAT) / NULLIF(([visits_n] - 6), 0)) AS [nested_arith],
  [visits_n],
  [total_minutes],
  [grouping_id]
FROM [visits_cells]
ORDER BY ([grouping_id] & 1), CASE WHEN [patients.ward] IS NULL THEN 1 ELSE 0 END, [patients.ward] ASC;
