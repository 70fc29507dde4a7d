-- An inner join to the stores: the sales line of store 9 (no such store)
-- is dropped, so its NULL-region row is missing and the total is short.
-- args: -m revenue -b stores.region --totals grand --grouping-column g
-- exit: 1
-- differ: revenue @ stores.region=* : dropped-unmatched
-- only: rollwise @ stores.region=null : dropped-unmatched
SELECT st.region, SUM(s.price * s.qty) AS revenue, GROUPING(st.region) AS g
FROM shop.sales AS s
JOIN shop.stores AS st ON s.store_id = st.id
GROUP BY ROLLUP (st.region)
