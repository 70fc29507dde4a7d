-- Derived from TPC-H Q13 (TPC Benchmark H Standard Specification, Revision
-- 2.17.1, clause 2.4.13): the inner query's orders per customer (count of
-- o_orderkey grouped by c_custkey), averaged per customer nation over the
-- customers that have orders, without Q13's comment filter and outer join.
-- Not a TPC-H query.
select
	n_name,
	avg(c_count) as orders_per_customer
from
	(
		select
			n_name,
			c_custkey,
			count(o_orderkey) as c_count
		from
			customer,
			orders,
			nation
		where
			c_custkey = o_custkey
			and c_nationkey = n_nationkey
		group by
			n_name,
			c_custkey
	) as c_orders
group by
	n_name
order by
	n_name;
