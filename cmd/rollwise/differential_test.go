package main

import (
	"bytes"
	"context"
	"database/sql"
	"encoding/json"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"testing"

	"github.com/shopspring/decimal"
	"pgregory.net/rapid"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/engine"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/livetest"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/pipeline"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/report"
	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
	"github.com/rollwise/rollwise/planner/reference"
	"github.com/rollwise/rollwise/planner/reference/casegen"
)

// The differential tests: random models, data and queries (casegen) run
// through the SQL path of `rollwise run --format json` (resolve, plan,
// render for DuckDB, run on the embedded engine, write the JSON report;
// one engine per case, for speed) and through the reference evaluator,
// which computes every value cell by cell without SQL. The rows must be equal:
// the same rows in the same order, group values and exact measures
// (integer, decimal) equal exactly, float measures within diffFloatTolerance.
//
// `go test ./cmd/rollwise` runs 60 cases of each differential property
// and 40 of each metamorphic one (see checkCases); a long campaign:
//
//	go test ./cmd/rollwise -run 'TestDifferential' -rapid.checks=20000 -timeout=0 -v
//
// On a failure rapid shrinks the case; the minimal model, CSV files and
// query are printed (and written to $ROLLWISE_DIFF_SAVE/<n>/ when that is
// set), ready to be kept under testdata/differential as a regression
// case.

// diffFloatTolerance is the relative tolerance for float measures (averages,
// ratios, medians, statistics), with an absolute floor at magnitude 1:
// |got - want| <= diffFloatTolerance * max(1, |got|, |want|).
const diffFloatTolerance = 1e-9

// diffStats counts what the differential properties did: refused counts
// the queries a live engine's dialect refuses (a variance on SQLite...),
// each with the clean error that names the engine and the construct.
type diffStats struct {
	compared, skipped, refused, known, failed atomic.Int64
	// floatSteps counts the SQLite differences floatStep excuses.
	floatSteps atomic.Int64
	// overflowed counts the queries DuckDB refuses with an out-of-range
	// error where the reference's values are huge (a product of products
	// past DECIMAL(38)'s digits): an error, never a wrong number.
	overflowed atomic.Int64
}

// diffKnownBugs are the planner bugs the differential tests found, each
// kept as a minimal regression case under testdata/differential/NAME. A
// failing query that shows a known bug's signature (hits looks at the
// case, the query and the failure message) is counted, not failed, so
// that a campaign goes on finding other bugs. Delete an entry once its
// regression case passes.
var diffKnownBugs = []struct {
	name string
	hits func(c *casegen.Case, q casegen.Query, msg string) bool
}{}

// diffKnownBug names the known bug a failing query shows, or "".
func diffKnownBug(c *casegen.Case, q casegen.Query, msg string) string {
	for _, b := range diffKnownBugs {
		if b.hits(c, q, msg) {
			return b.name
		}
	}
	return ""
}

// diffUserChecks reports whether the number of cases was given
// (-rapid.checks or RAPID_CHECKS); decided once, before checkCases sets
// the flag itself.
var diffUserChecks = sync.OnceValue(func() bool {
	given := false
	flag.Visit(func(f *flag.Flag) { given = given || f.Name == "rapid.checks" })
	_, env := os.LookupEnv("RAPID_CHECKS")
	return given || env
})

// checkCases runs the property on n random cases unless the number was
// given: the default budget of `go test ./...` (a few hundred cases in
// all; -short divides by five). rapid reads -rapid.checks once, when a
// check starts, and the properties run in parallel: the flag is held
// from setting it until the property's first case, so each reads its own.
func checkCases(t *testing.T, n int, prop func(*rapid.T)) {
	t.Helper()
	rapidBudget.Lock()
	var once sync.Once
	release := func() { once.Do(rapidBudget.Unlock) }
	defer release()
	if !diffUserChecks() {
		flag.Set("rapid.checks", fmt.Sprint(n))
	}
	rapid.Check(t, func(rt *rapid.T) {
		release()
		prop(rt)
	})
}

// rapidBudget guards -rapid.checks between checkCases setting it and
// rapid reading it.
var rapidBudget sync.Mutex

// TestDifferentialCore compares measures without cell edits or
// per-grain aggregates.
func TestDifferentialCore(t *testing.T) {
	t.Parallel()
	o := casegen.DefaultOptions
	o.Advanced = false
	diffRun(t, 40, o, nil)
}

