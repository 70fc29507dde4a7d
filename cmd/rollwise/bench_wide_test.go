package main

import (
	"context"
	"database/sql"
	"fmt"
	"strings"
	"testing"
	"time"

	"github.com/rollwise/rollwise/planner/model"
)

// The wide report: twenty measures of testdata/tpch/bench_wide.roll over
// lineitem (sums, averages, a max, ratios, count(distinct), narrowings, two
// pins, a drop, an ungroup and a per-grain measure), by three columns, with
// rollup totals. BenchmarkWideReport times rollwise's SQL for it against a
// single query an expert would write by hand (wideHandFused) and against
// the naive plan: one query per measure, joined on the group columns
// (wideNaive). TestWideReportAgrees checks, at scale factor 0.01, that the
// three return the same rows.

// wideModels are the model files of the wide report.
var wideModels = []string{"tpch.roll", "bench_wide.roll"}

// wideQuery is the wide report.
var wideQuery = model.Request{
	Measures: []string{"revenue", "sum_qty", "sum_base_price", "sum_charge", "avg_price", "avg_disc",
		"count_order", "order_count", "supplier_count", "max_price", "disc_rate", "revenue_per_order",
		"late_lines", "late_rate", "returned_rate", "urgent_revenue", "mail_revenue", "mode_share",
		"shown_share", "order_value"},
	By:     []string{"lineitem.l_shipmode", "orders.o_orderpriority", "lineitem.l_year"},
	Where:  "lineitem.l_shipdate < date '1998-01-01'",
	Totals: "rollup",
}

// wideOrder sorts the report's rows as rollwise does: by the group values,
// NULLs last, each total row after its group.
const wideOrder = `ORDER BY ("grouping_id" & 4), "lineitem.l_shipmode" NULLS LAST,
  ("grouping_id" & 2), "orders.o_orderpriority" NULLS LAST,
  ("grouping_id" & 1), "lineitem.l_year" NULLS LAST`

// wideHandFused is the wide report as an expert writes it for DuckDB: one
// pass over the joined rows for every plain aggregate, with ROLLUP; the
// pins, the drop and the ungroup as windows over the rolled-up cells (a pin
// on a group column is the pinned row of the cells that share the other
// group values; where the column is rolled up, the FILTERed aggregate
// itself); the per-grain average from a second aggregation of the same
// rows by order, over the same grouping sets, which also gives the number
// of orders in each cell (count(DISTINCT l_orderkey) is the number of its
// per-order groups, so no DISTINCT aggregate over the rollup is needed).
// It knows what the model cannot promise rollwise: every line item has its
// order (an inner join), and no group value is NULL.
const wideHandFused = `WITH line AS (
  SELECT
    l.l_shipmode AS shipmode,
    o.o_orderpriority AS priority,
    extract(year FROM l.l_shipdate) AS ship_year,
    l.l_orderkey,
    l.l_suppkey,
    l.l_quantity,
    l.l_extendedprice,
    l.l_discount,
    l.l_returnflag,
    l.l_extendedprice * (1 - l.l_discount) AS disc_price,
    l.l_extendedprice * (1 - l.l_discount) * (1 + l.l_tax) AS charge,
    l.l_receiptdate > l.l_commitdate AS late
  FROM lineitem AS l
  JOIN orders AS o ON o.o_orderkey = l.l_orderkey
  WHERE l.l_shipdate < DATE '1998-01-01'
),
cells AS (
  SELECT
    shipmode, priority, ship_year,
    GROUPING(shipmode, priority, ship_year) AS gid,
    sum(disc_price) AS revenue,
    sum(l_quantity) AS sum_qty,
    sum(l_extendedprice) AS sum_base_price,
    sum(charge) AS sum_charge,
    avg(l_extendedprice) AS avg_price,
    avg(l_discount) AS avg_disc,
    count(l_orderkey) AS count_order,
    count(DISTINCT l_suppkey) AS supplier_count,
    max(l_extendedprice) AS max_price,
    count(l_orderkey) FILTER (WHERE late) AS late_lines,
    sum(disc_price) FILTER (WHERE l_returnflag = 'R') AS returned_revenue,
    sum(disc_price) FILTER (WHERE priority = '1-URGENT') AS urgent_part,
    sum(disc_price) FILTER (WHERE shipmode = 'MAIL') AS mail_part
  FROM line
  GROUP BY ROLLUP (shipmode, priority, ship_year)
),
order_cells AS (
  SELECT
    shipmode, priority, ship_year,
    GROUPING(shipmode, priority, ship_year) AS gid,
    sum(disc_price) AS order_revenue
  FROM line
  GROUP BY GROUPING SETS ((shipmode, priority, ship_year, l_orderkey), (shipmode, priority, l_orderkey),
    (shipmode, l_orderkey), (l_orderkey))
),
order_values AS (
  SELECT gid, shipmode, priority, ship_year, avg(order_revenue) AS order_value, count(*) AS order_count
  FROM order_cells
  GROUP BY gid, shipmode, priority, ship_year
)
SELECT
  c.shipmode AS "lineitem.l_shipmode",
  c.priority AS "orders.o_orderpriority",
  c.ship_year AS "lineitem.l_year",
  revenue, sum_qty, sum_base_price, sum_charge, avg_price, avg_disc, count_order, v.order_count,
  supplier_count, max_price,
  1 - revenue / NULLIF(sum_base_price, 0) AS disc_rate,
  revenue / NULLIF(v.order_count, 0) AS revenue_per_order,
  late_lines,
  late_lines / NULLIF(count_order, 0) AS late_rate,
  returned_revenue / NULLIF(revenue, 0) AS returned_rate,
  sum(urgent_part) OVER (PARTITION BY c.gid, c.shipmode, c.ship_year) AS urgent_revenue,
  sum(mail_part) OVER (PARTITION BY c.gid, c.priority, c.ship_year) AS mail_revenue,
  revenue / NULLIF(sum(revenue) OVER (PARTITION BY c.gid, c.priority, c.ship_year), 0) AS mode_share,
  revenue / NULLIF(sum(revenue) OVER (PARTITION BY c.gid), 0) AS shown_share,
  v.order_value,
  c.gid AS grouping_id
FROM cells AS c
LEFT JOIN order_values AS v ON v.gid = c.gid AND v.shipmode IS NOT DISTINCT FROM c.shipmode
  AND v.priority IS NOT DISTINCT FROM c.priority AND v.ship_year IS NOT DISTINCT FROM c.ship_year
` + wideOrder

