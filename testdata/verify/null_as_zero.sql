-- Visit minutes averaged with the missing minutes as zeros, and repair
-- fees shown as 0 for the sales of store 9, which has no repairs at all.
-- args: -m visit_minutes,revenue,fees -b stores.region
-- exit: 1
-- differ: visit_minutes @ stores.region=North : null-as-zero
-- differ: visit_minutes @ stores.region=South : null-as-zero
-- differ: fees @ stores.region=null : null-as-zero
WITH regions AS (
  SELECT DISTINCT st.region
  FROM shop.sales AS s LEFT JOIN shop.stores AS st ON s.store_id = st.id
)
SELECT g.region,
       (SELECT AVG(COALESCE(v.minutes, 0))
        FROM shop.visits AS v JOIN shop.stores AS st ON v.store_id = st.id
        WHERE st.region IS NOT DISTINCT FROM g.region) AS visit_minutes,
       (SELECT SUM(s.price * s.qty)
        FROM shop.sales AS s LEFT JOIN shop.stores AS st ON s.store_id = st.id
        WHERE st.region IS NOT DISTINCT FROM g.region) AS revenue,
       COALESCE((SELECT SUM(r.fee)
        FROM shop.repairs AS r JOIN shop.stores AS st ON r.store_id = st.id
        WHERE st.region IS NOT DISTINCT FROM g.region), 0) AS fees
FROM regions AS g
