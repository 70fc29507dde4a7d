package dialects

import (
	"database/sql"
	"fmt"
	"sort"
	"strings"
	"testing"

	_ "github.com/duckdb/duckdb-go/v2" // the reference engine
	_ "modernc.org/sqlite"             // an engine without GROUPING SETS

	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
)

func mustGet(t *testing.T, name string) *Dialect {
	t.Helper()
	d, err := Get(name)
	if err != nil {
		t.Fatal(err)
	}
	return d
}

func TestGroupingSetsSQLText(t *testing.T) {
	duck, my := mustGet(t, "duckdb"), mustGet(t, "mysql")
	keys := []string{`"a"`, `"b"`}
	aggs := []string{`sum("v") AS "s"`}
	sets := plan.GroupingSets(model.TotalsRollup, 2)
	want := `  SELECT
    "a",
    "b",
    GROUPING("a", "b") AS "grouping_id",
    sum("v") AS "s"
  FROM "rows"
  GROUP BY GROUPING SETS (("a", "b"), ("a"), ())`
	if got := GroupingSetsSQL(duck, keys, sets, aggs, `"rows"`); got != want {
		t.Errorf("duckdb:\n%s\nwant:\n%s", got, want)
	}
	mkeys := []string{"`a`", "`b`"}
	want = "  SELECT\n    `a`,\n    `b`,\n    0 AS `grouping_id`,\n    sum(`v`) AS `s`\n  FROM `rows`\n  GROUP BY `a`, `b`\n" +
		"  UNION ALL\n" +
		"  SELECT\n    `a`,\n    NULL AS `b`,\n    1 AS `grouping_id`,\n    sum(`v`) AS `s`\n  FROM `rows`\n  GROUP BY `a`\n" +
		"  UNION ALL\n" +
		"  SELECT\n    NULL AS `a`,\n    NULL AS `b`,\n    3 AS `grouping_id`,\n    sum(`v`) AS `s`\n  FROM `rows`"
	if got := GroupingSetsSQL(my, mkeys, sets, []string{"sum(`v`) AS `s`"}, "`rows`"); got != want {
		t.Errorf("mysql:\n%s\nwant:\n%s", got, want)
	}
	// One set (no totals), and no keys at all: a plain GROUP BY, or none.
	if got := GroupingSetsSQL(my, mkeys, []uint64{0}, nil, "`r`"); got != "  SELECT\n    `a`,\n    `b`,\n    0 AS `grouping_id`\n  FROM `r`\n  GROUP BY `a`, `b`" {
		t.Errorf("one set: %q", got)
	}
	if got := GroupingSetsSQL(duck, nil, []uint64{0}, aggs, `"r"`); got != "  SELECT\n    0 AS \"grouping_id\",\n    sum(\"v\") AS \"s\"\n  FROM \"r\"" {
		t.Errorf("no keys: %q", got)
	}
	// A relation computed in one rolled-up set only carries that set's id.
	if got := GroupingSetsSQL(duck, nil, []uint64{3}, aggs, `"r"`); !strings.Contains(got, "3 AS \"grouping_id\"") {
		t.Errorf("one rolled-up set: %q", got)
	}
	// No keys and no aggregates: one cell, not one row per row of "r".
	if got := GroupingSetsSQL(duck, nil, []uint64{0}, nil, `"r"`); got != "  SELECT\n    0 AS \"grouping_id\"" {
		t.Errorf("no keys, no aggregates: %q", got)
	}
}

