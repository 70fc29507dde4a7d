package dialects

import (
	"errors"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
)

// renamed is DuckDB's spelling with another engine's view DDL, to see
// what each view DDL writes.
func renamed(name string) *Dialect {
	o, _ := Get(name)
	return duckdb.WithViewDDL(o)
}

// selfDescribed is DuckDB's spelling with a view DDL of its own.
func selfDescribed() *Dialect {
	d := *duckdb
	d.view = ViewDDL{Style: DropAndCreate, BatchEnd: "/"}
	return &d
}

const ddlModel = `
table sales at "shop.sales" {
  key id
  id        integer
  store_id  integer -> stores.id
  qty       integer
  twice     = qty * 2
  area      = districts.area
}
table stores at "shop.stores" {
  key id
  id           integer
  district_id  integer -> districts.id
}
table districts {
  key id
  id    integer
  area  text
}
table lonely {
  key id
  id  integer
}
measure units = sum(sales.qty)
view by_area = units by sales.area with totals
`

func loadDDLModel(t *testing.T, src string) *model.Model {
	t.Helper()
	f, d := grammar.Parse("m.roll", src)
	if d.HasErrors() {
		t.Fatalf("parse: %v", d)
	}
	m, d := model.Load([]*grammar.File{f})
	if d.HasErrors() {
		t.Fatalf("load: %v", d)
	}
	return m
}

func TestCreateViewStyles(t *testing.T) {
	cols := []string{"a", `b"c`}
	cases := []struct {
		d    *Dialect
		want []string
	}{
		{duckdb, []string{`CREATE OR REPLACE VIEW "s"."v" ("a", "b""c") AS` + "\nSELECT 1"}},
		{renamed("postgres"), []string{`CREATE OR REPLACE VIEW "s"."v" ("a", "b""c") AS` + "\nSELECT 1"}},
		{renamed("sqlserver"), []string{`CREATE OR ALTER VIEW "s"."v" ("a", "b""c") AS` + "\nSELECT 1"}},
		{renamed("SQLite"), []string{`DROP VIEW IF EXISTS "s"."v"`, `CREATE VIEW "s"."v" ("a", "b""c") AS` + "\nSELECT 1"}},
		{selfDescribed(), []string{`DROP VIEW IF EXISTS "s"."v"`,
			`CREATE VIEW "s"."v" AS` + "\nSELECT\n  \"x\" AS \"a\",\n  \"y\" AS \"b\"\"c\"\nFROM (\nSELECT 1\n) AS \"view_rows\""}},
		{renamed("trino"), []string{`CREATE OR REPLACE VIEW "s"."v" AS` +
			"\nSELECT\n  \"x\" AS \"a\",\n  \"y\" AS \"b\"\"c\"\nFROM (\nSELECT 1\n) AS \"view_rows\""}},
	}
	for _, c := range cases {
		got, err := CreateView(c.d, []string{"s", "v"}, cols, []string{"x", "y"}, "SELECT 1")
		if err != nil {
			t.Fatalf("%s: %v", c.d.Name(), err)
		}
		if strings.Join(got, ";\n") != strings.Join(c.want, ";\n") {
			t.Errorf("%s:\n got %q\nwant %q", c.d.Name(), got, c.want)
		}
	}
}

// Without a column list, a query whose columns already have the view's
// names is not wrapped.
func TestNoWrapWhenNamesAgree(t *testing.T) {
	got, err := CreateView(renamed("trino"), []string{"v"}, []string{"a"}, []string{"a"}, "SELECT 1 AS a")
	if err != nil || len(got) != 1 || got[0] != "CREATE OR REPLACE VIEW \"v\" AS\nSELECT 1 AS a" {
		t.Errorf("got %q (%v)", got, err)
	}
	if _, err := CreateView(duckdb, []string{"v"}, []string{"a", "b"}, []string{"a"}, "SELECT 1"); err == nil {
		t.Error("two columns named for one: no error")
	}
}

// Every dialect states how it creates views: the zero ViewDDL would be
// CREATE OR REPLACE without a column list and without ORDER BY, which no
// engine here wants.
func TestEveryDialectDescribesItsViews(t *testing.T) {
	for _, d := range all {
		if d.ViewDDL() == (ViewDDL{}) {
			t.Errorf("%s: no view DDL in its description", d.Name())
		}
	}
}

func TestScriptEndsBatches(t *testing.T) {
	got, err := Script(renamed("sqlserver"), []string{"CREATE OR ALTER VIEW a AS SELECT 1", "CREATE OR ALTER VIEW b AS SELECT 2"})
	if err != nil {
		t.Fatal(err)
	}
	want := "CREATE OR ALTER VIEW a AS SELECT 1;\nGO\nCREATE OR ALTER VIEW b AS SELECT 2;\nGO\n"
	if got != want {
		t.Errorf("got %q, want %q", got, want)
	}
	got, _ = Script(duckdb, []string{"X", "Y"})
	if got != "X;\nY;\n" {
		t.Errorf("duckdb script %q", got)
	}
}

