package main

import (
	"bytes"
	"context"
	"database/sql"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"pgregory.net/rapid"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/engine"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/livetest"
	"github.com/rollwise/rollwise/planner/reference/casegen"
)

// The explain tests work on the shop rows of exec_test.go (line: store,
// region, item, price × qty = line, cost × qty):
//
//	1: store 1 North rose  2.50 × 4  = 10, 4
//	2: store 1 North fern 10.00 × 1  = 10, 6
//	3: store 2 North rose  2.50 × 2  =  5, 2
//	4: store 3 South tulip 1.20 × 10 = 12, 5
//	5: store 3 South rose  3.00 × 1  =  3, 1
//	6: store 9 (no store row, region NULL) fern 10.00 × 2 = 20, 12
//
// and the orders of testdata/exec/time.roll (time_test.go). Each root
// value is also checked against `rollwise run` for the same cell
// (explainAgreesWithRun), on DuckDB and on the live engines.

// explainTree runs `rollwise explain ARGS --format json` and decodes the
// tree; it fails the test unless the exit code is 0.
func explainTree(t *testing.T, args ...string) map[string]any {
	t.Helper()
	tree, stderr, code := explainJSON(append([]string{"explain"}, args...))
	if code != 0 {
		t.Fatalf("rollwise explain %s: exit %d\n%s", strings.Join(args, " "), code, stderr)
	}
	return tree
}

// explainJSON runs explain in-process with --format json.
func explainJSON(args []string) (map[string]any, string, int) {
	var out, errb bytes.Buffer
	code := Main(append(slices.Clone(args), "--format", "json"), strings.NewReader(""), &out, &errb)
	if code != 0 {
		return nil, errb.String(), code
	}
	dec := json.NewDecoder(&out)
	dec.UseNumber()
	var tree map[string]any
	if err := dec.Decode(&tree); err != nil {
		return nil, fmt.Sprintf("bad JSON: %v\n%s", err, out.String()), 3
	}
	return tree, errb.String(), 0
}

// part follows a path of part indexes from the root.
func part(t *testing.T, tree map[string]any, path ...int) map[string]any {
	t.Helper()
	n := tree["explain"].(map[string]any)
	for _, i := range path {
		parts := n["parts"].([]any)
		if i >= len(parts) {
			t.Fatalf("no part %d in %v", i, n["definition"])
		}
		n = parts[i].(map[string]any)
	}
	return n
}

// expectPart checks a part's value, cell and (for aggregates) rows.
func expectPart(t *testing.T, n map[string]any, value any, cell []string, rowsInCell int) {
	t.Helper()
	if !diffSameJSON(n["value"], value, true) {
		t.Errorf("%v: value %v, want %v", n["definition"], n["value"], value)
	}
	var got []string
	for _, c := range n["cell"].([]any) {
		got = append(got, c.(string))
	}
	if !slices.Equal(got, cell) {
		t.Errorf("%v: cell %q, want %q", n["definition"], got, cell)
	}
	if rowsInCell >= 0 {
		r, _ := n["rows"].(map[string]any)
		if r == nil || fmt.Sprint(r["in_cell"]) != fmt.Sprint(rowsInCell) {
			t.Errorf("%v: rows %v, want %d in the cell", n["definition"], r, rowsInCell)
		}
	}
}

func num(s string) json.Number { return json.Number(s) }

// explainAgreesWithRun checks that the root value of explain (model args,
// -m measure, -b by, filters, the cell as --cell pairs) equals what run
// prints for the same cell; extra are more arguments for both (--dsn).
func explainAgreesWithRun(t *testing.T, models []string, measure string, by, filters []string, cell map[string]string, extra ...string) {
	t.Helper()
	var q []string
	q = append(q, models...)
	q = append(q, "-m", measure)
	if len(by) > 0 {
		q = append(q, "-b", strings.Join(by, ","))
	}
	for _, f := range filters {
		q = append(q, "-w", f)
	}
	q = append(q, extra...)
	rows, stderr, code := diffRunJSON(append(append([]string{"run"}, q...), "--totals", "all", "--format", "json"))
	if code != 0 {
		t.Fatalf("run %s: exit %d\n%s", strings.Join(q, " "), code, stderr)
	}
	var pairs []string
	for _, b := range by {
		if v, ok := cell[b]; ok {
			pairs = append(pairs, b+"="+v)
		}
	}
	args := append([]string{"explain"}, q...)
	if len(pairs) > 0 {
		args = append(args, "--cell", strings.Join(pairs, ","))
	}
	tree, stderr, code := explainJSON(args)
	if code != 0 {
		t.Fatalf("%s: exit %d\n%s", strings.Join(args, " "), code, stderr)
	}
	approx := tree["explain"].(map[string]any)["type"] == "float" || slices.ContainsFunc(extra, func(a string) bool { return strings.HasPrefix(a, "sqlite:") })
	for _, r := range rows {
		if unquoted(cellOfRow(r, by)) == unquoted(strings.Join(pairs, ",")) {
			root := tree["explain"].(map[string]any)
			if !diffSameJSON(root["value"], r[measure], approx) {
				t.Errorf("%s: explain gives %v, run %v", strings.Join(args, " "), root["value"], r[measure])
			}
			return
		}
	}
	t.Errorf("run %s has no row for the cell %v", strings.Join(q, " "), pairs)
}

