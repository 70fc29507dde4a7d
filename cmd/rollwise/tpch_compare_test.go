package main

import (
	"encoding/json"
	"fmt"
	"math"
	"math/big"
	"strings"
	"testing"
	"time"

	"github.com/duckdb/duckdb-go/v2"
	"github.com/shopspring/decimal"
)

// Comparing a rollwise result with the result of a SQL text, value by
// value. The SQL side says how exact a column must be: a DECIMAL or
// integer value (sums of money, counts) must be matched exactly; a DOUBLE
// (DuckDB's avg, and any division) within approxTolerance.

// approxTolerance is the relative tolerance for values the SQL computes in
// double precision (averages and ratios): the two texts may add and divide
// in another order, and DuckDB's parallel sums of doubles are not
// associative. It is far tighter than what TPC-H asks of an answer
// (clause 2.1.3.5: ratios and averages within 1% after rounding to 1/100).
const approxTolerance = 1e-9

// valueKind says how a value is compared.
type valueKind int

const (
	kindNull   valueKind = iota
	kindText             // text and dates (as YYYY-MM-DD)
	kindExact            // DECIMAL and integers: equal as decimals
	kindApprox           // DOUBLE: equal within approxTolerance
)

// cellValue is one value of a result, made comparable.
type cellValue struct {
	kind valueKind
	text string
	num  decimal.Decimal
	f    float64
}

func (v cellValue) String() string {
	switch v.kind {
	case kindNull:
		return "NULL"
	case kindText:
		return fmt.Sprintf("%q", v.text)
	case kindExact:
		return v.num.String()
	case kindPrinted:
		return v.text
	}
	return fmt.Sprint(v.f)
}

// sqlValue turns a value scanned from the DuckDB driver into a cellValue.
func sqlValue(v any) (cellValue, error) {
	switch x := v.(type) {
	case nil:
		return cellValue{kind: kindNull}, nil
	case string:
		return cellValue{kind: kindText, text: x}, nil
	case time.Time:
		return cellValue{kind: kindText, text: x.UTC().Format(time.DateOnly)}, nil
	case duckdb.Decimal:
		return cellValue{kind: kindExact, num: decimal.NewFromBigInt(x.Value, -int32(x.Scale))}, nil
	case *big.Int:
		return cellValue{kind: kindExact, num: decimal.NewFromBigInt(x, 0)}, nil
	case int64:
		return cellValue{kind: kindExact, num: decimal.NewFromInt(x)}, nil
	case int32:
		return cellValue{kind: kindExact, num: decimal.NewFromInt(int64(x))}, nil
	case int16:
		return cellValue{kind: kindExact, num: decimal.NewFromInt(int64(x))}, nil
	case int8:
		return cellValue{kind: kindExact, num: decimal.NewFromInt(int64(x))}, nil
	case float64:
		return cellValue{kind: kindApprox, f: x}, nil
	case float32:
		return cellValue{kind: kindApprox, f: float64(x)}, nil
	}
	return cellValue{}, fmt.Errorf("unexpected SQL value %v (%T)", v, v)
}

// jsonValue turns a value of rollwise's JSON output into a cellValue:
// numbers are kept as the exact decimal they print.
func jsonValue(v any) (cellValue, error) {
	switch x := v.(type) {
	case nil:
		return cellValue{kind: kindNull}, nil
	case string:
		return cellValue{kind: kindText, text: x}, nil
	case json.Number:
		d, err := decimal.NewFromString(x.String())
		if err != nil {
			return cellValue{}, fmt.Errorf("number %s: %v", x, err)
		}
		f, _ := d.Float64()
		return cellValue{kind: kindExact, num: d, f: f}, nil
	case bool:
		return cellValue{kind: kindText, text: fmt.Sprint(x)}, nil
	}
	return cellValue{}, fmt.Errorf("unexpected JSON value %v (%T)", v, v)
}

// sameValue reports whether a rollwise value got matches the SQL value
// want, with want's kind deciding how exactly.
func sameCell(got, want cellValue) bool {
	switch want.kind {
	case kindNull:
		return got.kind == kindNull
	case kindText:
		return got.kind == kindText && got.text == want.text
	case kindExact:
		return got.kind == kindExact && got.num.Equal(want.num)
	case kindPrinted:
		return samePrinted(got, want)
	}
	if got.kind != kindExact && got.kind != kindApprox {
		return false
	}
	g := got.f
	if got.kind == kindExact {
		g, _ = got.num.Float64()
	}
	return math.Abs(g-want.f) <= approxTolerance*math.Max(1, math.Abs(want.f))
}

func sameRow(got, want []cellValue) bool {
	if len(got) != len(want) {
		return false
	}
	for i := range want {
		if !sameCell(got[i], want[i]) {
			return false
		}
	}
	return true
}

func rowText(r []cellValue) string {
	parts := make([]string, len(r))
	for i, v := range r {
		parts[i] = v.String()
	}
	return strings.Join(parts, " | ")
}

