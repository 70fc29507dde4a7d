-- rollwise sql testdata/exec/shop.roll testdata/exec/edits.roll -m 'revenue,units' -b 'districts.area,sales.item' --totals rollup -d sqlserver
WITH [sales_rows] AS (
  SELECT
    [districts].[area] AS [districts.area],
    [sales].[item] AS [sales.item],
    ([sales].[price] * [sales].[qty]) AS [revenue_arg],
    [sales].[qty] AS [units_arg]
  FROM [shop].[sales] AS [sales]
  LEFT JOIN [shop].[stores] AS [stores] ON [sales].[store_id] = [stores].[id]
  LEFT JOIN [districts] AS [districts] ON [stores].[district_id] = [districts].[id]
),
[sales_cells] AS (
  SELECT
    [districts.area],
    [sales.item],
    GROUPING_ID([districts.area], [sales.item]) AS [grouping_id],
    SUM([revenue_arg]) AS [revenue],
    SUM([units_arg]) AS [units]
  FROM [sales_rows]
  GROUP BY GROUPING SETS (([districts.area], [sales.item]), ([districts.area]), ())
)
SELECT
  [districts.area],
  [sales.item],
  [revenue],
  [units],
  [grouping_id]
FROM [sales_cells]
ORDER BY ([grouping_id] & 2), CASE WHEN [districts.area] IS NULL THEN 1 ELSE 0 END, [districts.area] ASC, ([grouping_id] & 1), CASE WHEN [sales.item] IS NULL THEN 1 ELSE 0 END, [sales.item] ASC;
