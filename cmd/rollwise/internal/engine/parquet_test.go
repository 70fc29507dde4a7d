package engine

import (
	"context"
	"database/sql"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/rollwise/rollwise/planner/model"
)

// writeParquet writes the rows of a DuckDB query to dir/name with COPY.
func writeParquet(t *testing.T, dir, name, query string) string {
	t.Helper()
	path := filepath.Join(dir, name)
	db, err := sql.Open("duckdb", "")
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	if _, err := db.Exec("COPY (" + query + ") TO " + quoteString(path) + " (FORMAT parquet)"); err != nil {
		t.Fatal(err)
	}
	return path
}

func TestParquetColumnsCastToDeclaredTypes(t *testing.T) {
	dir := t.TempDir()
	file := writeParquet(t, dir, "sales.parquet", `
		SELECT * FROM (VALUES
			(1::INTEGER, 'R1', DATE '2026-03-01', 12.5::DOUBLE, 0.1::DECIMAL(10,2), 3::SMALLINT, TIMESTAMP '2026-03-01 09:30:00', 'extra'),
			(2::INTEGER, NULL, NULL, 1234.123456::DOUBLE, NULL, NULL, NULL, 'x'),
			(3::INTEGER, 'R3', DATE '2026-03-02', NULL, 99999999.99::DECIMAL(10,2), 7::SMALLINT, TIMESTAMP '2026-03-02 00:00:00', 'y')
		) v(line_id, receipt_id, sold_on, unit_price, unit_cost, qty, rung_at, note)`)
	m := newModel(table("sales", []string{"retail", "sales_lines"}, file,
		col("line_id", model.TypeInteger),
		col("receipt_id", model.TypeText),
		col("sold_on", model.TypeDate),
		col("unit_price", model.TypeDecimal),
		col("unit_cost", model.TypeDecimal),
		col("QTY", model.TypeInteger), // matched without regard to case
		col("rung_at", model.TypeTimestamp),
		derived("line_total", model.TypeDecimal),
	))
	db := open(t, m, "")
	res := query(t, db, `SELECT * FROM "retail"."sales_lines" ORDER BY "line_id"`)
	expectRows(t, res,
		[]string{"line_id", "receipt_id", "sold_on", "unit_price", "unit_cost", "QTY", "rung_at"},
		[][]any{
			{int64(1), "R1", date(2026, 3, 1), dec("12.5"), dec("0.1"), int64(3), time.Date(2026, 3, 1, 9, 30, 0, 0, time.UTC)},
			{int64(2), nil, nil, dec("1234.123456"), nil, nil, nil},
			{int64(3), "R3", date(2026, 3, 2), nil, dec("99999999.99"), int64(7), date(2026, 3, 2)},
		})
	types := query(t, db, `SELECT typeof("line_id"), typeof("unit_price"), typeof("unit_cost"), typeof("QTY") FROM "retail"."sales_lines" LIMIT 1`)
	expectRows(t, types, types.Columns, [][]any{{"BIGINT", "DECIMAL(38,6)", "DECIMAL(38,6)", "BIGINT"}})
	// Sums of products stay exact.
	sum := query(t, db, `SELECT sum("unit_cost" * "QTY"), sum("unit_price" * "unit_cost") FROM "retail"."sales_lines"`)
	expectRows(t, sum, sum.Columns, [][]any{{dec("700000000.23"), dec("1.25")}})
}

func TestParquetValuesThatWouldChangeAreRefused(t *testing.T) {
	dir := t.TempDir()
	cases := []struct {
		name, query string
		typ         model.Type
		want        []string
	}{
		{"too precise double", "SELECT * FROM (VALUES (1.5::DOUBLE), (0.1234567::DOUBLE)) v(x)", model.TypeDecimal,
			[]string{"row 2", "column t.x (decimal)", "0.1234567", "more than 6 decimal places"}},
		{"too precise decimal", "SELECT 1.12345678::DECIMAL(18,8) AS x", model.TypeDecimal,
			[]string{"row 1", "1.12345678", "more than 6 decimal places"}},
		// 34 integer digits: more than DECIMAL(38,6) holds, so a wide
		// DECIMAL column is still read and checked.
		{"too large decimal", "SELECT 1234567890123456789012345678901234.5::DECIMAL(38,2) AS x", model.TypeDecimal,
			[]string{"row 1", "1234567890123456789012345678901234.5"}},
		{"unsigned beyond integer", "SELECT 18446744073709551615::UBIGINT AS x", model.TypeInteger,
			[]string{"row 1", "18446744073709551615"}},
		{"too precise text", "SELECT '2.0000001' AS x", model.TypeDecimal, []string{"row 1", `"2.0000001"`}},
		{"fraction in integer", "SELECT * FROM (VALUES (1.0::DOUBLE), (2.5::DOUBLE)) v(x)", model.TypeInteger,
			[]string{"row 2", `"2.5"`, "not a whole number"}},
		{"nan in decimal", "SELECT 'NaN'::DOUBLE AS x", model.TypeDecimal, []string{"row 1", "cannot read"}},
		{"time of day in date", "SELECT TIMESTAMP '2026-01-01 10:00:00' AS x", model.TypeDate,
			[]string{"row 1", "2026-01-01 10:00:00", "would change"}},
		{"text in date", "SELECT 'soon' AS x", model.TypeDate, []string{"row 1", `"soon"`, "YYYY-MM-DD"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			file := writeParquet(t, dir, c.name+".parquet", c.query)
			m := newModel(table("t", nil, file, col("x", c.typ)))
			expectOpenError(t, m, "", append([]string{file}, c.want...)...)
		})
	}
}