// unquoted drops the quotes of a --cell text's values, for comparing
// cells written with and without them.
func unquoted(cell string) string { return strings.ReplaceAll(cell, "'", "") }

// cellOfRow writes a run row's cell as --cell pairs: each group column
// not rolled up, its value as a literal.
func cellOfRow(r map[string]any, by []string) string {
	var pairs []string
	for _, b := range by {
		if slices.ContainsFunc(r["rolled_up"].([]any), func(x any) bool { return x == b }) {
			continue
		}
		var lit string
		switch v := r[b].(type) {
		case nil:
			lit = "null"
		case string:
			lit = "'" + strings.ReplaceAll(v, "'", "''") + "'"
		default:
			lit = fmt.Sprint(v)
		}
		pairs = append(pairs, b+"="+lit)
	}
	return strings.Join(pairs, ",")
}

func TestExplainRatioByHand(t *testing.T) {
	t.Parallel()
	tree := explainTree(t, shopModel, "-m", "margin_rate", "-b", "stores.region", "--cell", "stores.region='North'")
	north := []string{"stores.region = 'North'"}
	// North is lines 1, 2, 3: revenue 10 + 10 + 5 = 25, cost 4 + 6 + 2 = 12,
	// margin_rate (25 - 12) / 25 = 0.52.
	expectPart(t, part(t, tree), num("0.52"), north, -1)
	expectPart(t, part(t, tree, 0), num("25"), north, 3)
	expectPart(t, part(t, tree, 1), num("12"), north, 3)
	if n := part(t, tree, 2); n["name"] != "revenue" || n["note"] == nil {
		t.Errorf("the second use of revenue in the same cell should point above: %v", n)
	}
	explainAgreesWithRun(t, []string{shopModel}, "margin_rate", []string{"stores.region"}, nil, map[string]string{"stores.region": "'North'"})
}

func TestExplainEditsNarrowingAndPerGrain(t *testing.T) {
	t.Parallel()
	models := []string{shopModel, editsModel}
	// north_share = (revenue where stores.region = 'North') / revenue[drop
	// stores.region], in South: the narrowing adds North to South, no row
	// is in both (NULL); the drop leaves every row, 60; NULL / 60 is NULL.
	tree := explainTree(t, shopModel, editsModel, "-m", "north_share", "-b", "stores.region", "--cell", "stores.region=South")
	expectPart(t, part(t, tree), nil, []string{"stores.region = 'South'"}, -1)
	expectPart(t, part(t, tree, 0), nil, []string{"stores.region = 'South'", "stores.region = 'North'"}, 0)
	expectPart(t, part(t, tree, 1), num("60"), []string{}, 6)
	if via := fmt.Sprint(part(t, tree, 1)["via"]); via != "[[drop stores.region]]" {
		t.Errorf("via %s, want the drop", via)
	}
	explainAgreesWithRun(t, models, "north_share", []string{"stores.region"}, nil, map[string]string{"stores.region": "South"})

	// store_avg = avg(revenue per sales.store_id) in North: store 1 is
	// lines 1, 2 (20), store 2 line 3 (5): (20 + 5) / 2 = 12.5.
	tree = explainTree(t, shopModel, editsModel, "-m", "store_avg", "-b", "stores.region", "--cell", "stores.region=North")
	expectPart(t, part(t, tree), num("12.5"), []string{"stores.region = 'North'"}, -1)
	g := part(t, tree)["groups"].(map[string]any)
	if fmt.Sprint(g["kept"]) != "2" || len(g["first"].([]any)) != 2 {
		t.Errorf("groups %v, want stores 1 and 2", g)
	}
	expectPart(t, part(t, tree, 0), num("20"), []string{"sales.store_id = 1", "stores.region = 'North'"}, 2)
	explainAgreesWithRun(t, models, "store_avg", []string{"stores.region"}, nil, map[string]string{"stores.region": "North"})

	// big_stores = count(* per sales.store_id having revenue > 12), the
	// grand total: stores 1 (20), 3 (15) and 9 (20) pass, store 2 (5) not.
	tree = explainTree(t, shopModel, editsModel, "-m", "big_stores")
	expectPart(t, part(t, tree), num("3"), []string{}, -1)
	g = part(t, tree)["groups"].(map[string]any)
	if fmt.Sprint(g["dropped"]) != "[sales.store_id = 2 (having is not true)]" {
		t.Errorf("dropped %v, want store 2", g["dropped"])
	}
	explainAgreesWithRun(t, models, "big_stores", nil, nil, nil)
}

