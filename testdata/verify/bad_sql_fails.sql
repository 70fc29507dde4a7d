-- SQL that the engine rejects: a clear message, exit 1.
-- args: -m revenue -b sales.item
-- exit: 1
-- stderr: the handwritten SQL
-- stderr: nosuch
SELECT item, SUM(price * qty) AS revenue FROM shop.nosuch GROUP BY item
