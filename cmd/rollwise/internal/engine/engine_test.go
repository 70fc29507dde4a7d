package engine

import (
	"context"
	"database/sql"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
	"time"

	"github.com/rollwise/rollwise/planner/model"
	"github.com/shopspring/decimal"
)

// col declares a stored column.
func col(name string, typ model.Type) *model.Column {
	return &model.Column{Name: name, Type: typ}
}

// derived declares a derived column, which the engine must not load.
func derived(name string, typ model.Type) *model.Column {
	return &model.Column{Name: name, Type: typ, Derived: &model.Lit{T: typ, Text: "1"}}
}

// table declares a table reading relation from file.
func table(name string, relation []string, file string, cols ...*model.Column) *model.Table {
	t := &model.Table{Name: name, Relation: relation, File: file, Columns: cols}
	for _, c := range cols {
		c.Table = t
	}
	return t
}

func newModel(tables ...*model.Table) *model.Model { return &model.Model{Tables: tables} }

func writeFile(t *testing.T, dir, name, content string) string {
	t.Helper()
	p := filepath.Join(dir, name)
	if err := os.WriteFile(p, []byte(content), 0o644); err != nil {
		t.Fatal(err)
	}
	return p
}

func open(t *testing.T, m *model.Model, dataDir string) *sql.DB {
	t.Helper()
	db, err := OpenDuckDB(context.Background(), m, dataDir, Options{})
	if err != nil {
		t.Fatalf("OpenDuckDB: %v", err)
	}
	t.Cleanup(func() { db.Close() })
	return db
}

func query(t *testing.T, db *sql.DB, q string) *Result {
	t.Helper()
	res, err := Query(context.Background(), db, q)
	if err != nil {
		t.Fatalf("Query(%s): %v", q, err)
	}
	return res
}

// expectOpenError opens m and checks that the error mentions every want.
func expectOpenError(t *testing.T, m *model.Model, dataDir string, want ...string) {
	t.Helper()
	db, err := OpenDuckDB(context.Background(), m, dataDir, Options{})
	if err == nil {
		db.Close()
		t.Fatalf("OpenDuckDB succeeded; want an error mentioning %q", want)
	}
	for _, w := range want {
		if !strings.Contains(err.Error(), w) {
			t.Errorf("error %q\ndoes not mention %q", err, w)
		}
	}
}

func dec(s string) decimal.Decimal { return decimal.RequireFromString(s) }

func date(y int, m time.Month, d int) time.Time { return time.Date(y, m, d, 0, 0, 0, 0, time.UTC) }

// expectRows compares rows, comparing decimals by value.
func expectRows(t *testing.T, got *Result, wantCols []string, want [][]any) {
	t.Helper()
	if !reflect.DeepEqual(got.Columns, wantCols) {
		t.Errorf("columns = %q, want %q", got.Columns, wantCols)
	}
	if len(got.Rows) != len(want) {
		t.Fatalf("got %d rows %v, want %d", len(got.Rows), got.Rows, len(want))
	}
	for i := range want {
		if len(got.Rows[i]) != len(want[i]) {
			t.Fatalf("row %d = %v, want %v", i, got.Rows[i], want[i])
		}
		for j := range want[i] {
			g, w := got.Rows[i][j], want[i][j]
			if wd, ok := w.(decimal.Decimal); ok {
				gd, ok := g.(decimal.Decimal)
				if !ok || !gd.Equal(wd) {
					t.Errorf("row %d column %s = %T %v, want decimal %s", i, got.Columns[j], g, g, wd)
				}
				continue
			}
			if !reflect.DeepEqual(g, w) {
				t.Errorf("row %d column %s = %T %v, want %T %v", i, got.Columns[j], g, g, w, w)
			}
		}
	}
}

func salesModel(file string) *model.Model {
	return newModel(table("sales", []string{"retail", "sales_lines"}, file,
		col("line_id", model.TypeInteger),
		col("receipt_id", model.TypeText),
		col("sold_on", model.TypeDate),
		col("unit_price", model.TypeDecimal),
		col("qty", model.TypeInteger),
		col("unit_cost", model.TypeDecimal),
		col("discount", model.TypeFloat),
		col("paid", model.TypeBoolean),
		col("rung_at", model.TypeTimestamp),
		derived("line_total", model.TypeDecimal),
	))
}

