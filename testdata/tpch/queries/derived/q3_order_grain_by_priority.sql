-- Derived from TPC-H Q3 (TPC Benchmark H Standard Specification, Revision
-- 2.17.1, clause 2.4.3, validation values SEGMENT = BUILDING, DATE =
-- 1995-03-15): the average revenue of the orders Q3 ranks (Q3 without its
-- ORDER BY and LIMIT), per order priority and over all priorities (the
-- ROLLUP row: the average of every order, not of the priorities' averages). Q3's GROUP BY columns depend on
-- l_orderkey, so its groups are orders, and o_orderpriority depends on
-- l_orderkey too. Not a TPC-H query.
select
	o_orderpriority,
	avg(revenue) as avg_order_revenue
from
	(
		select
			l_orderkey,
			sum(l_extendedprice * (1 - l_discount)) as revenue,
			o_orderdate,
			o_shippriority,
			o_orderpriority
		from
			customer,
			orders,
			lineitem
		where
			c_mktsegment = 'BUILDING'
			and c_custkey = o_custkey
			and l_orderkey = o_orderkey
			and o_orderdate < date '1995-03-15'
			and l_shipdate > date '1995-03-15'
		group by
			l_orderkey,
			o_orderdate,
			o_shippriority,
			o_orderpriority
	) as shipping_priority
group by
	rollup (o_orderpriority)
order by
	o_orderpriority nulls last;
