-- rollwise sql testdata/dialects/lab.roll -m visits_n -b 'visits.iso_week,visits.quarter_no' --totals all -d sqlserver
WITH [visits_rows] AS (
  SELECT
    (DATEPART(iso_week, [visits].[seen_on])) AS [visits.iso_week],
    (DATEPART(quarter, [visits].[seen_on])) AS [visits.quarter_no]
  FROM [lab].[visits] AS [visits]
),
[visits_cells] AS (
  SELECT
    [visits.iso_week],
    [visits.quarter_no],
    GROUPING_ID([visits.iso_week], [visits.quarter_no]) AS [grouping_id],
    COUNT_BIG(*) AS [visits_n]
  FROM [visits_rows]
  GROUP BY GROUPING SETS (([visits.iso_week], [visits.quarter_no]), ([visits.iso_week]), ([visits.quarter_no]), ())
)
SELECT
  [visits.iso_week],
  [visits.quarter_no],
  [visits_n],
  [grouping_id]
FROM [visits_cells]
ORDER BY ([grouping_id] & 2), CASE WHEN [visits.iso_week] IS NULL THEN 1 ELSE 0 END, [visits.iso_week] ASC, ([grouping_id] & 1), CASE WHEN [visits.quarter_no] IS NULL THEN 1 ELSE 0 END, [visits.quarter_no] ASC;
