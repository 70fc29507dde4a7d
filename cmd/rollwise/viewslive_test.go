package main

import (
	"bytes"
	"context"
	"database/sql"
	"encoding/csv"
	"fmt"
	"math/rand/v2"
	"net/url"
	"os"
	"sort"
	"strconv"
	"strings"
	"testing"
	"time"

	gomysql "github.com/go-sql-driver/mysql"
	_ "github.com/jackc/pgx/v5/stdlib" // registers the "pgx" driver
	"github.com/shopspring/decimal"
	_ "modernc.org/sqlite" // registers the "sqlite" driver

	"github.com/rollwise/rollwise/cmd/rollwise/internal/views"
	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/planner/model"
)

// The views of testdata/views/shop.roll on live engines: SQLite always
// (embedded), PostgreSQL and MySQL/MariaDB when ROLLWISE_TEST_POSTGRES and
// ROLLWISE_TEST_MYSQL name a server (.ci/databases.sh starts throwaway
// ones). The shop's tables are loaded into a schema of their own, the
// DDL runs there twice, and every view is held to DuckDB: measure views to
// `run --view`, row-level views to their DuckDB rows. Every engine must
// publish every view block (total rows and medians included, rewritten
// where the engine lacks them), so a refusal cannot hide a failure.

// shopViewBlocks are the view blocks of testdata/views/shop.roll.
var shopViewBlocks = []string{"by_region", "by_area_all", "by_item", "by_sold_area", "by_where_sold"}

// liveDB is a live database with an empty schema for one test.
type liveDB struct {
	dialect string
	db      *sql.DB
	schema  string
	// mustPublish are the view blocks the engine must be able to publish.
	mustPublish []string
}

func liveDBs(t *testing.T) []*liveDB {
	t.Helper()
	ctx := context.Background()
	schema := fmt.Sprintf("rollwise_views_%d", rand.Uint32())
	var out []*liveDB

	db, err := sql.Open("sqlite", ":memory:")
	if err != nil {
		t.Fatal(err)
	}
	// ATTACH holds for one connection: keep to one.
	db.SetMaxOpenConns(1)
	t.Cleanup(func() { db.Close() })
	if _, err := db.ExecContext(ctx, "ATTACH DATABASE ':memory:' AS "+schema); err != nil {
		t.Fatal(err)
	}
	out = append(out, &liveDB{dialect: "sqlite", db: db, schema: schema, mustPublish: shopViewBlocks})

	if dsn := os.Getenv("ROLLWISE_TEST_POSTGRES"); dsn != "" {
		db, err := sql.Open("pgx", dsn)
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, &liveDB{dialect: "postgres", db: db, schema: schema,
			mustPublish: shopViewBlocks})
	}
	if dsn := os.Getenv("ROLLWISE_TEST_MYSQL"); dsn != "" {
		u, err := url.Parse(dsn)
		if err != nil {
			t.Fatal(err)
		}
		cfg := gomysql.NewConfig()
		cfg.User = u.User.Username()
		cfg.Passwd, _ = u.User.Password()
		cfg.Net, cfg.Addr, cfg.DBName = "tcp", u.Host, strings.TrimPrefix(u.Path, "/")
		conn, err := gomysql.NewConnector(cfg)
		if err != nil {
			t.Fatal(err)
		}
		out = append(out, &liveDB{dialect: "mysql", db: sql.OpenDB(conn), schema: schema,
			mustPublish: shopViewBlocks})
	}
	for _, l := range out[1:] {
		l.db.SetMaxOpenConns(1)
		create, drop := "CREATE SCHEMA ", "DROP SCHEMA "
		if l.dialect == "postgres" {
			drop, create = "DROP SCHEMA IF EXISTS ", "CREATE SCHEMA "
		}
		if _, err := l.db.ExecContext(ctx, create+schema); err != nil {
			t.Fatalf("%s: %v", l.dialect, err)
		}
		t.Cleanup(func() {
			suffix := ""
			if l.dialect == "postgres" {
				suffix = " CASCADE"
			}
			l.db.ExecContext(ctx, drop+schema+suffix) //nolint:errcheck // best effort on a throwaway server
			l.db.Close()
		})
	}
	return out
}

