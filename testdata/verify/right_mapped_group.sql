-- Correct, with the group column under a name of its own (product for
-- sales.item), matched through --map like a measure.
-- args: -m revenue -b sales.item --map sales.item=product --totals grand
-- exit: 0
SELECT s.item AS product, SUM(s.price * s.qty) AS revenue
FROM shop.sales AS s
GROUP BY ROLLUP (s.item)