func TestParquetMissingColumns(t *testing.T) {
	dir := t.TempDir()
	file := writeParquet(t, dir, "t.parquet", "SELECT 1 AS a, 2 AS b")
	m := newModel(table("t", nil, file, col("a", model.TypeInteger), col("c", model.TypeInteger), col("d", model.TypeText)))
	expectOpenError(t, m, "", file, "lacks columns c, d", "it has: a, b")
}

func TestParquetFromDataDir(t *testing.T) {
	dir := t.TempDir()
	writeParquet(t, dir, "stores.parquet", "SELECT 4::BIGINT AS store_id, 'North' AS region")
	m := newModel(table("stores", []string{"retail", "stores"}, "", col("store_id", model.TypeInteger), col("region", model.TypeText)))
	db := open(t, m, dir)
	expectRows(t, query(t, db, `SELECT * FROM "retail"."stores"`), []string{"store_id", "region"}, [][]any{{int64(4), "North"}})
}

func TestQueryNormalisesValues(t *testing.T) {
	db := open(t, newModel(), "")
	res := query(t, db, `SELECT NULL AS n, 7::TINYINT AS i8, 300::SMALLINT AS i16, 70000::INTEGER AS i32,
		200::UTINYINT AS u8, 4000000000::UINTEGER AS u32, 18446744073709551615::UBIGINT AS u64,
		170141183460469231731687303715884105727::HUGEINT AS huge, 0.1::FLOAT AS f32, 0.1::DOUBLE AS f64,
		'12345678901234567890.123456'::DECIMAL(38,6) AS d38, 1.5::DECIMAL(4,1) AS d4, 'x' AS s, true AS b,
		DATE '2026-03-01' AS d, TIMESTAMP '2026-03-01 10:11:12.5' AS ts,
		TIMESTAMPTZ '2026-03-01 10:00:00+02' AS tstz`)
	expectRows(t, res, res.Columns, [][]any{{
		nil, int64(7), int64(300), int64(70000), int64(200), int64(4000000000), dec("18446744073709551615"),
		dec("170141183460469231731687303715884105727"), 0.1, 0.1, dec("12345678901234567890.123456"),
		dec("1.5"), "x", true, date(2026, 3, 1), time.Date(2026, 3, 1, 10, 11, 12, 500000000, time.UTC),
		time.Date(2026, 3, 1, 8, 0, 0, 0, time.UTC),
	}})
	for i, v := range res.Rows[0] {
		if tv, ok := v.(time.Time); ok && tv.Location() != time.UTC {
			t.Errorf("column %s: time not in UTC: %v", res.Columns[i], tv)
		}
	}
	empty := query(t, db, "SELECT 1 AS a WHERE false")
	if empty.Rows == nil || len(empty.Rows) != 0 || len(empty.Columns) != 1 {
		t.Errorf("empty result = %#v, want no rows and one column", empty)
	}
}

func TestQueryRefusesUnsupportedTypes(t *testing.T) {
	db := open(t, newModel(), "")
	for q, want := range map[string]string{
		"SELECT INTERVAL 1 DAY AS v":  "INTERVAL",
		"SELECT TIME '10:00:00' AS v": "TIME",
		"SELECT [1, 2] AS v":          "not supported",
		"SELECT 'x'::BLOB AS v":       "BLOB",
		"SELECT {'a': 1} AS v":        "not supported",
	} {
		_, err := Query(context.Background(), db, q)
		if err == nil {
			t.Errorf("%s: no error", q)
			continue
		}
		if got := err.Error(); !strings.Contains(got, want) || !strings.Contains(got, `"v"`) {
			t.Errorf("%s: error %q does not mention %q and the column", q, got, want)
		}
	}
	if _, err := Query(context.Background(), db, "SELECT * FROM nowhere"); err == nil || !strings.Contains(err.Error(), "nowhere") {
		t.Errorf("bad query: error %v", err)
	}
	if _, err := Query(context.Background(), nil, "SELECT 1"); err == nil {
		t.Error("nil db: no error")
	}
}