// The UNION ALL form gives exactly the rows of GROUPING SETS: checked by
// running both on DuckDB and the rewrite on SQLite (which has no grouping
// sets), for every totals mode, over data with NULL keys and an empty
// filter.
func TestUnionGroupingSetsSameRows(t *testing.T) {
	duckDB, err := sql.Open("duckdb", "")
	if err != nil {
		t.Fatal(err)
	}
	defer duckDB.Close()
	lite, err := sql.Open("sqlite", ":memory:")
	if err != nil {
		t.Fatal(err)
	}
	defer lite.Close()
	lite.SetMaxOpenConns(1)
	rows := [][]any{{"x", "p", "c", 1}, {"x", "q", "c", 2}, {"y", "p", nil, 4}, {nil, "p", "d", 8}, {"y", nil, "d", 16}, {"x", "p", "d", 32}}
	for _, db := range []*sql.DB{duckDB, lite} {
		mustExec(t, db, `CREATE TABLE t (a TEXT, b TEXT, c TEXT, v INTEGER)`)
		for _, r := range rows {
			mustExec(t, db, `INSERT INTO t VALUES (?, ?, ?, ?)`, r...)
		}
	}
	duck, sqliteD := mustGet(t, "duckdb"), mustGet(t, "sqlite")
	for _, mode := range []model.TotalsMode{model.TotalsGrand, model.TotalsRollup, model.TotalsAll} {
		for _, where := range []string{"", " WHERE v > 100"} {
			for _, n := range []int{1, 2, 3} {
				names := []string{"a", "b", "c"}[:n]
				sets := plan.GroupingSets(mode, n)
				query := func(d *Dialect, union, noAggs bool) string {
					var keys []string
					for _, k := range names {
						keys = append(keys, d.Ident(k))
					}
					aggs := []string{"sum(" + d.Ident("v") + ") AS " + d.Ident("s"), "count(*) AS " + d.Ident("n")}
					if noAggs {
						aggs = nil // the cells alone (a CTE listing the report's rows)
					}
					from := "(SELECT * FROM t" + where + ") AS " + d.Ident("r")
					if union {
						return unionGroupingSets(d, keys, sets, plainAggs(aggs), from)
					}
					return GroupingSetsSQL(d, keys, sets, aggs, from)
				}
				for _, noAggs := range []bool{false, true} {
					name := fmt.Sprintf("%s/%d keys/%q/no aggregates %v", mode, n, where, noAggs)
					q := func(d *Dialect, union bool) string { return query(d, union, noAggs) }
					want := rowSet(t, duckDB, q(duck, false))
					if got := rowSet(t, duckDB, q(duck, true)); got != want {
						t.Errorf("%s: UNION ALL on DuckDB:\n%s\nGROUPING SETS:\n%s", name, got, want)
					}
					if got := rowSet(t, lite, q(sqliteD, false)); got != want {
						t.Errorf("%s: UNION ALL on SQLite:\n%s\nGROUPING SETS on DuckDB:\n%s", name, got, want)
					}
				}
			}
		}
	}
}

func mustExec(t *testing.T, db *sql.DB, q string, args ...any) {
	t.Helper()
	if _, err := db.Exec(q, args...); err != nil {
		t.Fatalf("%s: %v", q, err)
	}
}

// rowSet runs q and returns its rows, sorted, one per line.
func rowSet(t *testing.T, db *sql.DB, q string) string {
	t.Helper()
	rs, err := db.Query(q)
	if err != nil {
		t.Fatalf("%v\n%s", err, q)
	}
	defer rs.Close()
	cols, _ := rs.Columns()
	var lines []string
	for rs.Next() {
		vals := make([]any, len(cols))
		ptrs := make([]any, len(cols))
		for i := range vals {
			ptrs[i] = &vals[i]
		}
		if err := rs.Scan(ptrs...); err != nil {
			t.Fatal(err)
		}
		var parts []string
		for _, v := range vals {
			switch x := v.(type) {
			case nil:
				parts = append(parts, "NULL")
			case []byte:
				parts = append(parts, string(x))
			default:
				parts = append(parts, fmt.Sprint(x))
			}
		}
		lines = append(lines, strings.Join(parts, "|"))
	}
	if err := rs.Err(); err != nil {
		t.Fatal(err)
	}
	sort.Strings(lines)
	return strings.Join(lines, "\n")
}

func TestFilteredAgg(t *testing.T) {
	cases := []struct {
		dialect, fn, arg, filter, want string
	}{
		{"duckdb", "sum", `"x"`, `"f"`, `sum("x") FILTER (WHERE "f")`},
		{"duckdb", "count", "", `"f"`, `count(*) FILTER (WHERE "f")`},
		{"duckdb", "sum", `"x"`, "", `sum("x")`},
		{"mysql", "sum", "`x`", "`f`", "sum(CASE WHEN `f` THEN `x` END)"},
		{"mysql", "count", "", "`f`", "count(CASE WHEN `f` THEN 1 END)"},
		{"sqlserver", "count", "", "([f] = 1)", "COUNT_BIG(CASE WHEN ([f] = 1) THEN 1 END)"},
		{"sqlserver", "avg", "[x]", "[k] IS NOT NULL", "AVG(CAST(CASE WHEN [k] IS NOT NULL THEN [x] END AS FLOAT))"},
		{"bigquery", "stddev", "`x`", "`f`", "stddev_samp(CAST(CASE WHEN `f` THEN `x` END AS FLOAT64))"},
	}
	for _, c := range cases {
		got, err := (&renderer{d: mustGet(t, c.dialect)}).filteredAgg(c.fn, false, c.arg, c.filter)
		if err != nil || got != c.want {
			t.Errorf("%s %s: %q, %v; want %q", c.dialect, c.fn, got, err, c.want)
		}
	}
	if _, err := (&renderer{d: mustGet(t, "sqlite")}).filteredAgg("median", false, "x", "f"); err == nil {
		t.Error("sqlite: a filtered median should still be refused")
	}
}

