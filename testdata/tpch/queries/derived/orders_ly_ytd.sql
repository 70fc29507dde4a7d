-- Written from the TPC-H schema (TPC Benchmark H Standard Specification,
-- Revision 2.17.1, clause 1.4.1: ORDERS, O_TOTALPRICE and O_ORDERDATE):
-- the order value of each month of 1996, the same month a year earlier
-- (a join on the month moved back a year), and the year to date (a window
-- sum over the year's months, in order). Not a TPC-H query: it checks
-- rollwise's time edits `back 1 year` and `to date year`.
with monthly as (
	select
		date_trunc('month', o_orderdate) as o_month,
		sum(o_totalprice) as order_value
	from
		orders
	group by
		date_trunc('month', o_orderdate)
)
select
	cast(m.o_month as date) as o_month,
	m.order_value,
	ly.order_value as order_value_ly,
	sum(m.order_value) over (
		partition by extract(year from m.o_month)
		order by m.o_month
		rows between unbounded preceding and current row
	) as order_value_ytd
from
	monthly m
	left join monthly ly on ly.o_month = m.o_month - interval 1 year
where
	extract(year from m.o_month) = 1996
order by
	m.o_month;
