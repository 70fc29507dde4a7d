-- sum(qty * qty) written as SUM(qty) * SUM(qty), and revenue as
-- SUM(price) * SUM(qty).
-- args: -m qty_sq,revenue -b sales.item
-- exit: 1
-- differ: qty_sq @ sales.item=fern : product-of-sums
-- differ: qty_sq @ sales.item=rose : product-of-sums
-- differ: revenue @ sales.item=fern : product-of-sums
-- differ: revenue @ sales.item=rose : product-of-sums
SELECT s.item, SUM(s.qty) * SUM(s.qty) AS qty_sq, SUM(s.price) * SUM(s.qty) AS revenue
FROM shop.sales AS s
GROUP BY s.item
