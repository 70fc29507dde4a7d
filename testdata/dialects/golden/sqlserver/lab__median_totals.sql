-- rollwise sql testdata/dialects/lab.roll -m 'mid_minutes,urgent_mid,patient_mid' -b patients.ward --totals rollup -d sqlserver
WITH [visits_rows] AS (
  SELECT
    [patients].[ward] AS [patients.ward],
    [visits].[minutes] AS [mid_minutes_arg],
    [visits].[urgent] AS [urgent_mid_if],
    [visits].[patient] AS [visits.patient per]
  FROM [lab].[visits] AS [visits]
  LEFT JOIN [lab].[patients] AS [patients] ON [visits].[patient] = [patients].[id]
),
[visits_ranks] AS (
  SELECT
    [patients.ward],
    [mid_minutes_arg] AS [mid_minutes_median_value],
    ROW_NUMBER() OVER (PARTITION BY [patients.ward] ORDER BY CASE WHEN [mid_minutes_arg] IS NULL THEN 1 ELSE 0 END, [mid_minutes_arg] ASC) AS [mid_minutes_median_number_0],
    COUNT_BIG([mid_minutes_arg]) OVER (PARTITION BY [patients.ward] ORDER BY CASE WHEN [mid_minutes_arg] IS NULL THEN 1 ELSE 0 END, [mid_minutes_arg] ASC ROWS BETWEEN UNBOUNDED PRECEDING AND UNBOUNDED FOLLOWING) AS [mid_minutes_median_count_0],
    ROW_NUMBER() OVER (ORDER BY CASE WHEN [mid_minutes_arg] IS NULL THEN 1 ELSE 0 END, [mid_minutes_arg] ASC) AS [mid_minutes_median_number_1],
    COUNT_BIG([mid_minutes_arg]) OVER (ORDER BY CASE WHEN [mid_minutes_arg] IS NULL THEN 1 ELSE 0 END, [mid_minutes_arg] ASC ROWS BETWEEN UNBOUNDED PRECEDING AND UNBOUNDED FOLLOWING) AS [mid_minutes_median_count_1],
    CASE WHEN ([urgent_mid_if] = 1) THEN [mid_minutes_arg] END AS [urgent_mid_median_value],
    ROW_NUMBER() OVER (PARTITION BY [patients.ward] ORDER BY CASE WHEN CASE WHEN ([urgent_mid_if] = 1) THEN [mid_minutes_arg] END IS NULL THEN 1 ELSE 0 END, CASE WHEN ([urgent_mid_if] = 1) THEN [mid_minutes_arg] END ASC) AS [urgent_mid_median_number_0],
    COUNT_BIG(CASE WHEN ([urgent_mid_if] = 1) THEN [mid_minutes_arg] END) OVER (PARTITION BY [patients.ward] ORDER BY CASE WHEN CASE WHEN ([urgent_mid_if] = 1) THEN [mid_minutes_arg] END IS NULL THEN 1 ELSE 0 END, CASE WHEN ([urgent_mid_if] = 1) THEN [mid_minutes_arg] END ASC ROWS BETWEEN UNBOUNDED PRECEDING AND UNBOUNDED FOLLOWING) AS [urgent_mid_median_count_0],
    ROW_NUMBER() OVER (ORDER BY CASE WHEN CASE WHEN ([urgent_mid_if] = 1) THEN [mid_minutes_arg] END IS NULL THEN 1 ELSE 0 END, CASE WHEN ([urgent_mid_if] = 1) THEN [mid_minutes_arg] END ASC) AS [urgent_mid_median_number_1],
    COUNT_BIG(CASE WHEN ([urgent_mid_if] = 1) THEN [mid_minutes_arg] END) OVER (ORDER BY CASE WHEN CASE WHEN ([urgent_mid_if] = 1) THEN [mid_minutes_arg] END IS NULL THEN 1 ELSE 0 END, CASE WHEN ([urgent_mid_if] = 1) THEN [mid_minutes_arg] END ASC ROWS BETWEEN UNBOUNDED PRECEDING AND UNBOUNDED FOLLOWING) AS [urgent_mid_median_count_1]
  FROM [visits_rows]
),
[visits_cells] AS (
  SELECT
    [patients.ward],
    GROUPING_ID([patients.ward]) AS [grouping_id],
    CASE GROUPING_ID([patients.ward])
      WHEN 0 THEN AVG(CAST(CASE WHEN 2 * [mid_minutes_median_number_0] BETWEEN [mid_minutes_median_count_0] AND [mid_minutes_median_count_0] + 2 THEN [mid_minutes_median_value] END AS FLOAT))
      WHEN 1 THEN AVG(CAST(CASE WHEN 2 * [mid_minutes_median_number_1] BETWEEN [mid_minutes_median_count_1] AND [mid_minutes_median_count_1] + 2 THEN [mid_minutes_median_value] END AS FLOAT))
    END AS [mid_minutes],
    CASE GROUPING_ID([patients.ward])
      WHEN 0 THEN AVG(CAST(CASE WHEN 2 * [urgent_mid_median_number_0] BETWEEN [urgent_mid_median_count_0] AND [urgent_mid_median_count_0] + 2 THEN [urgent_mid_median_value] END AS FLOAT))
      WHEN 1 THEN AVG(CAST(CASE WHEN 2 * [urgent_mid_median_number_1] BETWEEN [urgent_mid_median_count_1] AND [urgent_mid_median_count_1] + 2 THEN [urgent_mid_median_value] END AS FLOAT))
    END AS [urgent_mid]
  FROM [visits_ranks]
  GROUP BY GROUPING SETS (([patients.ward]), ())
),
[patient_mid_per_visits_cells] AS (
  SELECT
    [patients.ward],
    [visits.patient per],
    GROUPING_ID([patients.ward], [visits.patient per]) AS [grouping_id],
    SUM([mid_minutes_arg]) AS [patient_mid_per_total_minutes]
  FROM [visits_rows]
  GROUP BY GROUPING SETS (([patients.ward], [visits.patient per]), ([visits.patient per]))
),
[patient_mid_per_groups] AS (
  SELECT
    [patients.ward],
    [visits.patient per],
    [grouping_id],
    [patient_mid_per_total_minutes] AS [patient_mid_value]
  FROM [patient_mid_per_visits_cells]
),
[patient_mid_per_ranks] AS (
  SELECT
    [grouping_id],
    [patients.ward],
    [visits.patient per],
    [patient_mid_value],
    CASE WHEN [visits.patient per] IS NOT NULL THEN [patient_mid_value] END AS [patient_mid_median_value],
    ROW_NUMBER() OVER (PARTITION BY [grouping_id], [patients.ward] ORDER BY CASE WHEN CASE WHEN [visits.patient per] IS NOT NULL THEN [patient_mid_value] END IS NULL THEN 1 ELSE 0 END, CASE WHEN [visits.patient per] IS NOT NULL THEN [patient_mid_value] END ASC) AS [patient_mid_median_number],
    COUNT_BIG(CASE WHEN [visits.patient per] IS NOT NULL THEN [patient_mid_value] END) OVER (PARTITION BY [grouping_id], [patients.ward] ORDER BY CASE WHEN CASE WHEN [visits.patient per] IS NOT NULL THEN [patient_mid_value] END IS NULL THEN 1 ELSE 0 END, CASE WHEN [visits.patient per] IS NOT NULL THEN [patient_mid_value] END ASC ROWS BETWEEN UNBOUNDED PRECEDING AND UNBOUNDED FOLLOWING) AS [patient_mid_median_count]
  FROM [patient_mid_per_groups]
),
[patient_mid_per] AS (
  SELECT
    [patients.ward],
    [grouping_id],
    AVG(CAST(CASE WHEN 2 * [patient_mid_median_number] BETWEEN [patient_mid_median_count] AND [patient_mid_median_count] + 2 THEN [patient_mid_median_value] END AS FLOAT)) AS [patient_mid]
  FROM [patient_mid_per_ranks]
  GROUP BY [grouping_id], [patients.ward]
)
SELECT
  [visits_cells].[patients.ward],
  [visits_cells].[mid_minutes] AS [mid_minutes],
  [visits_cells].[urgent_mid] AS [urgent_mid],
  [patient_mid_per].[patient_mid] AS [patient_mid],
  [visits_cells].[grouping_id]
FROM [visits_cells]
  LEFT JOIN [patient_mid_per] ON [patient_mid_per].[grouping_id] = CASE [visits_cells].[grouping_id] WHEN 0 THEN 0 WHEN 1 THEN 2 END
    AND [patient_mid_per].[patients.ward] IS NOT DISTINCT FROM [visits_cells].[patients.ward]
ORDER BY ([visits_cells].[grouping_id] & 1), CASE WHEN [visits_cells].[patients.ward] IS NULL THEN 1 ELSE 0 END, [visits_cells].[patients.ward] ASC;