func TestExplainTimeEdits(t *testing.T) {
	t.Parallel()
	// ytd = revenue[orders.day to date year] in March 2025: E is the last
	// order day of the cell, 2025-03-31, so the year to date holds orders
	// 2 (10), 3 (20), 4 (7) and 5 (30): 67.
	tree := explainTree(t, timeModel, "-m", "ytd", "--cell", "orders.month=2025-03-01")
	expectPart(t, part(t, tree), num("67"), []string{"orders.month = 2025-03-01"}, -1)
	expectPart(t, part(t, tree, 0), num("67"), []string{"orders.day in 2025-01-01..2025-03-31"}, 4)
	explainAgreesWithRun(t, []string{timeModel}, "ytd", []string{"orders.month"}, nil, map[string]string{"orders.month": "2025-03-01"})

	// growth = revenue / rev_ly - 1 in February 2025: revenue is order 3
	// (20); a year back, order 1 of the leap day 2024-02-29 lands on
	// 2025-02-28 (100): 20 / 100 - 1 = -0.8.
	tree = explainTree(t, timeModel, "-m", "growth", "-b", "orders.month", "--cell", "orders.month=2025-02-01")
	expectPart(t, part(t, tree), num("-0.8"), []string{"orders.month = 2025-02-01"}, -1)
	expectPart(t, part(t, tree, 1, 0), num("100"), []string{"orders.month = 2025-02-01, on the rows 1 year back (their orders.day, 1 year later, meets it)"}, 1)
	explainAgreesWithRun(t, []string{timeModel}, "growth", []string{"orders.month"}, nil, map[string]string{"orders.month": "2025-02-01"})
	// A subtotal: shop a over 2025 (orders 2 and 3), the month rolled up.
	explainAgreesWithRun(t, []string{timeModel}, "last3", []string{"orders.shop", "orders.month"}, []string{"orders.year = 2025"}, map[string]string{"orders.shop": "a"})
}

// TestExplainTableFormat checks the whole tree as people read it: the
// narrowing and the edit on the way to each part, rows, additivity, the
// cells in words, and why the narrowed part is NULL.
func TestExplainTableFormat(t *testing.T) {
	t.Parallel()
	var out, errb bytes.Buffer
	code := Main([]string{"explain", shopModel, editsModel, "-m", "north_share", "-b", "stores.region", "--cell", "stores.region=South"},
		strings.NewReader(""), &out, &errb)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	want := `north_share in the cell stores.region = 'South'

north_share = (revenue where stores.region = 'North') / revenue[drop stores.region]  →  NULL
│     float; iterates over sales
│     not additive: re-evaluated in every cell, never summed
│     cell: stores.region = 'South'
├─ revenue = sum(sales.price * sales.qty)  →  NULL
│        narrowed: where stores.region = 'North'
│        decimal; iterates over sales: 0 of its 6 rows in the cell
│        additive: a subtotal equals the sum of its rows
│        cell: stores.region = 'South', stores.region = 'North'
│        no row of sales meets every constraint of this cell: the sum of no rows
└─ revenue = sum(sales.price * sales.qty)  →  60
         edited: [drop stores.region]
         decimal; iterates over sales: 6 of its 6 rows in the cell
         additive: a subtotal equals the sum of its rows
         cell: every row (no constraint)
`
	if out.String() != want {
		t.Errorf("got:\n%s\nwant:\n%s", out.String(), want)
	}
}

