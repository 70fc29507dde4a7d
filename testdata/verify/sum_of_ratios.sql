-- The total adds the rows' margin rates: 0.52 + 0.6 + 0.4 = 1.52, where
-- the margin rate of all sales is 30 / 60 = 0.5.
-- args: -m revenue,margin_rate -b stores.region --totals grand --grouping-column g
-- exit: 1
-- differ: margin_rate @ stores.region=* : sum-of-ratios
WITH by_region AS (
  SELECT st.region,
         SUM(s.price * s.qty) AS revenue,
         (SUM(s.price * s.qty) - SUM(s.cost * s.qty)) / SUM(s.price * s.qty) AS margin_rate
  FROM shop.sales AS s
  LEFT JOIN shop.stores AS st ON s.store_id = st.id
  GROUP BY st.region
)
SELECT region, SUM(revenue) AS revenue, SUM(margin_rate) AS margin_rate, GROUPING(region) AS g
FROM by_region
GROUP BY GROUPING SETS ((region), ())
