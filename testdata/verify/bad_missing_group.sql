-- The SQL has no column for a --by reference: exit 2.
-- args: -m revenue -b stores.region
-- exit: 2
-- stderr: the SQL has no column region (or "stores.region")
SELECT st.id AS store, SUM(s.price * s.qty) AS revenue
FROM shop.sales AS s JOIN shop.stores AS st ON s.store_id = st.id GROUP BY st.id