// TestDifferentialEditsAndPerGrain compares measures over every
// construct, cell edits and per-grain aggregates included.
func TestDifferentialEditsAndPerGrain(t *testing.T) {
	t.Parallel()
	diffRun(t, 50, casegen.DefaultOptions, nil)
}

// openCase writes a drawn case (c, or a case that embeds it: w) into a
// folder of t's and opens it on DuckDB; the caller closes it.
func openCase(t *testing.T, rt *rapid.T, w interface{ Write(string) error }, c *casegen.Case) *diffOpened {
	dir, err := os.MkdirTemp(t.TempDir(), "case")
	if err != nil {
		rt.Fatal(err)
	}
	if err := w.Write(dir); err != nil {
		rt.Fatal(err)
	}
	dc, err := diffOpen(dir)
	if err != nil {
		rt.Fatalf("%v\n\nthe case:\n%s", err, c)
	}
	return dc
}

// diffRun checks the property on n cases on DuckDB, or on the live engine when live
// is set (each case's tables are loaded into its database).
func diffRun(t *testing.T, n int, o casegen.Options, live *livetest.Engine) *diffStats {
	var st diffStats
	checkCases(t, n, func(rt *rapid.T) {
		c := casegen.Generator(o).Draw(rt, "case")
		dc := openCase(t, rt, c, c)
		defer dc.close()
		var err error
		tg := dc.duckdb()
		if live != nil {
			if tg, err = dc.loadInto(live); err != nil {
				rt.Fatalf("%v\n\nthe case:\n%s", err, c)
			}
		}
		viaMain := live == nil
		for _, q := range c.Queries {
			before := st.compared.Load()
			msg := dc.compare(tg, q, &st)
			if msg == "" && viaMain && len(q.Filters) > 1 && st.compared.Load() > before {
				// Once per case, the command line itself: its -w flags.
				viaMain = false
				msg = dc.viaMain(q)
			}
			if msg != "" {
				if bug := diffKnownBug(c, q, msg); bug != "" {
					st.known.Add(1)
					continue
				}
				st.failed.Add(1)
				diffSave(t.Name(), c, q)
				rt.Fatalf("%s\nquery: %s\n\nthe case:\n%s", msg, q.Command(casegen.ModelFile), c)
			}
		}
	})
	t.Logf("queries compared: %d; failing with a known bug: %d; skipped: %d (the planner reports not-supported); refused by the dialect: %d; float steps excused (SQLite): %d; out of DECIMAL(38)'s range (DuckDB): %d",
		st.compared.Load(), st.known.Load(), st.skipped.Load(), st.refused.Load(), st.floatSteps.Load(), st.overflowed.Load())
	if st.compared.Load() == 0 {
		t.Errorf("no query was compared")
	}
	return &st
}

// diffSave writes a failing case to $ROLLWISE_DIFF_SAVE/<test name>/
// (with the query in query.txt), when that is set. Each failure
// overwrites the last, so what remains is the case rapid shrank to.
func diffSave(name string, c *casegen.Case, q casegen.Query) {
	root := os.Getenv("ROLLWISE_DIFF_SAVE")
	if root == "" {
		return
	}
	out := filepath.Join(root, name)
	os.RemoveAll(out)
	if os.MkdirAll(out, 0o755) == nil && c.Write(out) == nil {
		os.WriteFile(filepath.Join(out, "query.txt"), []byte(q.Command(casegen.ModelFile)+"\n"), 0o644)
	}
}

// diffOpened is a written case opened both ways: the model resolved, its
// data in the reference evaluator and in an embedded DuckDB.
type diffOpened struct {
	dir string
	m   *model.Model
	ref *reference.Data
	db  *sql.DB
	ctx context.Context
}

// diffTarget is an engine the SQL path runs on: its dialect, and how a
// statement runs there (types are the result columns' logical types).
type diffTarget struct {
	name string
	d    *dialects.Dialect
	run  func(text string, types []model.Type) (*engine.Result, error)
	// floats says that decimals are computed as 64-bit floats (SQLite).
	floats bool
}

// diffOpen loads the case written in dir.
func diffOpen(dir string) (*diffOpened, error) {
	m, err := diffLoadModel(filepath.Join(dir, casegen.ModelFile))
	if err != nil {
		return nil, fmt.Errorf("the model does not load: %w", err)
	}
	ref, err := reference.Load(m, "")
	if err != nil {
		return nil, fmt.Errorf("the reference evaluator cannot load the data: %w", err)
	}
	ctx := context.Background()
	db, err := engine.OpenDuckDB(ctx, m, "", engine.Options{})
	if err != nil {
		return nil, fmt.Errorf("the engine cannot load the data: %w", err)
	}
	return &diffOpened{dir: dir, m: m, ref: ref, db: db, ctx: ctx}, nil
}

