-- Derived from TPC-H Q5 (TPC Benchmark H Standard Specification, Revision
-- 2.17.1, clause 2.4.5, validation values REGION = ASIA, DATE = 1994-01-01):
-- each nation's revenue and its share of the revenue of all the rows the
-- query shows (the sum of the column), a window over the query's result.
-- Not a TPC-H query.
select
	n_name,
	revenue,
	revenue / sum(revenue) over () as revenue_share
from (
	select
		n_name,
		sum(l_extendedprice * (1 - l_discount)) as revenue
	from
		customer,
		orders,
		lineitem,
		supplier,
		nation,
		region
	where
		c_custkey = o_custkey
		and l_orderkey = o_orderkey
		and l_suppkey = s_suppkey
		and c_nationkey = s_nationkey
		and s_nationkey = n_nationkey
		and n_regionkey = r_regionkey
		and r_name = 'ASIA'
		and o_orderdate >= date '1994-01-01'
		and o_orderdate < date '1994-01-01' + interval '1' year
	group by
		n_name
) as local_volume
order by
	revenue desc;
