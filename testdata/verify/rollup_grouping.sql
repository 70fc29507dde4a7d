-- A correct GROUP BY ROLLUP over a column with a genuine NULL group (the
-- sales line of store 9, which no store row matches). GROUPING() tells
-- the grand total from the NULL region.
-- args: -m revenue,items -b stores.region --totals rollup --grouping-column g
-- exit: 0
SELECT st.region, SUM(s.price * s.qty) AS revenue, COUNT(DISTINCT s.item) AS items,
       GROUPING(st.region) AS g
FROM shop.sales AS s
LEFT JOIN shop.stores AS st ON s.store_id = st.id
GROUP BY ROLLUP (st.region)
