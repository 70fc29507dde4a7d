-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m revenue -b sales.item --order 'revenue desc' --limit 2 -d sqlserver
WITH [sales_rows] AS (
  SELECT
    [sales].[item] AS [sales.item],
    ([sales].[price] * [sales].[qty]) AS [revenue_arg]
  FROM [shop].[sales] AS [sales]
),
[sales_cells] AS (
  SELECT
    [sales.item],
    0 AS [grouping_id],
    SUM([revenue_arg]) AS [revenue]
  FROM [sales_rows]
  GROUP BY [sales.item]
),
[result] AS (
  SELECT
    [sales.item],
    [revenue],
    [grouping_id]
  FROM [sales_cells]
)
SELECT TOP (2)
  [sales.item],
  [revenue],
  [grouping_id]
FROM [result]
ORDER BY CASE WHEN [revenue] IS NULL THEN 1 ELSE 0 END, [revenue] DESC, CASE WHEN [sales.item] IS NULL THEN 1 ELSE 0 END, [sales.item] ASC;
