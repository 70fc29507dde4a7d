-- rollwise sql testdata/dialects/lab.roll -m total_minutes -b visits.seen_month --order 'total_minutes desc' --limit 3 --totals grand -d sqlserver
WITH [visits_rows] AS (
  SELECT
    (DATETRUNC(month, [visits].[seen_on])) AS [visits.seen_month],
    [visits].[minutes] AS [total_minutes_arg]
  FROM [lab].[visits] AS [visits]
),
[visits_cells] AS (
  SELECT
    [visits.seen_month],
    GROUPING_ID([visits.seen_month]) AS [grouping_id],
    SUM([total_minutes_arg]) AS [total_minutes]
  FROM [visits_rows]
  GROUP BY GROUPING SETS (([visits.seen_month]), ())
),
[result] AS (
  SELECT
    [visits.seen_month],
    [total_minutes],
    [grouping_id]
  FROM [visits_cells]
),
[result_ranked] AS (
  SELECT
    [visits.seen_month],
    [total_minutes],
    [grouping_id],
    count(*) OVER (PARTITION BY [grouping_id] ORDER BY CASE WHEN [grouping_id] = 0 THEN 0 ELSE 1 END, CASE WHEN [total_minutes] IS NULL THEN 1 ELSE 0 END, [total_minutes] DESC, ([grouping_id] & 1), CASE WHEN [visits.seen_month] IS NULL THEN 1 ELSE 0 END, [visits.seen_month] ASC ROWS BETWEEN UNBOUNDED PRECEDING AND CURRENT ROW) AS [detail_rank]
  FROM [result]
)
SELECT
  [visits.seen_month],
  [total_minutes],
  [grouping_id]
FROM [result_ranked]
WHERE ([grouping_id] = 0 AND [detail_rank] <= 3)
  OR [grouping_id] = 1
ORDER BY CASE WHEN [grouping_id] = 0 THEN 0 ELSE 1 END, CASE WHEN [total_minutes] IS NULL THEN 1 ELSE 0 END, [total_minutes] DESC, ([grouping_id] & 1), CASE WHEN [visits.seen_month] IS NULL THEN 1 ELSE 0 END, [visits.seen_month] ASC;
