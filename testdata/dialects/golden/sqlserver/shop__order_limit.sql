-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m revenue -b sales.item --order 'revenue desc' --limit 2 --totals grand -d sqlserver
WITH [sales_rows] AS (
  SELECT
    [sales].[item] AS [sales.item],
    ([sales].[price] * [sales].[qty]) AS [revenue_arg]
  FROM [shop].[sales] AS [sales]
),
[sales_cells] AS (
  SELECT
    [sales.item],
    GROUPING_ID([sales.item]) AS [grouping_id],
    SUM([revenue_arg]) AS [revenue]
  FROM [sales_rows]
  GROUP BY GROUPING SETS (([sales.item]), ())
),
[result] AS (
  SELECT
    [sales.item],
    [revenue],
    [grouping_id]
  FROM [sales_cells]
),
[result_ranked] AS (
  SELECT
    [sales.item],
    [revenue],
    [grouping_id],
    count(*) OVER (PARTITION BY [grouping_id] ORDER BY CASE WHEN [grouping_id] = 0 THEN 0 ELSE 1 END, CASE WHEN [revenue] IS NULL THEN 1 ELSE 0 END, [revenue] DESC, ([grouping_id] & 1), CASE WHEN [sales.item] IS NULL THEN 1 ELSE 0 END, [sales.item] ASC ROWS BETWEEN UNBOUNDED PRECEDING AND CURRENT ROW) AS [detail_rank]
  FROM [result]
)
SELECT
  [sales.item],
  [revenue],
  [grouping_id]
FROM [result_ranked]
WHERE ([grouping_id] = 0 AND [detail_rank] <= 2)
  OR [grouping_id] = 1
ORDER BY CASE WHEN [grouping_id] = 0 THEN 0 ELSE 1 END, CASE WHEN [revenue] IS NULL THEN 1 ELSE 0 END, [revenue] DESC, ([grouping_id] & 1), CASE WHEN [sales.item] IS NULL THEN 1 ELSE 0 END, [sales.item] ASC;