const salesCSV = `line_id,receipt_id,sold_on,unit_price,qty,unit_cost,discount,paid,rung_at,note
1,R1,2026-03-01,12.50,3,7.25,0.1,true,2026-03-01 09:30:00,first
2,"R ""2""",2026-03-02,0.1,,0.2,,false,2026-03-02 18:00:01,
3,,,1234.123456,2,999.999999,0.25,,,x
`

func TestCSVQualifiedRelationTypesAndNulls(t *testing.T) {
	dir := t.TempDir()
	db := open(t, salesModel(writeFile(t, dir, "sales.csv", salesCSV)), "")
	res := query(t, db, `SELECT * FROM "retail"."sales_lines" ORDER BY "line_id"`)
	ts := func(s string) time.Time {
		v, err := time.Parse(time.DateTime, s)
		if err != nil {
			t.Fatal(err)
		}
		return v
	}
	expectRows(t, res,
		[]string{"line_id", "receipt_id", "sold_on", "unit_price", "qty", "unit_cost", "discount", "paid", "rung_at"},
		[][]any{
			{int64(1), "R1", date(2026, 3, 1), dec("12.5"), int64(3), dec("7.25"), 0.1, true, ts("2026-03-01 09:30:00")},
			{int64(2), `R "2"`, date(2026, 3, 2), dec("0.1"), nil, dec("0.2"), nil, false, ts("2026-03-02 18:00:01")},
			{int64(3), nil, nil, dec("1234.123456"), int64(2), dec("999.999999"), 0.25, nil, nil},
		})
	// The derived column and the extra CSV column are not loaded.
	if _, err := Query(context.Background(), db, `SELECT "line_total" FROM "retail"."sales_lines"`); err == nil {
		t.Error("derived column line_total was loaded as a stored column")
	}
	// Column types are the declared ones.
	types := query(t, db, `SELECT column_name, data_type FROM information_schema.columns
		WHERE table_schema = 'retail' AND table_name = 'sales_lines' ORDER BY ordinal_position`)
	expectRows(t, types, []string{"column_name", "data_type"}, [][]any{
		{"line_id", "BIGINT"}, {"receipt_id", "VARCHAR"}, {"sold_on", "DATE"},
		{"unit_price", "DECIMAL(38,6)"}, {"qty", "BIGINT"}, {"unit_cost", "DECIMAL(38,6)"},
		{"discount", "DOUBLE"}, {"paid", "BOOLEAN"}, {"rung_at", "TIMESTAMP"},
	})
}

func TestDecimalSumsOfProductsStayExact(t *testing.T) {
	dir := t.TempDir()
	// Prices near the top of what a DECIMAL(18,6) product could hold, and
	// fractions that binary floats cannot represent.
	csv := "line_id,unit_price,qty,unit_cost\n" +
		"1,123456789012.123456,7,999999.999999\n" +
		"2,0.1,3,0.2\n" +
		"3,0.000001,1000000001,0.000001\n" +
		"4,-45.67,2,12.345678\n"
	m := newModel(table("sales", []string{"sales"}, writeFile(t, dir, "sales.csv", csv),
		col("line_id", model.TypeInteger),
		col("unit_price", model.TypeDecimal),
		col("qty", model.TypeInteger),
		col("unit_cost", model.TypeDecimal),
	))
	db := open(t, m, "")
	res := query(t, db, `SELECT sum("unit_price" * "qty"), sum("unit_price" * "unit_cost"),
		sum("unit_price" * "unit_cost" * "qty"), typeof(sum("unit_price" * "unit_cost")) FROM "sales"`)
	rows := [][]string{
		{"123456789012.123456", "7", "999999.999999"},
		{"0.1", "3", "0.2"},
		{"0.000001", "1000000001", "0.000001"},
		{"-45.67", "2", "12.345678"},
	}
	var revenue, product, triple decimal.Decimal
	for _, r := range rows {
		p, q, c := dec(r[0]), dec(r[1]), dec(r[2])
		revenue = revenue.Add(p.Mul(q))
		product = product.Add(p.Mul(c))
		triple = triple.Add(p.Mul(c).Mul(q))
	}
	expectRows(t, res, res.Columns, [][]any{{revenue, product, triple, "DECIMAL(38,12)"}})
}