// OrderKey puts NULLs last also where the engine sorts them first: run on
// SQLite, whose ascending order puts NULL first.
func TestOrderKeyNullsLast(t *testing.T) {
	if got := OrderKey(mustGet(t, "duckdb"), `"x"`, true); strings.Join(got, ", ") != `"x" DESC NULLS LAST` {
		t.Errorf("duckdb: %v", got)
	}
	my := OrderKey(mustGet(t, "mysql"), "`x`", false)
	if strings.Join(my, ", ") != "CASE WHEN `x` IS NULL THEN 1 ELSE 0 END, `x` ASC" {
		t.Errorf("mysql: %v", my)
	}
	lite, err := sql.Open("sqlite", ":memory:")
	if err != nil {
		t.Fatal(err)
	}
	defer lite.Close()
	for _, desc := range []bool{false, true} {
		q := "SELECT group_concat(coalesce(x, 'null'), ' ') FROM (SELECT x FROM (SELECT 'b' AS x UNION ALL SELECT NULL UNION ALL SELECT 'a') ORDER BY " +
			strings.Join(OrderKey(mustGet(t, "mysql"), "x", desc), ", ") + ")"
		var got string
		if err := lite.QueryRow(q).Scan(&got); err != nil {
			t.Fatal(err)
		}
		want := map[bool]string{false: "a b null", true: "b a null"}[desc]
		if got != want {
			t.Errorf("desc=%v: %q, want %q", desc, got, want)
		}
	}
}

func TestApplyLimit(t *testing.T) {
	got, err := ApplyLimit(mustGet(t, "sqlserver"), "SELECT\n  [a]\nFROM [t]\nORDER BY [a]", 3)
	if err != nil || got != "SELECT TOP (3)\n  [a]\nFROM [t]\nORDER BY [a]" {
		t.Errorf("sqlserver: %q, %v", got, err)
	}
	if _, err := ApplyLimit(mustGet(t, "sqlserver"), "WITH x AS (SELECT 1) SELECT * FROM x", 3); err == nil {
		t.Error("sqlserver: TOP cannot be put in front of WITH")
	}
	got, err = ApplyLimit(mustGet(t, "postgres"), "SELECT 1", 3)
	if err != nil || got != "SELECT 1\nLIMIT 3" {
		t.Errorf("postgres: %q, %v", got, err)
	}
}

func TestIsPredicate(t *testing.T) {
	flag := &model.Column{Name: "flag", Type: model.TypeBoolean}
	n := &model.Column{Name: "n", Type: model.TypeInteger}
	big := &model.Column{Name: "big", Type: model.TypeBoolean,
		Derived: &model.BinOp{Op: ">", L: &model.ColRef{Col: n}, R: &model.Lit{T: model.TypeInteger, Text: "1"}, T: model.TypeBoolean}}
	cases := []struct {
		e    model.Expr
		want bool
	}{
		{&model.ColRef{Col: flag}, false},
		{&model.ColRef{Col: big}, true},
		{&model.Lit{T: model.TypeBoolean, Text: "true"}, true},
		{&model.Lit{T: model.TypeInteger, Text: "1"}, false},
		{&model.BinOp{Op: "and", L: &model.ColRef{Col: flag}, R: &model.ColRef{Col: flag}, T: model.TypeBoolean}, true},
		{&model.BinOp{Op: "+", L: &model.ColRef{Col: n}, R: &model.ColRef{Col: n}, T: model.TypeInteger}, false},
		{&model.UnOp{Op: "not", X: &model.ColRef{Col: flag}}, true},
		{&model.UnOp{Op: "-", X: &model.ColRef{Col: n}}, false},
		{&model.IsNullExpr{X: &model.ColRef{Col: n}}, true},
		{&model.InExpr{X: &model.ColRef{Col: n}}, true},
		{&model.CaseExpr{T: model.TypeBoolean}, false},
	}
	for i, c := range cases {
		if got := IsPredicate(c.e); got != c.want {
			t.Errorf("case %d (%T): %v, want %v", i, c.e, got, c.want)
		}
	}
}