func (dc *diffOpened) close() { dc.db.Close() }

// duckdb is the embedded DuckDB holding the case, as `rollwise run` uses it.
func (dc *diffOpened) duckdb() diffTarget {
	d, _ := dialects.Get("duckdb")
	return diffTarget{name: "duckdb", d: d, run: func(text string, _ []model.Type) (*engine.Result, error) {
		return engine.Query(dc.ctx, dc.db, text)
	}}
}

// compare runs one query both ways on tg; it returns "" when they agree
// (or the planner says the query is not supported yet, or a live
// engine's dialect cleanly refuses a construct the engine lacks) and
// otherwise what differs. The SQL path is the one `rollwise run` takes:
// plan, render for the engine's dialect, run, write the rows as the JSON
// report.
func (dc *diffOpened) compare(tg diffTarget, q casegen.Query, st *diffStats) string {
	pq, diags := dc.m.NewQuery(model.Request{Measures: q.Measures, By: q.By, Where: q.Where,
		Totals: q.Totals, Order: q.Order, Limit: q.Limit})
	if diags.HasErrors() {
		return "the generated query does not resolve: " + diags.Error()
	}
	// The planner first: a construct it refuses as not supported may be
	// one the reference refuses too (two backs along two columns).
	plan, pd := plan.NewPlan(pq)
	if pd.HasErrors() {
		for _, d := range pd.Errors() {
			if d.Code == "not-supported" {
				st.skipped.Add(1)
				if testing.Verbose() {
					fmt.Println("skipped (not-supported):", d.Message)
				}
				return ""
			}
		}
		return "the planner rejects the query: " + pd.Error()
	}
	res, err := dc.ref.Run(pq)
	if err != nil {
		return "the reference evaluator fails: " + err.Error()
	}
	want := res.JSON()
	text, err := dialects.Render(plan, tg.d)
	if err != nil {
		if diffRefusal(tg, err) {
			st.refused.Add(1)
			return ""
		}
		return fmt.Sprintf("the %s dialect cannot render the plan: %v", tg.name, err)
	}
	got, err := dc.runSQL(tg, pq, plan, text)
	if err != nil {
		if engine.Overflowed(err) && huge(want) {
			st.overflowed.Add(1)
			return ""
		}
		return err.Error() + "\n\nthe SQL:\n" + text
	}
	st.compared.Add(1)
	if diff := diffRows(pq, got, want, tg.floats); diff != "" {
		if tg.floats && floatStep(pq) {
			st.floatSteps.Add(1)
			return ""
		}
		return fmt.Sprintf("on %s:\n%s\nthe SQL:\n%s", tg.name, diff, text)
	}
	return ""
}

// huge reports whether a value of the rows is 10^20 or more in magnitude:
// DuckDB's widest decimal holds 38 digits, and the products of such
// values (and the decimal places the engine keeps) go past them.
func huge(rows []map[string]any) bool {
	for _, r := range rows {
		for _, v := range r {
			if f, err := strconv.ParseFloat(fmt.Sprint(v), 64); err == nil && math.Abs(f) >= 1e20 {
				return true
			}
		}
	}
	return false
}

// runSQL runs the SQL on tg and shapes its rows as `rollwise run --format
// json` does (resultTypes, shape and the JSON report of run.go).
func (dc *diffOpened) runSQL(tg diffTarget, q *model.Query, plan *plan.Plan, text string) ([]map[string]any, error) {
	c := &pipeline.Compiled{Model: dc.m, Query: q, Plan: plan, SQL: text}
	res, err := tg.run(text, resultTypes(c))
	if err != nil {
		return nil, fmt.Errorf("%s rejects the query: %w", tg.name, err)
	}
	t, err := shape(c, res)
	if err != nil {
		return nil, err
	}
	var out bytes.Buffer
	if err := report.Write(&out, t, report.Options{Format: report.FormatJSON}); err != nil {
		return nil, err
	}
	dec := json.NewDecoder(&out)
	dec.UseNumber()
	var rows []map[string]any
	if err := dec.Decode(&rows); err != nil {
		return nil, fmt.Errorf("bad JSON: %v", err)
	}
	return rows, nil
}

