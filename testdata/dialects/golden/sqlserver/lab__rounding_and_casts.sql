-- rollwise sql testdata/dialects/lab.roll -m 'rounded_sum,rounded2_sum,fee_ints' -b visits.id -d sqlserver
WITH [visits_rows] AS (
  SELECT
    [visits].[id] AS [visits.id],
    (ROUND([visits].[score], 0)) AS [rounded_sum_arg],
    (ROUND([visits].[score], 2)) AS [rounded2_sum_arg],
    (CAST(ROUND([visits].[fee], 0) AS BIGINT)) AS [fee_ints_arg]
  FROM [lab].[visits] AS [visits]
),
[visits_cells] AS (
  SELECT
    [visits.id],
    0 AS [grouping_id],
    SUM([rounded_sum_arg]) AS [rounded_sum],
    SUM([rounded2_sum_arg]) AS [rounded2_sum],
    SUM([fee_ints_arg]) AS [fee_ints]
  FROM [visits_rows]
  GROUP BY [visits.id]
)
SELECT
  [visits.id],
  [rounded_sum],
  [rounded2_sum],
  [fee_ints],
  [grouping_id]
FROM [visits_cells]
ORDER BY CASE WHEN [visits.id] IS NULL THEN 1 ELSE 0 END, [visits.id] ASC;
