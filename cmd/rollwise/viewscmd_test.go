package main

import (
	"bytes"
	"context"
	"database/sql"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/demo"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/engine"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/views"
	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/planner/model"
)

// The views tests run the generated DDL on DuckDB and hold every view to
// what `run` computes. testdata/views/shop.roll reads the rows of
// testdata/exec (see exec_test.go); its derived columns follow links,
// one of which finds no row (sales line 6, store 9) and one of which goes
// two links away (sales -> stores -> districts).

const viewsModel = "../../testdata/views/shop.roll"

// viewsCase is a model to publish.
type viewsCase struct {
	name   string
	models []string
}

func viewsCases(t *testing.T) []viewsCase {
	t.Helper()
	dir := t.TempDir()
	if err := demo.WriteFiles(dir); err != nil {
		t.Fatal(err)
	}
	return []viewsCase{
		{"shop", []string{viewsModel}},
		{"garden", []string{filepath.Join(dir, demo.ModelFile), filepath.Join(dir, demo.EditsFile)}},
	}
}

// published is a model whose views were created on a DuckDB holding its
// data.
type published struct {
	model *model.Model
	set   *views.Set
	db    *sql.DB
}

// publish generates the views of a model, loads its data into DuckDB and
// runs the DDL there, twice (it must be idempotent). ddlOf, if set, names
// the engine whose view DDL to use.
func publish(t *testing.T, models []string, schema, ddlOf string) *published {
	t.Helper()
	ctx := context.Background()
	var errb bytes.Buffer
	e := &env{stdout: &bytes.Buffer{}, stderr: &errb}
	m, err := loadModel(e, models)
	if err != nil {
		t.Fatalf("%v\n%s", err, errb.String())
	}
	// With ddlOf, DuckDB's spellings with that engine's view DDL: the
	// views get that engine's DDL and still run on DuckDB.
	gd, _ := dialects.Get("duckdb")
	if ddlOf != "" {
		o, err := dialects.Get(ddlOf)
		if err != nil {
			t.Fatal(err)
		}
		gd = gd.WithViewDDL(o)
	}
	set, diags := views.Generate(m.Model, gd, views.Options{Schema: schema})
	if set == nil {
		t.Fatalf("generate: %v", diags)
	}
	db, err := engine.OpenDuckDB(ctx, m.Model, "", engine.Options{})
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { db.Close() })
	if schema != "" {
		if _, err := db.ExecContext(ctx, "CREATE SCHEMA "+gd.Ident(schema)); err != nil {
			t.Fatal(err)
		}
	}
	for i := 0; i < 2; i++ {
		if _, err := db.ExecContext(ctx, set.Script()); err != nil {
			t.Fatalf("running the DDL (time %d): %v", i+1, err)
		}
	}
	return &published{model: m.Model, set: set, db: db}
}

func (p *published) selectAll(t *testing.T, v *views.View) *engine.Result {
	t.Helper()
	d, _ := dialects.Get("duckdb")
	res, err := engine.Query(context.Background(), p.db, "SELECT * FROM "+dialects.QualifiedName(d, v.QualifiedName))
	if err != nil {
		t.Fatalf("select from %s: %v", v.Name, err)
	}
	return res
}

func (p *published) count(t *testing.T, from string) int64 {
	t.Helper()
	var n int64
	if err := p.db.QueryRow("SELECT count(*) FROM " + from).Scan(&n); err != nil {
		t.Fatalf("count %s: %v", from, err)
	}
	return n
}

// rowKey renders a row with the types of its values, so that 1 and "1"
// or 2.50 as text and as a decimal never compare equal.
func rowKey(values []any, rolledUp []string) string {
	var b strings.Builder
	for _, v := range values {
		fmt.Fprintf(&b, "%T:%v|", v, v)
	}
	return b.String() + "rolled up: " + strings.Join(rolledUp, ",")
}

