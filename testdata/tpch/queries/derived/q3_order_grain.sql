-- Derived from TPC-H Q3 (TPC Benchmark H Standard Specification, Revision
-- 2.17.1, clause 2.4.3, validation values SEGMENT = BUILDING, DATE =
-- 1995-03-15): the average revenue of the orders Q3 ranks, over all of
-- them (Q3 without its ORDER BY and LIMIT). Its GROUP BY columns
-- o_orderdate and o_shippriority depend on l_orderkey, so its groups are
-- orders. Not a TPC-H query.
select
	avg(revenue) as avg_order_revenue
from
	(
		select
			l_orderkey,
			sum(l_extendedprice * (1 - l_discount)) as revenue,
			o_orderdate,
			o_shippriority
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
			o_shippriority
	) as shipping_priority;