// Casts that cannot fail or change a value are not checked by reading the
// column; every other one is.
func TestExactCast(t *testing.T) {
	cases := []struct {
		src, dst string
		exact    bool
	}{
		{"DECIMAL(15,2)", DecimalType, true},
		{"DECIMAL(38,6)", DecimalType, true},
		{"DECIMAL(34,2)", DecimalType, true}, // 32 integer digits, as many as DECIMAL(38,6)
		{"DECIMAL(35,2)", DecimalType, false},
		{"DECIMAL(18,8)", DecimalType, false},
		{"INTEGER", DecimalType, true},
		{"UBIGINT", DecimalType, true},
		{"DOUBLE", DecimalType, false},
		{"SMALLINT", "BIGINT", true},
		{"UINTEGER", "BIGINT", true},
		{"UBIGINT", "BIGINT", false},
		{"DECIMAL(18,0)", "BIGINT", true},
		{"DECIMAL(19,0)", "BIGINT", false},
		{"DECIMAL(10,2)", "BIGINT", false},
		{"DATE", "TIMESTAMP", true},
		{"TIMESTAMP", "DATE", false},
		{"TIMESTAMP_NS", "TIMESTAMP", false},
		{"FLOAT", "DOUBLE", true},
		{"INTEGER", "VARCHAR", true},
		{"BLOB", "VARCHAR", false},
		{"DECIMAL(15,2", DecimalType, false},
	}
	for _, c := range cases {
		if got := exactCast(c.src, c.dst); got != c.exact {
			t.Errorf("exactCast(%s, %s) = %v, want %v", c.src, c.dst, got, c.exact)
		}
	}
}

// With FileDecimals, a Parquet decimal that always fits DECIMAL(38,6) keeps
// the file's type (TPC-H's money columns are DECIMAL(15,2)), with the same
// values; one with more than 6 places is still cast, and its values
// checked. A product too large for DuckDB's narrow decimal arithmetic is
// an out-of-range error (Overflowed), never a rounding, where the wide
// types compute it.
func TestParquetFileDecimals(t *testing.T) {
	dir := t.TempDir()
	file := writeParquet(t, dir, "lines.parquet", `
		SELECT * FROM (VALUES
			(100000000.00::DECIMAL(15,2), 10000000.00::DECIMAL(15,2), 0.5::DECIMAL(12,8)),
			(0.01::DECIMAL(15,2), 2.50::DECIMAL(15,2), 0.25::DECIMAL(12,8))
		) v(price, qty, rate)`)
	m := newModel(table("lines", nil, file,
		col("price", model.TypeDecimal), col("qty", model.TypeDecimal), col("rate", model.TypeDecimal)))
	db, err := OpenDuckDB(context.Background(), m, "", Options{FileDecimals: true})
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	types := query(t, db, `SELECT typeof("price"), typeof("qty"), typeof("rate") FROM "lines" LIMIT 1`)
	expectRows(t, types, types.Columns, [][]any{{"DECIMAL(15,2)", "DECIMAL(15,2)", "DECIMAL(38,6)"}})
	sum := query(t, db, `SELECT sum("price"), sum("qty" * "rate") FROM "lines"`)
	expectRows(t, sum, sum.Columns, [][]any{{dec("100000000.01"), dec("5000000.625")}})
	// 10^8 * 10^7 = 10^15 needs more than DECIMAL(18,4), the type DuckDB
	// gives a product of two DECIMAL(15,2).
	_, err = Query(context.Background(), db, `SELECT sum("price" * "qty") FROM "lines"`)
	if !Overflowed(err) {
		t.Fatalf("narrow product: err = %v, want an out-of-range error", err)
	}
	wide := open(t, m, "")
	sum = query(t, wide, `SELECT sum("price" * "qty") FROM "lines"`)
	expectRows(t, sum, sum.Columns, [][]any{{dec("1000000000000000.025")}})
	if Overflowed(nil) || Overflowed(context.Canceled) {
		t.Error("Overflowed took another error for an overflow")
	}
}
