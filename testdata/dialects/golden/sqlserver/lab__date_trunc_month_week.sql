-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,total_minutes' -b 'visits.seen_month,visits.seen_week' --totals rollup -d sqlserver
WITH [visits_rows] AS (
  SELECT
    (DATETRUNC(month, [visits].[seen_on])) AS [visits.seen_month],
    (DATETRUNC(iso_week, [visits].[seen_on])) AS [visits.seen_week],
    [visits].[minutes] AS [total_minutes_arg]
  FROM [lab].[visits] AS [visits]
),
[visits_cells] AS (
  SELECT
    [visits.seen_month],
    [visits.seen_week],
    GROUPING_ID([visits.seen_month], [visits.seen_week]) AS [grouping_id],
    COUNT_BIG(*) AS [visits_n],
    SUM([total_minutes_arg]) AS [total_minutes]
  FROM [visits_rows]
  GROUP BY GROUPING SETS (([visits.seen_month], [visits.seen_week]), ([visits.seen_month]), ())
)
SELECT
  [visits.seen_month],
  [visits.seen_week],
  [visits_n],
  [total_minutes],
  [grouping_id]
FROM [visits_cells]
ORDER BY ([grouping_id] & 2), CASE WHEN [visits.seen_month] IS NULL THEN 1 ELSE 0 END, [visits.seen_month] ASC, ([grouping_id] & 1), CASE WHEN [visits.seen_week] IS NULL THEN 1 ELSE 0 END, [visits.seen_week] ASC;