// wideNaive is the naive plan of a query: rollwise's SQL for each measure
// alone, as a CTE, joined on the group columns and the grouping id.
func wideNaive(r *engineRunner, q model.Request) (string, error) {
	m, err := r.model(wideModels)
	if err != nil {
		return "", err
	}
	var ctes, cols []string
	from := ""
	for i, name := range q.Measures {
		one := q
		one.Measures = []string{name}
		text, err := planSQL(m, one)
		if err != nil {
			return "", fmt.Errorf("%s: %v", name, err)
		}
		alias := fmt.Sprintf("m%d", i+1)
		ctes = append(ctes, fmt.Sprintf("%q AS (\n%s\n)", alias, text))
		cols = append(cols, fmt.Sprintf("%q.%q", alias, name))
		if i == 0 {
			from = fmt.Sprintf("%q", alias)
			continue
		}
		conds := []string{fmt.Sprintf(`%q."grouping_id" = "m1"."grouping_id"`, alias)}
		for _, g := range q.By {
			conds = append(conds, fmt.Sprintf(`%q.%q IS NOT DISTINCT FROM "m1".%q`, alias, g, g))
		}
		from += fmt.Sprintf("\nLEFT JOIN %q ON %s", alias, strings.Join(conds, " AND "))
	}
	var keys []string
	for _, g := range q.By {
		keys = append(keys, fmt.Sprintf(`"m1".%q`, g))
	}
	sel := append(append(keys, cols...), `"m1"."grouping_id" AS "grouping_id"`)
	return "WITH " + strings.Join(ctes, ",\n") + "\nSELECT * FROM (\nSELECT " + strings.Join(sel, ", ") + "\nFROM " + from +
		"\n) AS report\n" + wideOrder, nil
}

// wideQueries are the three SQL texts of the wide report: rollwise's, the
// hand-fused one and the naive plan.
func wideQueries(r *engineRunner) ([]string, error) {
	m, err := r.model(wideModels)
	if err != nil {
		return nil, err
	}
	gen, err := planSQL(m, wideQuery)
	if err != nil {
		return nil, err
	}
	naive, err := wideNaive(r, wideQuery)
	if err != nil {
		return nil, err
	}
	return []string{gen, wideHandFused, naive}, nil
}

// TestWideReportAgrees checks at scale factor 0.01 that rollwise's SQL,
// the hand-fused query and the naive plan of the wide report return the
// same rows, so that the benchmark compares equals.
func TestWideReportAgrees(t *testing.T) {
	t.Parallel()
	if testing.Short() {
		t.Skip("uses TPC-H data at scale factor 0.01; skipped with -short")
	}
	ctx, cancel := context.WithTimeout(context.Background(), 5*time.Minute)
	defer cancel()
	dir, _ := openTPCH(t, ctx, 0.01)
	r, err := newEngineRunner(ctx, dir)
	if err != nil {
		t.Fatal(err)
	}
	defer r.Close()
	queries, err := wideQueries(r)
	if err != nil {
		t.Fatal(err)
	}
	conn, err := r.db.Conn(ctx)
	if err != nil {
		t.Fatal(err)
	}
	defer conn.Close()
	var results [][][]cellValue
	for i, q := range queries {
		rows, _, _, err := timedQuery(ctx, conn, q)
		if err != nil {
			t.Fatalf("query %d: %v\n%s", i+1, err, q)
		}
		results = append(results, rows)
	}
	// 7 ship modes, 5 priorities, 6 years (1992 to 1997): 210 detail rows
	// at most, 7 * 5 + 7 + 1 = 43 total rows.
	if n := len(results[0]); n < 100 || n > 253 {
		t.Errorf("the wide report has %d rows", n)
	}
	for i, name := range []string{"the hand-fused query", "the naive plan"} {
		if msg := sameResults(results[0], results[i+1]); msg != "" {
			t.Errorf("rollwise's SQL and %s disagree: %s", name, msg)
		}
	}
	if got := len(results[0][0]); got != len(wideQuery.By)+len(wideQuery.Measures)+1 {
		t.Errorf("%d columns", got)
	}
}

// BenchmarkWideReport times rollwise's SQL for the wide report against the
// hand-fused query and the naive plan (the targets: gen/hand at
// most 1.3; gen at least 3 times faster than naive, gen/naive at most 0.33).
func BenchmarkWideReport(b *testing.B) {
	d := sharedBenchData(b)
	b.Logf("TPC-H scale factor %v", d.sf)
	queries, err := wideQueries(d.r)
	if err != nil {
		b.Fatal(err)
	}
	benchRace(b, []*sql.Conn{d.conn}, []string{"gen", "hand", "naive"}, queries, true)
}
