-- Derived from TPC-H Q1 (TPC Benchmark H Standard Specification, Revision
-- 2.17.1, clause 2.4.1, validation value DELTA = 90): the same query with
-- GROUP BY ROLLUP, which adds a subtotal per return flag and a grand total.
-- Every aggregate of a ROLLUP row is computed from the rows of that row's
-- group (averages and counts included), which is what rollwise means by a
-- total: the measure re-evaluated in the total's cell. Not a TPC-H query.
select
	l_returnflag,
	l_linestatus,
	sum(l_quantity) as sum_qty,
	sum(l_extendedprice) as sum_base_price,
	sum(l_extendedprice * (1 - l_discount)) as sum_disc_price,
	sum(l_extendedprice * (1 - l_discount) * (1 + l_tax)) as sum_charge,
	avg(l_quantity) as avg_qty,
	avg(l_extendedprice) as avg_price,
	avg(l_discount) as avg_disc,
	count(*) as count_order
from
	lineitem
where
	l_shipdate <= date '1998-12-01' - interval '90' day
group by
	rollup (l_returnflag, l_linestatus)
order by
	l_returnflag nulls last,
	l_linestatus nulls last;
