-- Takings joined to the staff shifts on store and day: each takings row
-- repeats once per shift of its store that day (extra.roll has the hand
-- arithmetic): North 490 instead of 230, the total 560 instead of 300;
-- South has one shift a day and stays right.
-- args: -m till_takings -b stores.region --totals grand
-- exit: 1
-- differ: till_takings @ stores.region=North : fan-out
-- differ: till_takings @ stores.region=* : fan-out
SELECT st.region, SUM(t.amount) AS till_takings
FROM shop.tills AS t
JOIN shop.stores AS st ON t.store_id = st.id
JOIN shop.shifts AS sh ON sh.store_id = t.store_id AND sh.day = t.day
GROUP BY ROLLUP (st.region)