// Every measure view holds exactly the rows of `run --view` for its view
// block: the same group values, measure values and total rows.
func TestMeasureViewsMatchRun(t *testing.T) {
	t.Parallel()
	// Trino's CREATE VIEW has no column list: its views rename the
	// columns in a SELECT around the query instead.
	variants := []struct{ schema, ddlOf string }{{"", ""}, {"published", ""}, {"", "trino"}}
	for _, c := range viewsCases(t) {
		for _, vr := range variants {
			t.Run(c.name+"/"+vr.schema+"/"+vr.ddlOf, func(t *testing.T) {
				p := publish(t, c.models, vr.schema, vr.ddlOf)
				if vr.ddlOf == "trino" && !strings.Contains(p.set.Script(), ") AS \"view_rows\"") {
					t.Fatal("the trino views do not rename their columns around the query")
				}
				checked := 0
				for _, v := range p.set.Views {
					if v.Kind != views.Measures {
						continue
					}
					checked++
					got := p.selectAll(t, v)
					var names []string
					for _, col := range v.Columns {
						names = append(names, col.Name)
					}
					if strings.Join(got.Columns, ",") != strings.Join(names, ",") {
						t.Errorf("%s has columns %v, the header says %v", v.Name, got.Columns, names)
					}
					e := &env{stdout: &bytes.Buffer{}, stderr: &bytes.Buffer{}}
					comp, err := compile(e, &queryOptions{models: c.models, view: v.Name, dialect: "duckdb"})
					if err != nil {
						t.Fatalf("compile %s: %v", v.Name, err)
					}
					// The query run --view compiles, on the database the views
					// were published to: it holds the same data as run's
					// own engine, loaded once rather than once per view.
					res, err := engine.Query(context.Background(), p.db, comp.SQL)
					if err != nil {
						t.Fatalf("run %s: %v", v.Name, err)
					}
					want, err := shape(comp, res)
					if err != nil {
						t.Fatalf("shape %s: %v", v.Name, err)
					}
					var gotKeys, wantKeys []string
					totals := 0
					for _, row := range got.Rows {
						mask, ok := row[len(row)-1].(int64)
						if !ok {
							t.Fatalf("%s: %s holds %T", v.Name, dialects.GroupingColumn, row[len(row)-1])
						}
						if mask != 0 {
							totals++
						}
						gotKeys = append(gotKeys, rowKey(row[:len(row)-1], comp.Query.RolledUp(uint64(mask))))
					}
					for _, row := range want.Rows {
						wantKeys = append(wantKeys, rowKey(row.Values, row.RolledUp))
					}
					sort.Strings(gotKeys)
					sort.Strings(wantKeys)
					if len(wantKeys) == 0 {
						t.Fatalf("%s: run gives no rows; the comparison would prove nothing", v.Name)
					}
					if strings.Join(gotKeys, "\n") != strings.Join(wantKeys, "\n") {
						t.Errorf("%s differs from run --view:\nview:\n%s\nrun:\n%s", v.Name,
							strings.Join(gotKeys, "\n"), strings.Join(wantKeys, "\n"))
					}
					if wantTotals := len(comp.Plan.Sets) > 1; wantTotals != (totals > 0) {
						t.Errorf("%s: %d total rows, but the block's totals are %s", v.Name, totals, comp.Query.Totals)
					}
				}
				if checked < 2 {
					t.Errorf("only %d measure views checked", checked)
				}
			})
		}
	}
}

// A row-level view has exactly the rows of its table: no row lost where a
// link finds nothing, none repeated by a join.
func TestRowViewsKeepEveryRow(t *testing.T) {
	t.Parallel()
	d, _ := dialects.Get("duckdb")
	for _, c := range viewsCases(t) {
		t.Run(c.name, func(t *testing.T) {
			p := publish(t, c.models, "", "")
			checked := 0
			for _, v := range p.set.Views {
				if v.Kind != views.RowLevel {
					continue
				}
				table := p.model.Table(strings.TrimSuffix(v.Name, views.RowViewSuffix))
				if table == nil {
					t.Fatalf("%s: no table", v.Name)
				}
				checked++
				base := p.count(t, dialects.QualifiedName(d, table.Relation))
				view := dialects.QualifiedName(d, v.QualifiedName)
				if n := p.count(t, view); n != base || n == 0 {
					t.Errorf("%s has %d rows, table %s has %d", v.Name, n, table.Name, base)
				}
				var keys []string
				for _, k := range table.Key {
					keys = append(keys, d.Ident(k.Name))
				}
				distinct := p.count(t, "(SELECT DISTINCT "+strings.Join(keys, ", ")+" FROM "+view+")")
				if distinct != base {
					t.Errorf("%s: %d distinct keys in %d rows", v.Name, distinct, base)
				}
			}
			if checked == 0 {
				t.Error("no row-level views")
			}
		})
	}
}

