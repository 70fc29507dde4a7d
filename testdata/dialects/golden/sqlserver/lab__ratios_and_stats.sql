-- rollwise sql testdata/dialects/lab.roll -m 'visits_n,total_minutes,avg_minutes,per_visit,urgent_share,fees,fee_per_min,sd_score,var_score,notes' -b patients.ward --totals grand -d sqlserver
WITH [visits_rows] AS (
  SELECT
    [patients].[ward] AS [patients.ward],
    [visits].[minutes] AS [total_minutes_arg],
    [visits].[urgent] AS [urgent_n_if],
    [visits].[fee] AS [fees_arg],
    [visits].[score] AS [sd_score_arg],
    [visits].[note] AS [notes_arg]
  FROM [lab].[visits] AS [visits]
  LEFT JOIN [lab].[patients] AS [patients] ON [visits].[patient] = [patients].[id]
),
[visits_cells] AS (
  SELECT
    [patients.ward],
    GROUPING_ID([patients.ward]) AS [grouping_id],
    COUNT_BIG(*) AS [visits_n],
    SUM([total_minutes_arg]) AS [total_minutes],
    AVG(CAST([total_minutes_arg] AS FLOAT)) AS [avg_minutes],
    COUNT_BIG(CASE WHEN ([urgent_n_if] = 1) THEN 1 END) AS [urgent_n],
    SUM([fees_arg]) AS [fees],
    STDEV(CAST([sd_score_arg] AS FLOAT)) AS [sd_score],
    VAR(CAST([sd_score_arg] AS FLOAT)) AS [var_score],
    COUNT_BIG(DISTINCT [notes_arg]) AS [notes]
  FROM [visits_rows]
  GROUP BY GROUPING SETS (([patients.ward]), ())
)
SELECT
  [patients.ward],
  [visits_n],
  [total_minutes],
  [avg_minutes],
  (CAST([total_minutes] AS FLOAT) / NULLIF([visits_n], 0)) AS [per_visit],
  (CAST([urgent_n] AS FLOAT) / NULLIF([visits_n], 0)) AS [urgent_share],
  [fees],
  (CAST([fees] AS FLOAT) / NULLIF([total_minutes], 0)) AS [fee_per_min],
  [sd_score],
  [var_score],
  [notes],
  [grouping_id]
FROM [visits_cells]
ORDER BY ([grouping_id] & 1), CASE WHEN [patients.ward] IS NULL THEN 1 ELSE 0 END, [patients.ward] ASC;
