-- TPC-H Q6, Forecasting Revenue Change Query.
-- Source: TPC Benchmark H Standard Specification, Revision 2.17.1, clause
-- 2.4.6 (2.4.6.2 functional query definition; 2.4.6.4 validation values
-- DATE = 1994-01-01, DISCOUNT = 0.06, QUANTITY = 24). Read: a qgen-made
-- copy of the dbgen template queries/6.sql (with other parameter values);
-- the validation values are from memory of clause 2.4.6.4. At scale factor
-- 1 this text gives 123141078.2283, the published validation answer.
select
	sum(l_extendedprice * l_discount) as revenue
from
	lineitem
where
	l_shipdate >= date '1994-01-01'
	and l_shipdate < date '1994-01-01' + interval '1' year
	and l_discount between 0.06 - 0.01 and 0.06 + 0.01
	and l_quantity < 24;
