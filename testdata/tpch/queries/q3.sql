-- TPC-H Q3, Shipping Priority Query.
-- Source: TPC Benchmark H Standard Specification, Revision 2.17.1, clause
-- 2.4.3 (2.4.3.2 functional query definition; 2.4.3.4 validation values
-- SEGMENT = BUILDING, DATE = 1995-03-15). Read: the dbgen query template
-- queries/3.sql (third-party copies); the validation values are from memory
-- of clause 2.4.3.4, matching third-party copies that use them.
-- DuckDB: "Return the first 10 selected rows" is written as LIMIT 10.
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
order by
	revenue desc,
	o_orderdate
limit 10;
