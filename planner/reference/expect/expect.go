// Package expect compares report rows, as the CLI's JSON output and the
// reference evaluator give them, with rows a test writes by hand. Both the
// SQL path's tests (cmd/rollwise) and the reference evaluator's own tests
// use it, so that one hand-worked expectation reads the same in both.
package expect

import (
	"encoding/json"
	"fmt"
	"math"
	"testing"

	"github.com/shopspring/decimal"
)

// Row is an expected result row: a string is an exact decimal when the
// value got is a number (text otherwise), a float64 is compared within
// 1e-9 relative, an int exactly, a []string with a list, nil with null.
// Columns the row does not name are not checked.
type Row map[string]any

// None is an empty list, for a measure whose expected value is an empty
// list.
var None = []string{}

// Rows fails t unless got has as many rows as want and every column each
// wanted row names has the wanted value (see Row).
func Rows(t testing.TB, got []map[string]any, want []Row) {
	t.Helper()
	if len(got) != len(want) {
		t.Fatalf("got %d rows, want %d:\n%s", len(got), len(want), Dump(got))
	}
	for i := range want {
		for k, w := range want[i] {
			g, ok := got[i][k]
			if !ok {
				t.Errorf("row %d has no %q: %v", i, k, got[i])
				continue
			}
			if !Same(g, w) {
				t.Errorf("row %d %s = %v, want %v\n%s", i, k, g, w, Dump(got))
			}
		}
	}
}

// Same reports whether the value got (decoded from JSON with UseNumber)
// equals the expected value w, read as Row says.
func Same(g, w any) bool {
	switch w := w.(type) {
	case nil:
		return g == nil
	case string:
		n, ok := g.(json.Number)
		if !ok {
			return g == w
		}
		a, err1 := decimal.NewFromString(n.String())
		b, err2 := decimal.NewFromString(w)
		return err1 == nil && err2 == nil && a.Equal(b)
	case float64:
		n, ok := g.(json.Number)
		if !ok {
			return false
		}
		f, err := n.Float64()
		return err == nil && math.Abs(f-w) <= 1e-9*math.Max(1, math.Abs(w))
	case int:
		n, ok := g.(json.Number)
		return ok && n.String() == fmt.Sprint(w)
	case []string:
		l, ok := g.([]any)
		if !ok || len(l) != len(w) {
			return false
		}
		for i := range w {
			if l[i] != w[i] {
				return false
			}
		}
		return true
	}
	return fmt.Sprint(g) == fmt.Sprint(w)
}

// Dump prints rows as indented JSON, for failure messages.
func Dump(rows []map[string]any) string {
	b, _ := json.MarshalIndent(rows, "", " ")
	return string(b)
}