// The shop's derived columns, worked out by hand: line 6 points at store
// 9, which does not exist, so its region and area are NULL; line 4 (store
// 3, district 2) reaches area Coast through two links.
func TestRowViewValues(t *testing.T) {
	t.Parallel()
	p := publish(t, []string{viewsModel}, "", "")
	res, err := engine.Query(context.Background(), p.db,
		`SELECT id, line, big, region, area, where_sold FROM sales_derived ORDER BY id`)
	if err != nil {
		t.Fatal(err)
	}
	want := []string{
		"1 10 true North Hills Hills/rose",
		"2 10 true North Hills Hills/fern",
		"3 5 false North Coast Coast/rose",
		"4 12 true South Coast Coast/tulip",
		"5 3 false South Coast Coast/rose",
		"6 20 true <nil> <nil> nowhere/fern",
	}
	var got []string
	for _, r := range res.Rows {
		got = append(got, strings.TrimSpace(fmt.Sprintln(r...)))
	}
	if strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("sales_derived:\n%s\nwant\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
	var upper string
	if err := p.db.QueryRow(`SELECT area_upper FROM stores_derived WHERE id = 4`).Scan(&upper); err != nil || upper != "COAST" {
		t.Errorf("stores_derived area_upper of store 4 = %q (%v), want COAST", upper, err)
	}
}

// The types the header and the manifest state are the types DuckDB gives
// the columns. For numbers the engine picks the numeric type: a sum of
// integers is a HUGEINT, and the median of decimals a DECIMAL, where
// rollwise says float (a continuous median); so a number is any numeric
// type, and every other type must be exact.
func TestViewColumnTypes(t *testing.T) {
	t.Parallel()
	numbers := []string{"BIGINT", "HUGEINT", "INTEGER", "DECIMAL(", "DOUBLE"}
	families := map[string][]string{
		"integer": numbers, "decimal": numbers, "float": numbers,
		"text": {"VARCHAR"}, "date": {"DATE"}, "timestamp": {"TIMESTAMP"}, "boolean": {"BOOLEAN"},
	}
	for _, c := range viewsCases(t) {
		t.Run(c.name, func(t *testing.T) {
			p := publish(t, c.models, "", "")
			for _, v := range p.set.Views {
				res, err := engine.Query(context.Background(), p.db, "DESCRIBE "+v.Name)
				if err != nil {
					t.Fatal(err)
				}
				if len(res.Rows) != len(v.Columns) {
					t.Fatalf("%s: %d columns in DuckDB, %d stated", v.Name, len(res.Rows), len(v.Columns))
				}
				for i, col := range v.Columns {
					name, typ := fmt.Sprint(res.Rows[i][0]), fmt.Sprint(res.Rows[i][1])
					ok := false
					for _, prefix := range families[col.Type] {
						ok = ok || strings.HasPrefix(typ, prefix)
					}
					if name != col.Name || !ok {
						t.Errorf("%s column %d: DuckDB has %s %s, the header states %s %s", v.Name, i+1, name, typ, col.Name, col.Type)
					}
				}
			}
		})
	}
}

// views prints the files of --out end to end, in manifest order.
func TestViewsStdoutIsTheFiles(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	var out, out2, errb bytes.Buffer
	if code := Main([]string{"views", viewsModel}, nil, &out, &errb); code != 0 {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	if code := Main([]string{"views", viewsModel, "--out", dir}, nil, &out2, &errb); code != 0 {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	b, err := os.ReadFile(filepath.Join(dir, views.ManifestFile))
	if err != nil {
		t.Fatal(err)
	}
	var m views.Manifest
	if err := json.Unmarshal(b, &m); err != nil {
		t.Fatal(err)
	}
	var parts []string
	for _, v := range m.Views {
		f, err := os.ReadFile(filepath.Join(dir, v.File))
		if err != nil {
			t.Fatal(err)
		}
		parts = append(parts, string(f))
	}
	if len(parts) != 7 || strings.Join(parts, "\n") != out.String() {
		t.Errorf("stdout is not the %d files end to end:\n%s", len(parts), out.String())
	}
	if out2.Len() != 0 {
		t.Errorf("--out printed to stdout: %s", out2.String())
	}
}

// --check is a CI gate: exit 0 when the folder is up to date, exit 1 with
// the differing views on stdout when it is not.
func TestViewsCheckExitCodes(t *testing.T) {
	t.Parallel()
	src, err := os.ReadFile(viewsModel)
	if err != nil {
		t.Fatal(err)
	}
	tmp := t.TempDir()
	model, dir := filepath.Join(tmp, "shop.roll"), filepath.Join(tmp, "views")
	if err := os.WriteFile(model, src, 0o644); err != nil {
		t.Fatal(err)
	}
	cli := func(args ...string) (int, string, string) {
		var out, errb bytes.Buffer
		code := Main(append([]string{"views", model}, args...), nil, &out, &errb)
		return code, out.String(), errb.String()
	}
	if code, _, stderr := cli("--schema", "pub", "--out", dir); code != 0 || !strings.Contains(stderr, "7 views; 8 files written") {
		t.Fatalf("--out: exit %d: %s", code, stderr)
	}
	if code, out, stderr := cli("--schema", "pub", "--check", dir); code != 0 || out != "" || !strings.Contains(stderr, "up to date: 7 views") {
		t.Fatalf("--check after --out: exit %d: %s%s", code, out, stderr)
	}
	// Another schema is another set of views.
	if code, out, _ := cli("--check", dir); code != 1 || strings.Count(out, "changed ") != 7 {
		t.Errorf("--check without the schema: exit %d:\n%s", code, out)
	}
	changed := strings.Replace(string(src), "measure lines        = count(sales.id)", "measure lines        = count(sales.item)", 1)
	if err := os.WriteFile(model, []byte(changed), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, stderr := cli("--schema", "pub", "--check", dir)
	want := "changed     by_region.sql: the model now generates different DDL"
	if code != 1 || !strings.Contains(out, want) || !strings.Contains(out, "by_where_sold.sql") || strings.Count(out, "\n") != 2 ||
		!strings.Contains(stderr, "differs from the model in 2 places; run 'rollwise views "+model+" --schema pub --out "+dir+"'") {
		t.Errorf("--check after changing lines: exit %d\n%s%s", code, out, stderr)
	}
	if code, _, stderr := cli("--out", dir, "--check", dir); code != 2 || !strings.Contains(stderr, "give one of them") {
		t.Errorf("--out with --check: exit %d: %s", code, stderr)
	}
	if code, _, stderr := cli("-d", "nosuch"); code != 2 || !strings.Contains(stderr, "unknown dialect") {
		t.Errorf("-d nosuch: exit %d: %s", code, stderr)
	}
}

// docs/views.md shows the DDL the demo model generates today.
func TestDocsShowTheDemoViews(t *testing.T) {
	t.Parallel()
	model := filepath.Join(t.TempDir(), demo.ModelFile)
	if err := os.WriteFile(model, []byte(demo.Model()), 0o644); err != nil {
		t.Fatal(err)
	}
	var out, errb bytes.Buffer
	if code := Main([]string{"views", model}, nil, &out, &errb); code != 0 {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	doc, err := os.ReadFile("../../docs/views.md")
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(doc), "```sql\n"+out.String()+"```\n") {
		t.Errorf("docs/views.md does not show the demo's views as generated now; paste in the output of `rollwise views garden.roll`:\n%s", out.String())
	}
}