func TestCSVTooPreciseDecimalIsRefused(t *testing.T) {
	dir := t.TempDir()
	file := writeFile(t, dir, "sales.csv", "line_id,unit_price\n1,1.5\n2,2.1234500\n3,2.1234567\n4,1.5e-9\n")
	m := newModel(table("sales", nil, file, col("line_id", model.TypeInteger), col("unit_price", model.TypeDecimal)))
	expectOpenError(t, m, "", file+":4:", "unit_price", `"2.1234567"`, "more than 6 decimal places")

	file2 := writeFile(t, dir, "exp.csv", "line_id,unit_price\n1,1.5e-9\n")
	m2 := newModel(table("sales", nil, file2, col("line_id", model.TypeInteger), col("unit_price", model.TypeDecimal)))
	expectOpenError(t, m2, "", file2+":2:", `"1.5e-9"`)
}

func TestCSVWrongTypeNamesFileLineColumnAndValue(t *testing.T) {
	dir := t.TempDir()
	cases := []struct {
		name, csv string
		typ       model.Type
		want      []string
	}{
		{"text in integer", "id,v\n1,2\n2,abc\n", model.TypeInteger, []string{":3:", "column t.v (integer)", `"abc"`}},
		{"fraction in integer", "id,v\n1,3.5\n", model.TypeInteger, []string{":2:", `"3.5"`, "not a whole number"}},
		{"huge integer", "id,v\n1,99999999999999999999\n", model.TypeInteger, []string{":2:", "out of range"}},
		{"bad date", "id,v\n1,2026-01-31\n2,2026-02-30\n", model.TypeDate, []string{":3:", "column t.v (date)", `"2026-02-30"`, "YYYY-MM-DD"}},
		{"bad boolean", "id,v\n1,maybe\n", model.TypeBoolean, []string{":2:", `"maybe"`}},
		{"bad float", "id,v\n1,1.5\n2,1,5\n", model.TypeFloat, []string{"Line: 3"}},
		{"huge decimal", "id,v\n1,1" + strings.Repeat("0", 33) + "\n", model.TypeDecimal, []string{":2:", "out of range for decimal"}},
		{"text in decimal", "id,v\n1,12 EUR\n", model.TypeDecimal, []string{":2:", `"12 EUR"`}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			file := writeFile(t, dir, strings.ReplaceAll(c.name, " ", "_")+".csv", c.csv)
			m := newModel(table("t", nil, file, col("id", model.TypeInteger), col("v", c.typ)))
			expectOpenError(t, m, "", append([]string{file}, c.want...)...)
		})
	}
}

func TestCSVAcceptsExactSpellings(t *testing.T) {
	dir := t.TempDir()
	file := writeFile(t, dir, "t.csv", "i,d\n12.000,2.50000000\n-3,1.5e2\n 7 ,.5\n")
	db := open(t, newModel(table("t", nil, file, col("i", model.TypeInteger), col("d", model.TypeDecimal))), "")
	expectRows(t, query(t, db, `SELECT * FROM "t" ORDER BY "i"`), []string{"i", "d"}, [][]any{
		{int64(-3), dec("150")}, {int64(7), dec("0.5")}, {int64(12), dec("2.5")},
	})
}

func TestLossyExpr(t *testing.T) {
	db := open(t, newModel(), "")
	cases := []struct {
		v     string
		scale int
		lossy bool
	}{
		{"1.5", 6, false}, {"1.123456", 6, false}, {"1.1234567", 6, true}, {"1.1234560000", 6, false},
		{" 1.1234567 ", 6, true}, {"-0.0000001", 6, true}, {"1e-6", 6, false}, {"1e-7", 6, true},
		{"1000e-9", 6, false}, {"1500e-9", 6, true}, {"1.5E3", 0, false}, {"1.5E0", 0, true},
		{"12", 0, false}, {"12.", 0, false}, {"12.0", 0, false}, {"12.01", 0, true}, {"0x1e", 0, false},
		{"0.000", 0, false}, {"1e-99999999999999999999", 6, true},
	}
	for _, c := range cases {
		var got bool
		q := "SELECT " + lossyExpr(quoteString(c.v), c.scale)
		if err := db.QueryRow(q).Scan(&got); err != nil {
			t.Fatalf("%q: %v", c.v, err)
		}
		if got != c.lossy {
			t.Errorf("lossy(%q, scale %d) = %v, want %v", c.v, c.scale, got, c.lossy)
		}
	}
}

