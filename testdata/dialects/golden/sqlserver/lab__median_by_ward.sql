-- rollwise sql testdata/dialects/lab.roll -m 'mid_minutes,visits_n' -b patients.ward -d sqlserver
WITH [visits_rows] AS (
  SELECT
    [patients].[ward] AS [patients.ward],
    [visits].[minutes] AS [mid_minutes_arg]
  FROM [lab].[visits] AS [visits]
  LEFT JOIN [lab].[patients] AS [patients] ON [visits].[patient] = [patients].[id]
),
[visits_ranks] AS (
  SELECT
    [patients.ward],
    [mid_minutes_arg] AS [mid_minutes_median_value],
    ROW_NUMBER() OVER (PARTITION BY [patients.ward] ORDER BY CASE WHEN [mid_minutes_arg] IS NULL THEN 1 ELSE 0 END, [mid_minutes_arg] ASC) AS [mid_minutes_median_number],
    COUNT_BIG([mid_minutes_arg]) OVER (PARTITION BY [patients.ward] ORDER BY CASE WHEN [mid_minutes_arg] IS NULL THEN 1 ELSE 0 END, [mid_minutes_arg] ASC ROWS BETWEEN UNBOUNDED PRECEDING AND UNBOUNDED FOLLOWING) AS [mid_minutes_median_count]
  FROM [visits_rows]
),
[visits_cells] AS (
  SELECT
    [patients.ward],
    0 AS [grouping_id],
    AVG(CAST(CASE WHEN 2 * [mid_minutes_median_number] BETWEEN [mid_minutes_median_count] AND [mid_minutes_median_count] + 2 THEN [mid_minutes_median_value] END AS FLOAT)) AS [mid_minutes],
    COUNT_BIG(*) AS [visits_n]
  FROM [visits_ranks]
  GROUP BY [patients.ward]
)
SELECT
  [patients.ward],
  [mid_minutes],
  [visits_n],
  [grouping_id]
FROM [visits_cells]
ORDER BY CASE WHEN [patients.ward] IS NULL THEN 1 ELSE 0 END, [patients.ward] ASC;
