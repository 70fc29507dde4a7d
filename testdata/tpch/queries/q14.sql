-- TPC-H Q14, Promotion Effect Query.
-- Source: TPC Benchmark H Standard Specification, Revision 2.17.1, clause
-- 2.4.14 (2.4.14.2 functional query definition; 2.4.14.4 validation value
-- DATE = 1995-09-01). Read: the dbgen query template queries/14.sql and a
-- third-party copy with this value; that it is the clause 2.4.14.4 value is
-- from memory.
select
	100.00 * sum(case
		when p_type like 'PROMO%'
			then l_extendedprice * (1 - l_discount)
		else 0
	end) / sum(l_extendedprice * (1 - l_discount)) as promo_revenue
from
	lineitem,
	part
where
	l_partkey = p_partkey
	and l_shipdate >= date '1995-09-01'
	and l_shipdate < date '1995-09-01' + interval '1' month;
