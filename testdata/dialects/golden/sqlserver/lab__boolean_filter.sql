-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,fees' -b visits.urgent -w 'visits.urgent or visits.minutes > 40' --totals grand -d sqlserver
WITH [visits_rows] AS (
  SELECT
    [visits].[urgent] AS [visits.urgent],
    [visits].[fee] AS [fees_arg]
  FROM [lab].[visits] AS [visits]
  WHERE (([visits].[urgent] = 1) OR ([visits].[minutes] > 40))
),
[visits_cells] AS (
  SELECT
    [visits.urgent],
    GROUPING_ID([visits.urgent]) AS [grouping_id],
    COUNT_BIG(*) AS [visits_n],
    SUM([fees_arg]) AS [fees]
  FROM [visits_rows]
  GROUP BY GROUPING SETS (([visits.urgent]), ())
)
SELECT
  [visits.urgent],
  [visits_n],
  [fees],
  [grouping_id]
FROM [visits_cells]
ORDER BY ([grouping_id] & 1), CASE WHEN [visits.urgent] IS NULL THEN 1 ELSE 0 END, [visits.urgent] ASC;
