-- Correct, with columns named otherwise: the group by its full reference,
-- the measures through --map.
-- args: -m revenue,units -b stores.region --map revenue=total_sales --map units=pieces
-- exit: 0
SELECT st.region AS "stores.region", SUM(s.price * s.qty) AS total_sales, SUM(s.qty) AS pieces
FROM shop.sales AS s
LEFT JOIN shop.stores AS st ON s.store_id = st.id
GROUP BY st.region
