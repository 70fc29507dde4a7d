-- north_share = (revenue where stores.region = 'North') / revenue[drop stores.region]:
-- the denominator drops the query's filter on the region. This SQL divides
-- by the filtered revenue instead, so the filter leaks into it: fern is
-- 10 / 10 where rollwise has 10 / 30 (the fern line of store 9 has no
-- region and counts in the denominator).
-- args: -m north_share -b sales.item -w "stores.region in ('North', 'South')"
-- exit: 1
-- differ: north_share @ sales.item=fern : filter-leaked
SELECT s.item,
       SUM(CASE WHEN st.region = 'North' THEN s.price * s.qty END) / SUM(s.price * s.qty) AS north_share
FROM shop.sales AS s
LEFT JOIN shop.stores AS st ON s.store_id = st.id
WHERE st.region IN ('North', 'South')
GROUP BY s.item
