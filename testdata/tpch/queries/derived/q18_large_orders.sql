-- Derived from TPC-H Q18 (TPC Benchmark H Standard Specification, Revision
-- 2.17.1, clause 2.4.18, validation value QUANTITY = 300): how many orders
-- of each customer nation pass Q18's subquery (select l_orderkey from
-- lineitem group by l_orderkey having sum(l_quantity) > 300). A nation
-- with none counts 0. Not a TPC-H query.
select
	n_name,
	count(*) filter (where quantity > 300) as large_orders
from
	(
		select
			n_name,
			l_orderkey,
			sum(l_quantity) as quantity
		from
			lineitem,
			orders,
			customer,
			nation
		where
			l_orderkey = o_orderkey
			and o_custkey = c_custkey
			and c_nationkey = n_nationkey
		group by
			n_name,
			l_orderkey
	) as order_quantity
group by
	n_name
order by
	n_name;
