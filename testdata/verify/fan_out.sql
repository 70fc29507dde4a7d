-- Revenue and repair fees from one join of sales to repairs through the
-- stores: each sales line repeats once per repair job of its store, and
-- the lines of stores without repairs (and of store 9) drop out.
-- args: -m revenue -b sales.item --totals grand
-- exit: 1
-- differ: revenue @ sales.item=fern : fan-out
-- differ: revenue @ sales.item=rose : fan-out
-- differ: revenue @ sales.item=tulip : fan-out
-- differ: revenue @ sales.item=* : fan-out
SELECT s.item, SUM(s.price * s.qty) AS revenue, SUM(r.fee) AS fees
FROM shop.sales AS s
JOIN shop.stores AS st ON s.store_id = st.id
JOIN shop.repairs AS r ON r.store_id = st.id
GROUP BY ROLLUP (s.item)