func TestCSVMissingColumns(t *testing.T) {
	dir := t.TempDir()
	file := writeFile(t, dir, "sales.csv", "line_id,receipt_id,sold_on,unit_price\n1,R1,2026-03-01,1\n")
	expectOpenError(t, salesModel(file), "", file, "qty", "unit_cost", "discount", "paid", "rung_at", "lacks columns")
}

func TestCSVEmptyFileAndHeaderOnly(t *testing.T) {
	dir := t.TempDir()
	empty := writeFile(t, dir, "empty.csv", "")
	expectOpenError(t, newModel(table("t", nil, empty, col("a", model.TypeInteger))), "", empty, "header row")

	header := writeFile(t, dir, "header.csv", "\xEF\xBB\xBFa,b\n")
	db := open(t, newModel(table("t", nil, header, col("a", model.TypeInteger), col("b", model.TypeDecimal))), "")
	expectRows(t, query(t, db, `SELECT count(*) FROM "t"`), []string{"count_star()"}, [][]any{{int64(0)}})
}

func TestCSVMalformedRow(t *testing.T) {
	dir := t.TempDir()
	file := writeFile(t, dir, "t.csv", "a,b\n1,2\n3,4,5\n")
	expectOpenError(t, newModel(table("t", nil, file, col("a", model.TypeInteger))), "", file, "Line: 3")
}

func TestQuotesInNames(t *testing.T) {
	dir := t.TempDir()
	file := writeFile(t, dir, "it's.csv", "\"we\"\"ird\",plain\n1,x\n")
	m := newModel(table("odd", []string{`sch"ema`, `rel "one"`}, file,
		col(`we"ird`, model.TypeInteger), col("plain", model.TypeText)))
	db := open(t, m, "")
	expectRows(t, query(t, db, `SELECT "we""ird", "plain" FROM "sch""ema"."rel ""one"""`),
		[]string{`we"ird`, "plain"}, [][]any{{int64(1), "x"}})
}

func TestThreePartRelation(t *testing.T) {
	dir := t.TempDir()
	file := writeFile(t, dir, "t.csv", "a\n5\n")
	db := open(t, newModel(table("t", []string{"wh", "retail", "t"}, file, col("a", model.TypeInteger))), "")
	expectRows(t, query(t, db, `SELECT "a" FROM "wh"."retail"."t"`), []string{"a"}, [][]any{{int64(5)}})
}

func TestRolePlayingTablesShareOneRelation(t *testing.T) {
	dir := t.TempDir()
	file := writeFile(t, dir, "dates.csv", "day,year\n2026-01-01,2026\n")
	m := newModel(
		table("order_date", []string{"dates"}, file, col("day", model.TypeDate), col("year", model.TypeInteger)),
		table("ship_date", []string{"DATES"}, file, col("day", model.TypeDate)),
	)
	db := open(t, m, "")
	expectRows(t, query(t, db, `SELECT * FROM "dates"`), []string{"day", "year"}, [][]any{{date(2026, 1, 1), int64(2026)}})

	other := writeFile(t, dir, "other.csv", "day\n2026-01-01\n")
	m2 := newModel(
		table("order_date", []string{"dates"}, file, col("day", model.TypeDate)),
		table("ship_date", []string{"dates"}, other, col("day", model.TypeText)),
	)
	expectOpenError(t, m2, "", "order_date and ship_date", "different files", "declare column day as date and text")
}

