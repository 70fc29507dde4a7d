package reference

import (
	"math"
	"testing"
	"time"

	"github.com/shopspring/decimal"

	"github.com/rollwise/rollwise/planner"
)

func dec(s string) decimal.Decimal { return decimal.RequireFromString(s) }

// The aggregate rules of language.md: NULLs skipped, sum/avg/min/max of
// nothing NULL, count of nothing 0, the continuous median, the sample
// variance and standard deviation.
func TestAggregateRules(t *testing.T) {
	cases := []struct {
		fn       string
		distinct bool
		vals     []Value
		typ      planner.Type
		want     Value
	}{
		{"sum", false, []Value{nil, nil}, planner.TypeDecimal, nil},
		{"count", false, []Value{nil, nil}, planner.TypeInteger, dec("0")},
		{"avg", false, nil, planner.TypeFloat, nil},
		{"sum", false, []Value{dec("2.50"), nil, dec("0.25")}, planner.TypeDecimal, dec("2.75")},
		{"count", true, []Value{dec("2.50"), dec("2.5"), dec("1")}, planner.TypeInteger, dec("2")},  // 2.50 = 2.5
		{"median", false, []Value{dec("3"), dec("1"), dec("10"), dec("4")}, planner.TypeFloat, 3.5}, // (3+4)/2
		{"median", false, []Value{dec("3"), dec("1"), dec("10")}, planner.TypeFloat, 3.0},
		{"variance", false, []Value{dec("7")}, planner.TypeFloat, nil},                                   // one value: no sample variance
		{"variance", false, []Value{dec("1"), dec("2"), dec("3"), dec("4")}, planner.TypeFloat, 5.0 / 3}, // mean 2.5; 2.25+0.25+0.25+2.25 = 5; 5/3
		{"stddev", false, []Value{dec("2"), dec("4")}, planner.TypeFloat, math.Sqrt(2)},                  // mean 3; 1+1 = 2; 2/1
		{"min", false, []Value{"b", nil, "B", "a"}, planner.TypeText, "B"},                               // byte order: upper case first
		{"avg", false, []Value{dec("1"), dec("2")}, planner.TypeFloat, 1.5},
		{"sum", false, []Value{0.25, 0.5}, planner.TypeFloat, 0.75},
	}
	for _, c := range cases {
		got, err := aggregate(c.fn, c.distinct, c.vals, c.typ)
		if err != nil {
			t.Errorf("%s%v: %v", c.fn, c.vals, err)
			continue
		}
		if !sameValue(got, c.want) {
			t.Errorf("%s(distinct=%v) of %v = %v, want %v", c.fn, c.distinct, c.vals, got, c.want)
		}
	}
}

func sameValue(a, b Value) bool {
	switch x := b.(type) {
	case nil:
		return a == nil
	case float64:
		f, ok := a.(float64)
		return ok && math.Abs(f-x) <= 1e-12*math.Max(1, math.Abs(x))
	case decimal.Decimal:
		d, ok := a.(decimal.Decimal)
		return ok && d.Equal(x)
	}
	return a == b
}

// SQL's three-valued logic and NULL rules in operators and functions.
func TestScalarNullRules(t *testing.T) {
	lit := func(v string, ty planner.Type) planner.Expr { return &planner.Lit{T: ty, Text: v} }
	null := &planner.Lit{T: planner.TypeNull}
	one, two := lit("1", planner.TypeInteger), lit("2", planner.TypeInteger)
	cases := []struct {
		name string
		e    planner.Expr
		want Value
	}{
		{"2 in (1, null)", &planner.InExpr{X: two, List: []planner.Expr{one, null}}, nil},
		{"1 in (1, null)", &planner.InExpr{X: one, List: []planner.Expr{one, null}}, true},
		{"2 not in (1, null)", &planner.InExpr{X: two, List: []planner.Expr{one, null}, Not: true}, nil},
		{"null in (1)", &planner.InExpr{X: null, List: []planner.Expr{one}}, nil},
		{"1 / 0", &planner.BinOp{Op: "/", L: one, R: lit("0", planner.TypeInteger), T: planner.TypeFloat}, nil},
		{"1 / 2", &planner.BinOp{Op: "/", L: one, R: two, T: planner.TypeFloat}, 0.5},
		{"null and false", &planner.BinOp{Op: "and", L: null, R: lit("false", planner.TypeBoolean)}, false},
		{"null or true", &planner.BinOp{Op: "or", L: null, R: lit("true", planner.TypeBoolean)}, true},
		{"null or false", &planner.BinOp{Op: "or", L: null, R: lit("false", planner.TypeBoolean)}, nil},
		{"least(null, 2, 1)", &planner.Func{Name: "least", Args: []planner.Expr{null, two, one}}, dec("1")},
		{"nullif(1, 1)", &planner.Func{Name: "nullif", Args: []planner.Expr{one, one}}, nil},
		{"round(-2.5)", &planner.Func{Name: "round", Args: []planner.Expr{lit("-2.5", planner.TypeDecimal)}}, dec("-3")},
		{"null is null", &planner.IsNullExpr{X: null}, true},
		{"'a' || null", &planner.BinOp{Op: "||", L: lit("a", planner.TypeText), R: null, T: planner.TypeText}, nil},
	}
	for _, c := range cases {
		got, ok, err := scalar(c.e, func(x planner.Expr) (Value, error) {
			v, _, err := scalar(x, nil)
			return v, err
		})
		if !ok || err != nil {
			t.Errorf("%s: ok=%v err=%v", c.name, ok, err)
			continue
		}
		if !sameValue(got, c.want) {
			t.Errorf("%s = %v, want %v", c.name, got, c.want)
		}
	}
}

// date_trunc and extract use ISO weeks (Monday first) and quarters.
func TestDateParts(t *testing.T) {
	d := time.Date(2026, 1, 1, 15, 4, 0, 0, time.UTC) // a Thursday
	if got := truncate("week", d); !got.Equal(time.Date(2025, 12, 29, 0, 0, 0, 0, time.UTC)) {
		t.Errorf("week of 2026-01-01 starts %v, want Monday 2025-12-29", got)
	}
	if got := truncate("quarter", time.Date(2026, 5, 20, 0, 0, 0, 0, time.UTC)); got.Month() != time.April || got.Day() != 1 {
		t.Errorf("quarter of 2026-05-20 starts %v", got)
	}
	if v, _ := extract("week", d); !sameValue(v, dec("1")) {
		t.Errorf("ISO week of 2026-01-01 = %v, want 1", v)
	}
}
