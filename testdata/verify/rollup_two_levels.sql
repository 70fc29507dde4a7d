-- A two-level ROLLUP where the first column has a genuine NULL group:
-- (NULL, fern) is a detail row and matches without help; the subtotal of
-- the NULL area and the grand total both read (NULL, NULL).
-- args: -m units -b districts.area,sales.item --totals rollup
-- exit: 1
-- ambiguous: 1
SELECT d.area, s.item, SUM(s.qty) AS units
FROM shop.sales AS s
LEFT JOIN shop.stores AS st ON s.store_id = st.id
LEFT JOIN districts AS d ON st.district_id = d.id
GROUP BY ROLLUP (d.area, s.item)