// No line of a SQL Server literal is a batch separator, and no backslash
// stands before a line break (T-SQL would drop both); a long text is
// concatenated from an NVARCHAR(MAX) so it is not cut at 4,000
// characters. A name with a separator line is refused by Script.
func TestSQLServerLiteralsHaveNoBatchLines(t *testing.T) {
	d, _ := Get("sqlserver")
	texts := append([]string{"a\nGO\nb", "x\n  go  \ny", "\nGo 5\n", "a\\\nb", "a\r\nGO\r\nb", "GO -- x\rgo"}, hostile...)
	for _, v := range texts {
		out := d.String(v)
		if strings.ContainsAny(out, "\n\r") {
			t.Errorf("String(%q) = %q holds a line break", v, out)
		}
		if line, ok := batchSeparatorLine("SELECT\n" + out); ok {
			t.Errorf("String(%q) = %q has the batch line %q", v, out, line)
		}
	}
	if got := d.String("a\nGO\\\n"); got != `(N'a' + NCHAR(10) + N'GO\' + NCHAR(10))` {
		t.Errorf("rendering %s", got)
	}
	long := strings.Repeat("x", 4001) + "\n"
	if got := d.String(long); !strings.HasPrefix(got, "(CAST(N'' AS NVARCHAR(MAX)) + N'x") {
		t.Errorf("a long text must start from NVARCHAR(MAX): %.60s", got)
	}
	for _, line := range []string{"GO", " go ", "Go 12", "GO -- done", "\tgO\t"} {
		if !batchSeparator.MatchString(line) {
			t.Errorf("%q is a batch separator", line)
		}
	}
	for _, line := range []string{"GOTO", "N'GO'", "go x", "-- GO"} {
		if batchSeparator.MatchString(line) {
			t.Errorf("%q is no batch separator", line)
		}
	}
	_, err := Script(d, []string{"CREATE OR ALTER VIEW [a\rGO\rb] AS SELECT 1"})
	var ue *UnsupportedError
	if !errors.As(err, &ue) || !strings.Contains(err.Error(), "end a batch") {
		t.Errorf("a name holding a GO line: want a refusal, got %v", err)
	}
}

// A view keeps Render's ORDER BY where the engine allows one in a view,
// and loses exactly that clause where it does not.
func TestRenderViewOrderBy(t *testing.T) {
	m := loadDDLModel(t, ddlModel)
	p, d := plan.NewPlan(m.ViewQuery(m.Views[0]))
	if d.HasErrors() {
		t.Fatal(d)
	}
	full, err := Render(p, duckdb)
	if err != nil {
		t.Fatal(err)
	}
	kept, _, err := RenderView(p, duckdb, Options{})
	if err != nil || kept != full {
		t.Fatalf("duckdb view query differs from Render (%v):\n%s", err, kept)
	}
	cut, _, err := RenderView(p, renamed("sqlserver"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	i := strings.LastIndex(full, "\nORDER BY ")
	if i < 0 || cut != full[:i] || strings.Contains(cut, "ORDER BY") {
		t.Errorf("sqlserver view query should be Render without its ORDER BY:\n%s", cut)
	}
}

func TestRenderRowsJoinsAlongLinks(t *testing.T) {
	m := loadDDLModel(t, ddlModel)
	rq, err := RenderRows(m.Table("sales"), duckdb, Options{})
	if err != nil {
		t.Fatal(err)
	}
	want := `SELECT
  "sales"."id",
  "sales"."store_id",
  "sales"."qty",
  ("sales"."qty" * 2) AS "twice",
  "districts"."area" AS "area"
FROM "shop"."sales" AS "sales"
  LEFT JOIN "shop"."stores" AS "stores" ON "sales"."store_id" = "stores"."id"
  LEFT JOIN "districts" AS "districts" ON "stores"."district_id" = "districts"."id"`
	if rq.SQL != want {
		t.Errorf("got\n%s\nwant\n%s", rq.SQL, want)
	}
	if len(rq.Joins) != 2 || rq.Joins[0].To.Name != "stores" || rq.Joins[1].To.Name != "districts" {
		t.Errorf("joins %v, want stores then districts", rq.Joins)
	}
	if len(rq.Columns) != 5 {
		t.Errorf("%d columns, want 5", len(rq.Columns))
	}
}

// A derived column that reads a table its own cannot reach is refused.
// The resolver reports such a model already; the renderer does not rely
// on that, so the column is made by hand.
func TestRenderRowsRefusesUnreachable(t *testing.T) {
	m := loadDDLModel(t, ddlModel)
	sales := m.Table("sales")
	sales.Columns = append(sales.Columns, &model.Column{Table: sales, Name: "odd", Type: model.TypeInteger,
		Derived: &model.ColRef{Col: m.Table("lonely").Column("id")}})
	_, err := RenderRows(sales, duckdb, Options{})
	if err == nil || !strings.Contains(err.Error(), "sales.odd") || !strings.Contains(err.Error(), "lonely") {
		t.Fatalf("want an error naming sales.odd and lonely, got %v", err)
	}
}
