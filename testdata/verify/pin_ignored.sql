-- rose_rev = revenue[sales.item = 'rose'], written without the pin: every
-- region shows all its revenue.
-- args: -m rose_rev -b stores.region
-- exit: 1
-- differ: rose_rev @ stores.region=North : filter-ignored
-- differ: rose_rev @ stores.region=South : filter-ignored
-- differ: rose_rev @ stores.region=null : filter-ignored
SELECT st.region, SUM(s.price * s.qty) AS rose_rev
FROM shop.sales AS s
LEFT JOIN shop.stores AS st ON s.store_id = st.id
GROUP BY st.region
