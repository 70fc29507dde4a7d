-- Two averages of ratios: the total averages the rows' margin rates
-- ((0.5 + 0.6667 + 0.6111) / 3 rather than 0.5), and the revenue per unit
-- is the plain average of the unit price over sales lines (rose:
-- (2.5 + 2.5 + 3) / 3 = 2.6667, where 18 / 7 = 2.5714 is right).
-- args: -m margin_rate,unit_revenue -b sales.item --totals grand
-- exit: 1
-- differ: margin_rate @ sales.item=* : average-of-ratios
-- differ: unit_revenue @ sales.item=rose : average-of-ratios
-- differ: unit_revenue @ sales.item=* : average-of-ratios
WITH by_item AS (
  SELECT s.item,
         (SUM(s.price * s.qty) - SUM(s.cost * s.qty)) / SUM(s.price * s.qty) AS margin_rate,
         AVG(s.price) AS unit_revenue
  FROM shop.sales AS s
  GROUP BY s.item
)
SELECT item, margin_rate, unit_revenue FROM by_item
UNION ALL
SELECT NULL, (SELECT AVG(margin_rate) FROM by_item), (SELECT AVG(price) FROM shop.sales)
