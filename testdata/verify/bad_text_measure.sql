-- A column of text mapped to a measure: exit 2, naming the column, the
-- measure and the row.
-- args: -m revenue -b sales.item --map revenue=label
-- exit: 2
-- stderr: the SQL's column label, compared with measure revenue, holds text ("30.00 EUR") (row 1), not a number
SELECT s.item, CAST(SUM(s.price * s.qty) AS DECIMAL(10, 2)) || ' EUR' AS label
FROM shop.sales AS s GROUP BY s.item ORDER BY s.item
