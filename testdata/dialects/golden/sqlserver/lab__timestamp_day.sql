-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,last_at' -b visits.seen_day -w 'visits.seen_at >= timestamp '\''2024-01-01 00:00:00'\''' -d sqlserver
WITH [visits_rows] AS (
  SELECT
    (DATETRUNC(day, [visits].[seen_at])) AS [visits.seen_day],
    [visits].[seen_at] AS [last_at_arg]
  FROM [lab].[visits] AS [visits]
  WHERE ([visits].[seen_at] >= CAST('2024-01-01 00:00:00' AS DATETIME2))
),
[visits_cells] AS (
  SELECT
    [visits.seen_day],
    0 AS [grouping_id],
    COUNT_BIG(*) AS [visits_n],
    MAX([last_at_arg]) AS [last_at]
  FROM [visits_rows]
  GROUP BY [visits.seen_day]
)
SELECT
  [visits.seen_day],
  [visits_n],
  [last_at],
  [grouping_id]
FROM [visits_cells]
ORDER BY CASE WHEN [visits.seen_day] IS NULL THEN 1 ELSE 0 END, [visits.seen_day] ASC;
