-- The SQL has no column for a measure: exit 2, naming the columns it has
-- and the --map way out.
-- args: -m revenue,units -b sales.item
-- exit: 2
-- stderr: the SQL has no column units for measure units
-- stderr: --map units=COLUMN
SELECT s.item, SUM(s.price * s.qty) AS revenue, SUM(s.qty) AS unitz
FROM shop.sales AS s GROUP BY s.item
