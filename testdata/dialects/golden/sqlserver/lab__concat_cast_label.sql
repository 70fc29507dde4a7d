-- rollwise sql testdata/dialects/lab.roll -m visits_n -b visits.label -d sqlserver
WITH [visits_rows] AS (
  SELECT
    ((CAST((CAST(UPPER([visits].[note]) AS NVARCHAR(MAX)) + CAST(N'/' AS NVARCHAR(MAX))) AS NVARCHAR(MAX)) + CAST(CAST([visits].[minutes] AS NVARCHAR(MAX)) AS NVARCHAR(MAX)))) AS [visits.label]
  FROM [lab].[visits] AS [visits]
),
[visits_cells] AS (
  SELECT
    [visits.label],
    0 AS [grouping_id],
    COUNT_BIG(*) AS [visits_n]
  FROM [visits_rows]
  GROUP BY [visits.label]
)
SELECT
  [visits.label],
  [visits_n],
  [grouping_id]
FROM [visits_cells]
ORDER BY CASE WHEN [visits.label] IS NULL THEN 1 ELSE 0 END, [visits.label] ASC;
