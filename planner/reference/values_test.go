package reference

import (
	"math"
	"testing"
	"time"

	"github.com/shopspring/decimal"

	"github.com/rollwise/rollwise/planner/model"
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
		typ      model.Type
		want     Value
	}{
		{"sum", false, []Value{nil, nil}, model.TypeDecimal, nil},
		{"count", false, []Value{nil, nil}, model.TypeInteger, dec("0")},
		{"avg", false, nil, model.TypeFloat, nil},
		{"sum", false, []Value{dec("2.50"), nil, dec("0.25")}, model.TypeDecimal, dec("2.75")},
		{"count", true, []Value{dec("2.50"), dec("2.5"), dec("1")}, model.TypeInteger, dec("2")},  // 2.50 = 2.5
		{"median", false, []Value{dec("3"), dec("1"), dec("10"), dec("4")}, model.TypeFloat, 3.5}, // (3+4)/2
		{"median", false, []Value{dec("3"), dec("1"), dec("10")}, model.TypeFloat, 3.0},
		{"variance", false, []Value{dec("7")}, model.TypeFloat, nil},                                   // one value: no sample variance
		{"variance", false, []Value{dec("1"), dec("2"), dec("3"), dec("4")}, model.TypeFloat, 5.0 / 3}, // mean 2.5; 2.25+0.25+0.25+2.25 = 5; 5/3
		{"stddev", false, []Value{dec("2"), dec("4")}, model.TypeFloat, math.Sqrt(2)},                  // mean 3; 1+1 = 2; 2/1
		{"min", false, []Value{"b", nil, "B", "a"}, model.TypeText, "B"},                               // byte order: upper case first
		{"avg", false, []Value{dec("1"), dec("2")}, model.TypeFloat, 1.5},
		{"sum", false, []Value{0.25, 0.5}, model.TypeFloat, 0.75},
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
	lit := func(v string, ty model.Type) model.Expr { return &model.Lit{T: ty, Text: v} }
	null := &model.Lit{T: model.TypeNull}
	one, two := lit("1", model.TypeInteger), lit("2", model.TypeInteger)
	cases := []struct {
		name string
		e    model.Expr
		want Value
	}{
		{"2 in (1, null)", &model.InExpr{X: two, List: []model.Expr{one, null}}, nil},
		{"1 in (1, null)", &model.InExpr{X: one, List: []model.Expr{one, null}}, true},
		{"2 not in (1, null)", &model.InExpr{X: two, List: []model.Expr{one, null}, Not: true}, nil},
		{"null in (1)", &model.InExpr{X: null, List: []model.Expr{one}}, nil},
		{"1 / 0", &model.BinOp{Op: "/", L: one, R: lit("0", model.TypeInteger), T: model.TypeFloat}, nil},
		{"1 / 2", &model.BinOp{Op: "/", L: one, R: two, T: model.TypeFloat}, 0.5},
		{"null and false", &model.BinOp{Op: "and", L: null, R: lit("false", model.TypeBoolean)}, false},
		{"null or true", &model.BinOp{Op: "or", L: null, R: lit("true", model.TypeBoolean)}, true},
		{"null or false", &model.BinOp{Op: "or", L: null, R: lit("false", model.TypeBoolean)}, nil},
		{"least(null, 2, 1)", &model.Func{Name: "least", Args: []model.Expr{null, two, one}}, dec("1")},
		{"nullif(1, 1)", &model.Func{Name: "nullif", Args: []model.Expr{one, one}}, nil},
		{"round(-2.5)", &model.Func{Name: "round", Args: []model.Expr{lit("-2.5", model.TypeDecimal)}}, dec("-3")},
		{"null is null", &model.IsNullExpr{X: null}, true},
		{"'a' || null", &model.BinOp{Op: "||", L: lit("a", model.TypeText), R: null, T: model.TypeText}, nil},
	}
	for _, c := range cases {
		got, ok, err := scalar(c.e, func(x model.Expr) (Value, error) {
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
