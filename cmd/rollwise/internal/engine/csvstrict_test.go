package engine

import (
	"strings"
	"testing"

	"github.com/rollwise/rollwise/planner/model"
)

// TestCSVRefusesWhatItCannotReadExactly: every value a column's type
// cannot hold as written is refused with file, line, column and value,
// never read as NULL, as another number or as an infinity (issue 17).
// Calendar rules: ISO 8601 (February 2026 has 28 days; hours run 00-23,
// offsets at most ±14:00 as in the IANA zone data); integer spellings:
// decimal digits only, as SQL's <exact numeric literal> (ISO 9075).
func TestCSVRefusesWhatItCannotReadExactly(t *testing.T) {
	dir := t.TempDir()
	cases := []struct {
		name, value string
		typ         model.Type
		want        string
	}{
		{"not a time", "not a time", model.TypeTimestamp, "as a timestamp"},
		{"february 30", "2026-02-30 10:00:00", model.TypeTimestamp, "as a timestamp"},
		{"hour 25", "2026-03-01 25:00:00", model.TypeTimestamp, "as a timestamp"},
		{"time only", "25:00:00", model.TypeTimestamp, "as a timestamp"},
		{"trailing text", "2026-03-01 10:00:00 tomorrow", model.TypeTimestamp, "as a timestamp"},
		{"offset +99", "2026-03-01 10:00:00+99:00", model.TypeTimestamp, "as a timestamp"},
		{"hex integer", "0x10", model.TypeInteger, "whole number"},
		{"underscore integer", "1_000", model.TypeInteger, "whole number"},
		{"underscore decimal", "1_000.5", model.TypeDecimal, "decimal"},
		{"hex decimal", "0x10", model.TypeDecimal, "decimal"},
		{"float overflow", "1e400", model.TypeFloat, "out of range"},
		{"float hex", "0x10", model.TypeFloat, "float"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			file := writeFile(t, dir, strings.ReplaceAll(c.name, " ", "_")+".csv", "id,v\n1,\n2,"+c.value+"\n")
			m := newModel(table("t", nil, file, col("id", model.TypeInteger), col("v", c.typ)))
			expectOpenError(t, m, "", file+":3:", "column t.v", "\""+c.value+"\"", c.want)
		})
	}
}

// TestCSVAcceptsTimestampSpellings: the forms the language accepts still
// load, with offsets converted to UTC.
func TestCSVAcceptsTimestampSpellings(t *testing.T) {
	dir := t.TempDir()
	file := writeFile(t, dir, "t.csv", "id,v\n1,2026-03-01 10:00:00\n2,2026-03-01T10:00:00+02:00\n3,2026-03-01 10:00\n4,2026-03-01\n5,2026-03-01 10:00:00.5\n6,\n7,2026-03-01 10:00:00Z\n")
	db := open(t, newModel(table("t", nil, file, col("id", model.TypeInteger), col("v", model.TypeTimestamp))), "")
	res := query(t, db, `SELECT CAST("v" AS VARCHAR) FROM "t" ORDER BY "id"`)
	want := []any{"2026-03-01 10:00:00", "2026-03-01 08:00:00", "2026-03-01 10:00:00", "2026-03-01 00:00:00", "2026-03-01 10:00:00.5", nil, "2026-03-01 10:00:00"}
	if len(res.Rows) != len(want) {
		t.Fatalf("rows %v", res.Rows)
	}
	for i, w := range want {
		if res.Rows[i][0] != w {
			t.Errorf("row %d = %v, want %v", i+1, res.Rows[i][0], w)
		}
	}
}

// TestCSVHeaderNamesAreNotTrimmed: a header name is matched as written,
// so a column whose name ends in a tab is found (issue 17).
func TestCSVHeaderNamesAreNotTrimmed(t *testing.T) {
	dir := t.TempDir()
	file := writeFile(t, dir, "t.csv", "\"a\t\",b\n1,2\n")
	db := open(t, newModel(table("t", nil, file, col("a\t", model.TypeInteger), col("b", model.TypeInteger))), "")
	expectRows(t, query(t, db, `SELECT "a	", "b" FROM "t"`), []string{"a\t", "b"}, [][]any{{int64(1), int64(2)}})
}

// TestCSVAcceptsFloatSpellings: written-out infinities and NaN, exponents
// and blanks around a number still load into a float column.
func TestCSVAcceptsFloatSpellings(t *testing.T) {
	dir := t.TempDir()
	file := writeFile(t, dir, "t.csv", "id,v\n1,inf\n2,-Infinity\n3, 1.5e3 \n4,1e308\n")
	db := open(t, newModel(table("t", nil, file, col("id", model.TypeInteger), col("v", model.TypeFloat))), "")
	expectRows(t, query(t, db, `SELECT CAST("v" AS VARCHAR) FROM "t" ORDER BY "id"`), []string{`CAST(v AS VARCHAR)`},
		[][]any{{"inf"}, {"-inf"}, {"1500.0"}, {"1e+308"}})
}
