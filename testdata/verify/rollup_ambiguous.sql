-- The same rollup without its GROUPING() column: the NULL region and the
-- grand total both show NULL, and rollwise has both, so verify cannot
-- tell which is which and says so.
-- args: -m revenue,items -b stores.region --totals rollup
-- exit: 1
-- ambiguous: 1
-- stdout: --grouping-column
SELECT st.region, SUM(s.price * s.qty) AS revenue, COUNT(DISTINCT s.item) AS items
FROM shop.sales AS s
LEFT JOIN shop.stores AS st ON s.store_id = st.id
GROUP BY ROLLUP (st.region)