func TestDataFileResolution(t *testing.T) {
	dir := t.TempDir()
	data := filepath.Join(dir, "data")
	if err := os.Mkdir(data, 0o755); err != nil {
		t.Fatal(err)
	}
	fromFile := writeFile(t, dir, "stores.csv", "store_id\n1\n")
	writeFile(t, data, "stores.csv", "store_id\n2\n")
	stores := func(file string) *model.Model {
		return newModel(table("stores", []string{"retail", "stores"}, file, col("store_id", model.TypeInteger)))
	}

	// --data overrides `from`.
	db := open(t, stores(fromFile), data)
	expectRows(t, query(t, db, `SELECT * FROM "retail"."stores"`), []string{"store_id"}, [][]any{{int64(2)}})

	expectOpenError(t, stores(""), "", "table stores has no data file", `from "FILE"`, "--data")
	expectOpenError(t, stores(filepath.Join(dir, "stores.xlsx")), "", "stores.xlsx", ".csv and .parquet")
	expectOpenError(t, stores(filepath.Join(dir, "nope.csv")), "", "nope.csv")
	expectOpenError(t, newModel(table("plants", nil, "", col("a", model.TypeInteger))), data, "plants.csv", "plants.parquet", data)

	writeFile(t, data, "stores.parquet", "")
	expectOpenError(t, stores(""), data, "stores.csv", "stores.parquet", "keep only one")
}

func TestErrorsFromSeveralTablesAreAllReported(t *testing.T) {
	expectOpenError(t, newModel(
		table("a", nil, "", col("x", model.TypeInteger)),
		table("b", nil, "", col("x", model.TypeInteger)),
	), "", "table a has no data file", "table b has no data file")
}

func TestTimestampsAreHeldInUTC(t *testing.T) {
	// DuckDB takes its time zone from the environment; rollwise must not.
	t.Setenv("TZ", "America/New_York")
	dir := t.TempDir()
	file := writeFile(t, dir, "t.csv", "id,at\n1,2026-03-01T10:00:00+02:00\n2,2026-03-01 10:00:00\n3,2026-03-01\n")
	pq := writeParquet(t, dir, "t.parquet", "SELECT * FROM (VALUES (1, TIMESTAMPTZ '2026-03-01 10:00:00+02'), (2, NULL)) v(id, \"at\")")
	pqText := writeParquet(t, dir, "u.parquet", "SELECT 1 AS id, '2026-03-01T10:00:00+02:00' AS \"at\"")
	m := newModel(
		table("t", nil, file, col("id", model.TypeInteger), col("at", model.TypeTimestamp)),
		table("p", nil, pq, col("id", model.TypeInteger), col("at", model.TypeTimestamp)),
		table("u", nil, pqText, col("id", model.TypeInteger), col("at", model.TypeTimestamp)),
	)
	db := open(t, m, "")
	at := func(h int) time.Time { return time.Date(2026, 3, 1, h, 0, 0, 0, time.UTC) }
	expectRows(t, query(t, db, `SELECT "at", "at"::DATE AS day FROM "t" ORDER BY "id"`), []string{"at", "day"},
		[][]any{{at(8), date(2026, 3, 1)}, {at(10), date(2026, 3, 1)}, {at(0), date(2026, 3, 1)}})
	expectRows(t, query(t, db, `SELECT "at" FROM "p" ORDER BY "id"`), []string{"at"}, [][]any{{at(8)}, {nil}})
	expectRows(t, query(t, db, `SELECT "at" FROM "u"`), []string{"at"}, [][]any{{at(8)}})
	expectRows(t, query(t, db, `SELECT current_setting('TimeZone') AS tz`), []string{"tz"}, [][]any{{"UTC"}})
}

func TestTableWithoutStoredColumns(t *testing.T) {
	dir := t.TempDir()
	file := writeFile(t, dir, "t.csv", "a\n1\n")
	expectOpenError(t, newModel(table("t", nil, file, derived("d", model.TypeInteger))), "", "table t declares no stored columns")
}

// Tables that play two roles of one relation (at "nation") read the
// relation's file from --data when there is none of their own name.
func TestDataFileFallsBackToRelationName(t *testing.T) {
	dir := t.TempDir()
	writeFile(t, dir, "nation.csv", "n_nationkey\n7\n")
	m := newModel(table("cust_nation", []string{"nation"}, "", col("n_nationkey", model.TypeInteger)),
		table("supp_nation", []string{"nation"}, "", col("n_nationkey", model.TypeInteger)))
	db := open(t, m, dir)
	expectRows(t, query(t, db, `SELECT * FROM "nation"`), []string{"n_nationkey"}, [][]any{{int64(7)}})
}