// TestExplainReadsDataDirAndParquet reads the shop from --data, its sales
// as a Parquet file the engine reads in place: the rows explain holds come
// from the engine, so the values are those of the CSV files (margin_rate
// in North 0.52, as in TestExplainRatioByHand).
func TestExplainReadsDataDirAndParquet(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	db, err := sql.Open("duckdb", "")
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	if _, err := db.Exec(`COPY (SELECT * FROM read_csv('../../testdata/exec/sales.csv', all_varchar = true)) TO '` +
		filepath.Join(dir, "sales.parquet") + `' (FORMAT parquet)`); err != nil {
		t.Fatal(err)
	}
	for _, name := range []string{"stores", "districts", "repairs"} {
		b, err := os.ReadFile("../../testdata/exec/" + name + ".csv")
		if err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(dir, name+".csv"), b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	tree := explainTree(t, shopModel, "--data", dir, "-m", "margin_rate", "--cell", "stores.region=North")
	expectPart(t, part(t, tree), num("0.52"), []string{"stores.region = 'North'"}, -1)
	expectPart(t, part(t, tree, 0), num("25"), []string{"stores.region = 'North'"}, 3)
	explainAgreesWithRun(t, []string{shopModel}, "margin_rate", []string{"stores.region"}, nil,
		map[string]string{"stores.region": "North"}, "--data", dir)
}

func TestExplainGrandTotalByDefault(t *testing.T) {
	t.Parallel()
	tree := explainTree(t, shopModel, "-m", "revenue", "-b", "stores.region")
	if tree["default_cell"] != true || fmt.Sprint(tree["rolled_up"]) != "[stores.region]" {
		t.Errorf("without --cell the cell is the grand total: %v", tree)
	}
	// All six lines: 10 + 10 + 5 + 12 + 3 + 20.
	expectPart(t, part(t, tree), num("60"), []string{}, 6)
	var out, errb bytes.Buffer
	if code := Main([]string{"explain", shopModel, "-m", "revenue", "-b", "stores.region"}, strings.NewReader(""), &out, &errb); code != 0 {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	if !strings.HasPrefix(out.String(), "revenue in the grand total cell (no --cell given") {
		t.Errorf("the table format should say the cell is the grand total:\n%s", out.String())
	}
	if !strings.Contains(out.String(), "iterates over sales: 6 of its 6 rows in the cell") {
		t.Errorf("the table format should count the rows:\n%s", out.String())
	}
}

func TestExplainCellErrors(t *testing.T) {
	t.Parallel()
	for _, c := range []struct {
		args []string
		code int
		want string
	}{
		{[]string{"-m", "revenue", "-b", "stores.region", "--cell", "stores.region='East'"}, 1,
			`the report of revenue has no cell stores.region='East'; its group columns are stores.region; cells that exist, by stores.region: --cell "stores.region='North'", "stores.region='South'", "stores.region=null"`},
		{[]string{"-m", "revenue", "--cell", "stores.region"}, 2, `--cell: "stores.region" is not TABLE.COLUMN=VALUE; write --cell "stores.region='North',sales.item='rose'"`},
		{[]string{"-m", "revenue", "-b", "stores.region", "--cell", "sales.item=rose"}, 2, "sales.item is not a group column of the query; group by it with -b sales.item, or name one of: stores.region"},
		{[]string{"-m", "revenue", "--cell", "stores.id=one"}, 2, `stores.id is integer: "one" is not a number`},
		{[]string{"-m", "revenue", "--cell", "stores.region='North"}, 2, "has an unclosed '"},
		{[]string{"-m", "revenue,cost"}, 2, "explain takes one measure (-m M), not 2"},
		{[]string{"-m", "revenue", "--format", "csv"}, 2, `--format takes table or json, not "csv"`},
		{[]string{"-m", "revenu"}, 1, "unknown measure 'revenu'"},
	} {
		var out, errb bytes.Buffer
		code := Main(append([]string{"explain", shopModel}, c.args...), strings.NewReader(""), &out, &errb)
		if code != c.code || !strings.Contains(errb.String(), c.want) {
			t.Errorf("%v: exit %d, want %d with %q:\n%s", c.args, code, c.code, c.want, errb.String())
		}
	}
}

// TestExplainMatchesRunOnRandomCases explains cells of the random cases
// of the differential tests (casegen): for a measure of each case's first
// query, a few cells of the report (detail rows and totals) drawn from
// what run prints, and checks that explain's root value is run's.
func TestExplainMatchesRunOnRandomCases(t *testing.T) {
	t.Parallel()
	explainRandom(t, 15, nil)
}

// TestExplainMatchesRunOnRandomCasesLive does the same with the rows
// read from each live engine (--dsn), each case loaded there.
func TestExplainMatchesRunOnRandomCasesLive(t *testing.T) {
	t.Parallel()
	for _, name := range livetest.Names {
		t.Run(name, func(t *testing.T) {
			t.Parallel() // each engine holds the cases in a database of its own
			e := livetest.Empty(t, name, "explain_"+name)
			explainRandom(t, 10, e)
		})
	}
}

// explainRandom checks n random cases on DuckDB, or on live when set.
func explainRandom(t *testing.T, n int, live *livetest.Engine) {
	compared := 0
	checkCases(t, n, func(rt *rapid.T) {
		c := casegen.Generator(casegen.DefaultOptions).Draw(rt, "case")
		dir, err := os.MkdirTemp(t.TempDir(), "case")
		if err != nil {
			rt.Fatal(err)
		}
		if err := c.Write(dir); err != nil {
			rt.Fatal(err)
		}
		model := filepath.Join(dir, casegen.ModelFile)
		q := c.Queries[0]
		measure := rapid.SampledFrom(q.Measures).Draw(rt, "measure")
		// The query's measure, groups and filters; its own totals, order
		// and limit do not matter here.
		q.Measures, q.Totals, q.Order, q.Limit = []string{measure}, "", "", 0
		args := append([]string{model}, q.Args()...)
		approx := false
		if live != nil {
			m, err := diffLoadModel(model)
			if err != nil {
				rt.Fatal(err)
			}
			if err := engine.LoadInto(context.Background(), live.Live, m, ""); err != nil {
				rt.Fatalf("%v\n\nthe case:\n%s", err, c)
			}
			args = append(args, "--dsn", live.DSN)
			approx = live.Name == "sqlite" // decimals are floats there
		}
		rows, _, code := diffRunJSON(append(append([]string{"run"}, args...), "--totals", "all", "--format", "json"))
		if code != 0 {
			return // a query the SQL path or the engine refuses: nothing to compare
		}
		for i := 0; i < 3 && len(rows) > 0; i++ {
			r := rows[rapid.IntRange(0, len(rows)-1).Draw(rt, "row")]
			ex := append([]string{"explain"}, args...)
			if cell := cellOfRow(r, q.By); cell != "" {
				ex = append(ex, "--cell", cell)
			}
			tree, stderr, code := explainJSON(ex)
			if code != 0 {
				rt.Fatalf("%s: exit %d\n%s\n\nthe case:\n%s", strings.Join(ex, " "), code, stderr, c)
			}
			root := tree["explain"].(map[string]any)
			got := root["value"]
			if !diffSameJSON(got, r[measure], approx || root["type"] == "float") {
				rt.Fatalf("%s: explain gives %v, run %v\n\nthe case:\n%s", strings.Join(ex, " "), got, r[measure], c)
			}
			compared++
		}
	})
	if compared == 0 {
		t.Errorf("no cell was compared")
	}
}

// TestExplainLive reads the rows from each live engine (--dsn) and checks
// the root values against run --dsn there.
func TestExplainLive(t *testing.T) {
	t.Parallel()
	for _, name := range livetest.Names {
		t.Run(name, func(t *testing.T) {
			shop := liveEngine(t, name, shopModel)
			explainAgreesWithRun(t, []string{shopModel}, "margin_rate", []string{"stores.region"}, nil,
				map[string]string{"stores.region": "'North'"}, "--dsn", shop.DSN)
			explainAgreesWithRun(t, []string{shopModel}, "items", []string{"stores.region", "sales.item"}, nil,
				map[string]string{"sales.item": "rose"}, "--dsn", shop.DSN)
			timed := liveEngine(t, name, timeModel)
			explainAgreesWithRun(t, []string{timeModel}, "growth", []string{"orders.month"}, nil,
				map[string]string{"orders.month": "2025-02-01"}, "--dsn", timed.DSN)
		})
	}
}