// load creates the model's tables in the schema, named schema.REL (the
// relation's parts joined by _), fills them from their CSV files, and
// points the model's tables there.
func (l *liveDB) load(t *testing.T, m *model.Model, d *dialects.Dialect) {
	t.Helper()
	done := map[string]bool{}
	for _, tb := range m.Tables {
		rel := []string{l.schema, strings.Join(tb.Relation, "_")}
		tb.Relation = rel
		if done[rel[1]] {
			t.Fatalf("%s: tables sharing a relation are not supported by this loader", tb.Name)
		}
		done[rel[1]] = true
		f, err := os.Open(tb.File)
		if err != nil {
			t.Fatal(err)
		}
		recs, err := csv.NewReader(f).ReadAll()
		f.Close()
		if err != nil {
			t.Fatal(err)
		}
		var stored []*model.Column
		var defs []string
		for _, c := range tb.Columns {
			if c.Stored() {
				stored = append(stored, c)
				defs = append(defs, d.Ident(c.Name)+" "+d.ColumnType(c.Type))
			}
		}
		name := dialects.QualifiedName(d, rel)
		if _, err := l.db.Exec("CREATE TABLE " + name + " (" + strings.Join(defs, ", ") + ")"); err != nil {
			t.Fatalf("%s: create %s: %v", l.dialect, name, err)
		}
		index := map[string]int{}
		for i, h := range recs[0] {
			index[h] = i
		}
		for _, rec := range recs[1:] {
			var vals []string
			for _, c := range stored {
				vals = append(vals, literal(t, d, c.Type, rec[index[c.Name]]))
			}
			if _, err := l.db.Exec("INSERT INTO " + name + " VALUES (" + strings.Join(vals, ", ") + ")"); err != nil {
				t.Fatalf("%s: insert into %s: %v", l.dialect, name, err)
			}
		}
	}
}

// literal renders a CSV value as the dialect's literal of type typ.
func literal(t *testing.T, d *dialects.Dialect, typ model.Type, s string) string {
	t.Helper()
	if s == "" {
		return "NULL"
	}
	switch typ {
	case model.TypeInteger, model.TypeDecimal, model.TypeFloat:
		if _, err := strconv.ParseFloat(s, 64); err != nil {
			t.Fatalf("%q is not a number", s)
		}
		return s
	case model.TypeDate:
		return d.Date(s)
	case model.TypeTimestamp:
		return d.Timestamp(s)
	case model.TypeBoolean:
		return d.Bool(s == "true")
	}
	return d.String(s)
}

// normal renders a value of a view column so that engines agree: numbers
// to 10 significant digits (SQLite has no exact decimals), booleans as
// true/false (SQLite and MySQL give 1/0), dates as YYYY-MM-DD.
func normal(t *testing.T, v any, typ string) string {
	t.Helper()
	if b, ok := v.([]byte); ok {
		v = string(b)
	}
	if v == nil {
		return "NULL"
	}
	switch typ {
	case "integer", "decimal", "float":
		var f float64
		switch x := v.(type) {
		case int64:
			f = float64(x)
		case float64:
			f = x
		case decimal.Decimal:
			f = x.InexactFloat64()
		case string:
			var err error
			if f, err = strconv.ParseFloat(x, 64); err != nil {
				t.Fatalf("%q is not a number", x)
			}
		default:
			t.Fatalf("a number held as %T", v)
		}
		return strconv.FormatFloat(f, 'g', 10, 64)
	case "boolean":
		switch fmt.Sprint(v) {
		case "true", "1", "t":
			return "true"
		case "false", "0", "f":
			return "false"
		}
		t.Fatalf("a boolean held as %T %v", v, v)
	case "date":
		if tm, ok := v.(time.Time); ok {
			return tm.Format("2006-01-02")
		}
		return fmt.Sprint(v)[:10]
	}
	return fmt.Sprint(v)
}

// liveRows runs a query on a live engine and returns its raw rows.
func liveRows(t *testing.T, db *sql.DB, query string) [][]any {
	t.Helper()
	rows, err := db.Query(query)
	if err != nil {
		t.Fatalf("%s: %v", query, err)
	}
	defer rows.Close()
	cols, err := rows.Columns()
	if err != nil {
		t.Fatal(err)
	}
	var out [][]any
	for rows.Next() {
		vals := make([]any, len(cols))
		ptrs := make([]any, len(cols))
		for i := range vals {
			ptrs[i] = &vals[i]
		}
		if err := rows.Scan(ptrs...); err != nil {
			t.Fatal(err)
		}
		out = append(out, vals)
	}
	if err := rows.Err(); err != nil {
		t.Fatal(err)
	}
	return out
}