// diffLoadModel parses and resolves one model file.
func diffLoadModel(path string) (*model.Model, error) {
	m, diags, err := pipeline.Load([]string{path})
	if diags.HasErrors() {
		return nil, diags.Err()
	}
	if err != nil {
		return nil, err
	}
	return m.Model, nil
}

// diffRunJSON runs the CLI in-process and decodes its JSON rows.
func diffRunJSON(args []string) ([]map[string]any, string, int) {
	var out, errb bytes.Buffer
	code := Main(args, strings.NewReader(""), &out, &errb)
	if code != 0 {
		return nil, errb.String(), code
	}
	dec := json.NewDecoder(&out)
	dec.UseNumber()
	var rows []map[string]any
	if err := dec.Decode(&rows); err != nil {
		return nil, fmt.Sprintf("bad JSON: %v\n%s", err, out.String()), 3
	}
	return rows, errb.String(), 0
}

// diffRows compares the rows of run (got) with the reference's (want);
// it returns "" when they agree. floats compares decimals as floats too
// (see diffTarget).
func diffRows(q *model.Query, got, want []map[string]any, floats bool) string {
	var b strings.Builder
	if len(got) != len(want) {
		fmt.Fprintf(&b, "run gives %d rows, the reference %d\n", len(got), len(want))
	}
	for i := 0; i < len(got) || i < len(want); i++ {
		var g, w map[string]any
		if i < len(got) {
			g = got[i]
		}
		if i < len(want) {
			w = want[i]
		}
		if g == nil || w == nil || !diffSameRow(q, g, w, floats) {
			fmt.Fprintf(&b, "row %d:\n  run:       %s\n  reference: %s\n", i, diffRowText(q, g), diffRowText(q, w))
		}
	}
	return b.String()
}

// diffSameRow compares two rows: floats within diffFloatTolerance, and,
// when floats is set, decimals too. SQLite has no exact decimal type
// (decimals are REAL columns, and `run` prints a caution): each value read
// is off by half an ulp (a relative 1.1e-16), and the generated data's
// sums (of at most ~120 values) and products (of at most three factors)
// stay orders of magnitude below a relative 1e-9, the floor at 1 covering
// sums that cancel to near zero. The errors the SQL can make there move a
// value by at least one input value, a cent (a row lost or counted twice,
// a wrong branch or group); the one source of smaller errors on the exact
// engines, a digit lost to a DECIMAL's scale, does not exist on SQLite.
func diffSameRow(q *model.Query, g, w map[string]any, floats bool) bool {
	for i, name := range q.GroupNames {
		if !diffSameJSON(g[name], w[name], floats && q.Groups[i].Type == model.TypeDecimal) {
			return false
		}
	}
	for _, m := range q.Measures {
		if !diffSameJSON(g[m.Name], w[m.Name], m.Type == model.TypeFloat || floats && m.Type == model.TypeDecimal) {
			return false
		}
	}
	return fmt.Sprint(g[reference.RolledUpKey]) == fmt.Sprint(w[reference.RolledUpKey])
}

// diffSameJSON compares two JSON values: numbers exactly, or within the
// float tolerance when approx is set.
func diffSameJSON(a, b any, approx bool) bool {
	x, xok := a.(json.Number)
	y, yok := b.(json.Number)
	if !xok || !yok {
		return fmt.Sprintf("%T %v", a, a) == fmt.Sprintf("%T %v", b, b)
	}
	if approx {
		f, err1 := x.Float64()
		h, err2 := y.Float64()
		return err1 == nil && err2 == nil && math.Abs(f-h) <= diffFloatTolerance*math.Max(1, math.Max(math.Abs(f), math.Abs(h)))
	}
	p, err1 := decimal.NewFromString(x.String())
	r, err2 := decimal.NewFromString(y.String())
	return err1 == nil && err2 == nil && p.Equal(r)
}

func diffRowText(q *model.Query, r map[string]any) string {
	if r == nil {
		return "(none)"
	}
	var parts []string
	for _, name := range q.GroupNames {
		parts = append(parts, fmt.Sprintf("%s=%v", name, r[name]))
	}
	for _, m := range q.Measures {
		parts = append(parts, fmt.Sprintf("%s=%v", m.Name, r[m.Name]))
	}
	parts = append(parts, fmt.Sprintf("rolled_up=%v", r[reference.RolledUpKey]))
	return strings.Join(parts, " ")
}
