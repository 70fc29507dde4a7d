-- rollwise sql testdata/dialects/lab.roll -m 'patients_seen,urgent_patients' -b patients.ward --totals grand -d sqlserver
WITH [visits_rows] AS (
  SELECT
    [patients].[ward] AS [patients.ward],
    [visits].[patient] AS [patients_seen_arg],
    [visits].[urgent] AS [urgent_patients_if]
  FROM [lab].[visits] AS [visits]
  LEFT JOIN [lab].[patients] AS [patients] ON [visits].[patient] = [patients].[id]
),
[visits_cells] AS (
  SELECT
    [patients.ward],
    GROUPING_ID([patients.ward]) AS [grouping_id],
    COUNT_BIG(DISTINCT [patients_seen_arg]) AS [patients_seen],
    COUNT_BIG(DISTINCT CASE WHEN ([urgent_patients_if] = 1) THEN [patients_seen_arg] END) AS [urgent_patients]
  FROM [visits_rows]
  GROUP BY GROUPING SETS (([patients.ward]), ())
)
SELECT
  [patients.ward],
  [patients_seen],
  [urgent_patients],
  [grouping_id]
FROM [visits_cells]
ORDER BY ([grouping_id] & 1), CASE WHEN [patients.ward] IS NULL THEN 1 ELSE 0 END, [patients.ward] ASC;
