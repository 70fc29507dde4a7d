-- TPC-H Q1, Pricing Summary Report Query.
-- Source: TPC Benchmark H Standard Specification, Revision 2.17.1, clause
-- 2.4.1 (2.4.1.2 functional query definition; 2.4.1.4 validation value
-- DELTA = 90). Read: third-party copies of the functional query definition
-- and of clause 2.4.1.4 (DELTA = 90); the spec PDF itself was not read.
-- DuckDB: the spec's "interval '[DELTA]' day (3)" is written without the
-- "(3)" precision, which DuckDB does not accept (a minor modification,
-- clause 2.2.3.3). 1998-12-01 minus 90 days is 1998-09-02.
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
	l_returnflag,
	l_linestatus
order by
	l_returnflag,
	l_linestatus;