// normalRows normalises rows by the view's column types, each row joined
// into one line, sorted.
func normalRows(t *testing.T, rows [][]any, cols []views.Column) []string {
	t.Helper()
	var out []string
	for _, r := range rows {
		if len(r) != len(cols) {
			t.Fatalf("a row of %d values for %d columns", len(r), len(cols))
		}
		var parts []string
		for i, v := range r {
			parts = append(parts, normal(t, v, cols[i].Type))
		}
		out = append(out, strings.Join(parts, " | "))
	}
	sort.Strings(out)
	return out
}

func TestViewsOnLiveEngines(t *testing.T) {
	t.Parallel()
	duck := publish(t, []string{viewsModel}, "", "")
	for _, l := range liveDBs(t) {
		t.Run(l.dialect, func(t *testing.T) {
			d, err := dialects.Get(l.dialect)
			if err != nil {
				t.Fatal(err)
			}
			var errb bytes.Buffer
			m, err := loadModel(&env{stdout: &bytes.Buffer{}, stderr: &errb}, []string{viewsModel})
			if err != nil {
				t.Fatalf("%v: %s", err, errb.String())
			}
			l.load(t, m.Model, d)
			// Each view block alone, so that one the engine cannot
			// express leaves the others to test.
			var published []*views.View
			blocks := m.Views
			for i := -1; i < len(blocks); i++ {
				one := *m.Model
				one.Views = nil
				if i >= 0 {
					one.Views = blocks[i : i+1]
				}
				// The model's upper() meets ASCII letters only, which SQLite
				// handles exactly: accept its ASCII-only case mapping.
				set, diags := views.Generate(&one, d, views.Options{Schema: l.schema, Approximate: true})
				if set == nil {
					what := "the row-level views"
					if i >= 0 {
						what = "view " + blocks[i].Name
					}
					t.Logf("%s: %v", what, diags)
					continue
				}
				for _, v := range set.Views {
					if i >= 0 && v.Kind == views.RowLevel {
						continue
					}
					for round := 0; round < 2; round++ {
						for _, stmt := range v.Statements {
							if _, err := l.db.Exec(stmt); err != nil {
								t.Fatalf("%s (time %d): %v\n%s", v.Name, round+1, err, stmt)
							}
						}
					}
					published = append(published, v)
				}
			}
			have := map[string]bool{}
			for _, v := range published {
				have[v.Name] = true
			}
			for _, must := range append([]string{"sales_derived", "stores_derived"}, l.mustPublish...) {
				if !have[must] {
					t.Errorf("%s did not publish %s", l.dialect, must)
				}
			}
			for _, v := range published {
				got := normalRows(t, liveRows(t, l.db, "SELECT * FROM "+dialects.QualifiedName(d, v.QualifiedName)), v.Columns)
				var want []string
				if v.Kind == views.Measures {
					want = runRows(t, v)
				} else {
					want = normalRows(t, duck.selectAll(t, &views.View{Name: v.Name, QualifiedName: []string{v.Name}}).Rows, v.Columns)
				}
				if len(want) == 0 || strings.Join(got, "\n") != strings.Join(want, "\n") {
					t.Errorf("%s on %s:\n%s\nwant:\n%s", v.Name, l.dialect, strings.Join(got, "\n"), strings.Join(want, "\n"))
				}
			}
		})
	}
}

// runRows is `run --view` of a measure view on DuckDB, normalised as
// queryRows does, the grouping column rebuilt from the rolled-up groups.
func runRows(t *testing.T, v *views.View) []string {
	t.Helper()
	e := &env{stdout: &bytes.Buffer{}, stderr: &bytes.Buffer{}}
	comp, err := compile(e, &queryOptions{models: []string{viewsModel}, view: v.Name, dialect: "duckdb"})
	if err != nil {
		t.Fatal(err)
	}
	res, err := execute(context.Background(), comp, "")
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	n := len(comp.Query.GroupNames)
	for _, r := range res.Rows {
		var parts []string
		for i, val := range r.Values {
			parts = append(parts, normal(t, val, v.Columns[i].Type))
		}
		mask := 0
		for i, g := range comp.Query.GroupNames {
			for _, ru := range r.RolledUp {
				if ru == g {
					mask |= 1 << (n - 1 - i)
				}
			}
		}
		out = append(out, strings.Join(append(parts, strconv.Itoa(mask)), " | "))
	}
	sort.Strings(out)
	return out
}
