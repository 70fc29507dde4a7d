-- TPC-H Q10, Returned Item Reporting Query.
-- Source: TPC Benchmark H Standard Specification, Revision 2.17.1, clause
-- 2.4.10 (2.4.10.2 functional query definition; 2.4.10.4 validation value
-- DATE = 1993-10-01). Read: the dbgen query template queries/10.sql
-- (third-party copies); the validation value is from memory of clause
-- 2.4.10.4, matching third-party copies that use it.
-- DuckDB: "Return the first 20 selected rows" is written as LIMIT 20.
select
	c_custkey,
	c_name,
	sum(l_extendedprice * (1 - l_discount)) as revenue,
	c_acctbal,
	n_name,
	c_address,
	c_phone,
	c_comment
from
	customer,
	orders,
	lineitem,
	nation
where
	c_custkey = o_custkey
	and l_orderkey = o_orderkey
	and o_orderdate >= date '1993-10-01'
	and o_orderdate < date '1993-10-01' + interval '3' month
	and l_returnflag = 'R'
	and c_nationkey = n_nationkey
group by
	c_custkey,
	c_name,
	c_acctbal,
	c_phone,
	n_name,
	c_address,
	c_comment
order by
	revenue desc
limit 20;
