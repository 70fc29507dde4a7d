-- A revenue with 10% added: no usual mistake explains it, and verify
-- shows both values.
-- args: -m revenue -b sales.item
-- exit: 1
-- differ: revenue @ sales.item=fern : none
-- differ: revenue @ sales.item=rose : none
-- differ: revenue @ sales.item=tulip : none
SELECT s.item, SUM(s.price * s.qty) * 1.1 AS revenue
FROM shop.sales AS s
GROUP BY s.item
