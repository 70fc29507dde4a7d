-- A correct rollup: the total's margin rate is re-computed from the total
-- revenue and cost, and the distinct count is counted again.
-- args: -m revenue,margin_rate,items -b sales.item --totals grand
-- exit: 0
SELECT
  s.item,
  SUM(s.price * s.qty) AS revenue,
  (SUM(s.price * s.qty) - SUM(s.cost * s.qty)) / SUM(s.price * s.qty) AS margin_rate,
  COUNT(DISTINCT s.item) AS items
FROM shop.sales AS s
GROUP BY GROUPING SETS ((s.item), ())
ORDER BY s.item;
