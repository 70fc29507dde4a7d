-- The rose revenue without its narrowing (all items), and a report that
-- forgets the query's filter on the North: the tulip row (sold only in the
-- South) appears, and the other rows hold everyone's revenue.
-- args: -m revenue,roses -b sales.item -w "stores.region = 'North'"
-- exit: 1
-- differ: roses @ sales.item=fern : filter-ignored
-- differ: revenue @ sales.item=fern : filter-ignored
-- differ: revenue @ sales.item=rose : filter-ignored
-- only: sql @ sales.item=tulip : filter-ignored
SELECT s.item, SUM(s.price * s.qty) AS revenue,
       SUM(CASE WHEN st.region = 'North' THEN s.price * s.qty END) AS roses
FROM shop.sales AS s
LEFT JOIN shop.stores AS st ON s.store_id = st.id
GROUP BY s.item
