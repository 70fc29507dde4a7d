-- The total adds the regions' distinct item counts (2 + 2 + 1 = 5) where
-- three different items were sold.
-- args: -m items -b stores.region --totals grand --grouping-column g
-- exit: 1
-- differ: items @ stores.region=* : sum-of-distinct-counts
WITH by_region AS (
  SELECT st.region, COUNT(DISTINCT s.item) AS items
  FROM shop.sales AS s
  LEFT JOIN shop.stores AS st ON s.store_id = st.id
  GROUP BY st.region
)
SELECT region, SUM(items) AS items, GROUPING(region) AS g
FROM by_region
GROUP BY ROLLUP (region)
