-- TPC-H Q5, Local Supplier Volume Query.
-- Source: TPC Benchmark H Standard Specification, Revision 2.17.1, clause
-- 2.4.5 (2.4.5.2 functional query definition; 2.4.5.4 validation values
-- REGION = ASIA, DATE = 1994-01-01). Read: the dbgen query template
-- queries/5.sql (third-party copies); the validation values are from memory
-- of clause 2.4.5.4, matching third-party copies that use them.
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
order by
	revenue desc;