// compareResult compares rollwise rows with SQL rows and returns the
// differences (none means equal) and the number of rows that tie on the
// order column with another row.
//
// With orderCol < 0 the rows must agree in order. With orderCol >= 0 (a
// `ties` query) the order column must agree row by row, and the rows of
// each run of equal order values must agree as sets, because rollwise
// sorts by one measure only. When limited, the last run may go on past
// the cut (rows the SQL did not return, with the same order value), so
// either side may keep other rows of it: that run is compared on the
// order column only.
func compareResult(got, want [][]cellValue, orderCol int, limited bool) (diffs []string, ties int) {
	if len(got) != len(want) {
		diffs = append(diffs, fmt.Sprintf("%d rows, want %d", len(got), len(want)))
	}
	n := min(len(got), len(want))
	if orderCol < 0 {
		for i := range n {
			if !sameRow(got[i], want[i]) {
				diffs = append(diffs, fmt.Sprintf("row %d:\n   got %s\n  want %s", i+1, rowText(got[i]), rowText(want[i])))
			}
		}
		return diffs, 0
	}
	for i := range n {
		if !sameCell(got[i][orderCol], want[i][orderCol]) {
			diffs = append(diffs, fmt.Sprintf("row %d: order value %s, want %s", i+1, got[i][orderCol], want[i][orderCol]))
		}
	}
	if len(diffs) > 0 {
		return diffs, 0
	}
	for start := 0; start < n; {
		end := start + 1
		for end < n && sameCell(want[end][orderCol], want[start][orderCol]) {
			end++
		}
		if end-start > 1 {
			ties += end - start
		}
		if limited && end == n {
			break
		}
		used := make([]bool, end-start)
		for i := start; i < end; i++ {
			found := false
			for j := start; j < end && !found; j++ {
				if !used[j-start] && sameRow(got[j], want[i]) {
					used[j-start], found = true, true
				}
			}
			if !found {
				diffs = append(diffs, fmt.Sprintf("row %d has no match among rows %d to %d: want %s", i+1, start+1, end, rowText(want[i])))
			}
		}
		start = end
	}
	return diffs, ties
}

// TestCompareResult checks the comparison itself: exact values must be
// equal to the last digit, approximate ones within the tolerance, and
// ties compare as sets only within a run of equal order values.
func TestCompareResult(t *testing.T) {
	t.Parallel()
	exact := func(s string) cellValue {
		return cellValue{kind: kindExact, num: decimal.RequireFromString(s)}
	}
	approx := func(f float64) cellValue { return cellValue{kind: kindApprox, f: f} }
	text := func(s string) cellValue { return cellValue{kind: kindText, text: s} }
	null := cellValue{kind: kindNull}
	got := func(vals ...any) []cellValue {
		var out []cellValue
		for _, v := range vals {
			var x any = v
			if s, ok := v.(string); ok && strings.HasPrefix(s, "#") {
				x = json.Number(s[1:])
			}
			c, err := jsonValue(x)
			if err != nil {
				t.Fatal(err)
			}
			out = append(out, c)
		}
		return out
	}
	for _, tc := range []struct {
		name     string
		got      [][]cellValue
		want     [][]cellValue
		orderCol int
		limited  bool
		ok       bool
	}{
		{"exact equal with other scales", [][]cellValue{got("A", "#10.500000")}, [][]cellValue{{text("A"), exact("10.50")}}, -1, false, true},
		{"exact off by one cent", [][]cellValue{got("A", "#10.51")}, [][]cellValue{{text("A"), exact("10.50")}}, -1, false, false},
		{"exact off in the sixth place", [][]cellValue{got("#0.000001")}, [][]cellValue{{exact("0")}}, -1, false, false},
		{"approx within tolerance", [][]cellValue{got("#0.3")}, [][]cellValue{{approx(0.30000000000000004)}}, -1, false, true},
		{"approx outside tolerance", [][]cellValue{got("#0.3000001")}, [][]cellValue{{approx(0.3)}}, -1, false, false},
		{"null against zero", [][]cellValue{got(nil)}, [][]cellValue{{exact("0")}}, -1, false, false},
		{"null against null", [][]cellValue{got(nil)}, [][]cellValue{{null}}, -1, false, true},
		{"text is not a number", [][]cellValue{got("1")}, [][]cellValue{{exact("1")}}, -1, false, false},
		{"missing row", [][]cellValue{got("A")}, [][]cellValue{{text("A")}, {text("B")}}, -1, false, false},
		{"order differs", [][]cellValue{got("B"), got("A")}, [][]cellValue{{text("A")}, {text("B")}}, -1, false, false},
		{"tie in another order", [][]cellValue{got("B", "#5"), got("A", "#5")}, [][]cellValue{{text("A"), exact("5")}, {text("B"), exact("5")}}, 1, false, true},
		{"no tie, other order", [][]cellValue{got("B", "#4"), got("A", "#5")}, [][]cellValue{{text("A"), exact("5")}, {text("B"), exact("4")}}, 1, false, false},
		{"tie with another row", [][]cellValue{got("C", "#5"), got("A", "#5")}, [][]cellValue{{text("A"), exact("5")}, {text("B"), exact("5")}}, 1, false, false},
		{"tie cut by the limit", [][]cellValue{got("A", "#6"), got("C", "#5")}, [][]cellValue{{text("A"), exact("6")}, {text("B"), exact("5")}}, 1, true, true},
		{"single last row cut by the limit", [][]cellValue{got("A", "#6"), got("C", "#5")}, [][]cellValue{{text("A"), exact("6")}, {text("B"), exact("5")}, {text("D"), exact("4")}}, 1, true, false},
	} {
		diffs, _ := compareResult(tc.got, tc.want, tc.orderCol, tc.limited)
		if (len(diffs) == 0) != tc.ok {
			t.Errorf("%s: differences %q, want ok = %v", tc.name, diffs, tc.ok)
		}
	}
}
