-- Derived from TPC-H Q8 (TPC Benchmark H Standard Specification, Revision
-- 2.17.1, clause 2.4.8, validation values REGION = AMERICA, TYPE = ECONOMY
-- ANODIZED STEEL): the market share of each nation of the region (the
-- values the NATION parameter may take, clause 2.4.8.3) at once. Q8's
-- share for NATION = X in year Y is the row (Y, X) here; a pair without
-- revenue has no row here, where Q8 shows 0. Not a TPC-H query.
select
	o_year,
	nation,
	mkt_share
from
	(
		select
			o_year,
			nation,
			sum(volume) / sum(sum(volume)) over (partition by o_year) as mkt_share
		from
			(
				select
					extract(year from o_orderdate) as o_year,
					l_extendedprice * (1 - l_discount) as volume,
					n2.n_name as nation
				from
					part,
					supplier,
					lineitem,
					orders,
					customer,
					nation n1,
					nation n2,
					region
				where
					p_partkey = l_partkey
					and s_suppkey = l_suppkey
					and l_orderkey = o_orderkey
					and o_custkey = c_custkey
					and c_nationkey = n1.n_nationkey
					and n1.n_regionkey = r_regionkey
					and r_name = 'AMERICA'
					and s_nationkey = n2.n_nationkey
					and o_orderdate between date '1995-01-01' and date '1996-12-31'
					and p_type = 'ECONOMY ANODIZED STEEL'
			) as all_nations
		group by
			o_year,
			nation
	) as shares
where
	nation in ('ARGENTINA', 'BRAZIL', 'CANADA', 'PERU', 'UNITED STATES')
order by
	o_year,
	nation;
