-- A --grouping-column that does not hold GROUPING() values: exit 2.
-- args: -m revenue -b sales.item --totals grand --grouping-column g
-- exit: 2
-- stderr: --grouping-column g, row 1: 7 is not a GROUPING() value over the 1 --by column(s)
SELECT s.item, SUM(s.price * s.qty) AS revenue, 7 AS g
FROM shop.sales AS s GROUP BY ROLLUP (s.item)
