package reference

import (
	"fmt"
	"math"
	"math/big"
	"strings"
	"time"

	"github.com/shopspring/decimal"

	"github.com/rollwise/rollwise/planner/model"
)

// Value is one value in the evaluator: nil (NULL), decimal.Decimal (every
// integer and decimal value, held exactly), float64, string, bool or
// time.Time (dates and timestamps, in UTC).
type Value = any

// litValue converts a literal to a value of its own type.
func litValue(l *model.Lit) (Value, error) {
	switch l.T {
	case model.TypeNull:
		return nil, nil
	case model.TypeInteger, model.TypeDecimal:
		d, err := decimal.NewFromString(l.Text)
		if err != nil {
			return nil, fmt.Errorf("literal %s: %v", l.Text, err)
		}
		return d, nil
	case model.TypeFloat:
		var f float64
		if _, err := fmt.Sscan(l.Text, &f); err != nil {
			return nil, fmt.Errorf("literal %s: %v", l.Text, err)
		}
		return f, nil
	case model.TypeText:
		return l.Text, nil
	case model.TypeBoolean:
		return l.Text == "true", nil
	case model.TypeDate, model.TypeTimestamp:
		return parseTime(l.Text)
	}
	return nil, fmt.Errorf("literal of unknown type %v", l.T)
}

// parseTime reads a date or a timestamp (with an optional zone offset,
// converted to UTC).
func parseTime(s string) (time.Time, error) {
	for _, layout := range []string{"2006-01-02", "2006-01-02 15:04:05", "2006-01-02T15:04:05",
		"2006-01-02 15:04", "2006-01-02 15:04:05Z07:00", "2006-01-02T15:04:05Z07:00",
		"2006-01-02 15:04:05.999999999", "2006-01-02 15:04:05.999999999Z07:00", time.RFC3339Nano} {
		if t, err := time.Parse(layout, s); err == nil {
			return t.UTC(), nil
		}
	}
	return time.Time{}, fmt.Errorf("cannot read %q as a date or timestamp", s)
}

func isNumber(v Value) bool {
	switch v.(type) {
	case decimal.Decimal, float64:
		return true
	}
	return false
}

// toFloat converts a number to float64 (as DuckDB casts a DECIMAL to
// DOUBLE).
func toFloat(v Value) float64 {
	switch x := v.(type) {
	case decimal.Decimal:
		f, _ := x.Float64()
		return f
	case float64:
		return x
	}
	return math.NaN()
}

// toRat converts an exact number to a rational, and a float to the
// rational it holds exactly.
func toRat(v Value) *big.Rat {
	switch x := v.(type) {
	case decimal.Decimal:
		return x.Rat()
	case float64:
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return nil
		}
		return new(big.Rat).SetFloat64(x)
	}
	return nil
}

func ratFloat(r *big.Rat) float64 {
	f, _ := r.Float64()
	return f
}

// compare orders two non-NULL values of comparable types: numbers by
// value (as floats when either is a float, as DuckDB does), text byte by
// byte, false before true, times by instant.
func compare(a, b Value) (int, error) {
	switch x := a.(type) {
	case decimal.Decimal:
		switch y := b.(type) {
		case decimal.Decimal:
			return x.Cmp(y), nil
		case float64:
			return cmpFloat(toFloat(x), y), nil
		}
	case float64:
		if isNumber(b) {
			return cmpFloat(x, toFloat(b)), nil
		}
	case string:
		if y, ok := b.(string); ok {
			return strings.Compare(x, y), nil
		}
	case bool:
		if y, ok := b.(bool); ok {
			switch {
			case x == y:
				return 0, nil
			case !x:
				return -1, nil
			}
			return 1, nil
		}
	case time.Time:
		if y, ok := b.(time.Time); ok {
			return x.Compare(y), nil
		}
	}
	return 0, fmt.Errorf("cannot compare %s with %s", kindOf(a), kindOf(b))
}

func cmpFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}

func kindOf(v Value) string {
	switch v.(type) {
	case nil:
		return "null"
	case decimal.Decimal:
		return "number"
	case float64:
		return "float"
	case string:
		return "text"
	case bool:
		return "boolean"
	case time.Time:
		return "time"
	}
	return fmt.Sprintf("%T", v)
}

// key is a canonical text for a value, equal for equal values: the key of
// group tuples, link lookups and count(distinct).
func key(v Value) string {
	switch x := v.(type) {
	case nil:
		return "\x00"
	case decimal.Decimal:
		return "n" + x.Rat().RatString()
	case float64:
		if r := toRat(x); r != nil {
			return "n" + r.RatString()
		}
		return fmt.Sprintf("f%v", x)
	case string:
		return "s" + x
	case bool:
		return fmt.Sprintf("b%v", x)
	case time.Time:
		return fmt.Sprintf("t%d", x.UnixNano())
	}
	return fmt.Sprintf("?%v", v)
}

// tupleKey joins the keys of several values.
func tupleKey(vs []Value) string {
	var b strings.Builder
	for _, v := range vs {
		k := key(v)
		fmt.Fprintf(&b, "%d:%s", len(k), k)
	}
	return b.String()
}

// truth reads a predicate's value: only TRUE passes.
func truth(v Value) bool {
	b, ok := v.(bool)
	return ok && b
}

// arith applies + - * / to two values; t is the static result type. A
// NULL operand gives NULL; / is fractional and NULL on a zero divisor.
func arith(op string, a, b Value, t model.Type) (Value, error) {
	if a == nil || b == nil {
		return nil, nil
	}
	if !isNumber(a) || !isNumber(b) {
		return nil, fmt.Errorf("cannot apply %s to %s and %s", op, kindOf(a), kindOf(b))
	}
	if op == "/" {
		return divide(a, b), nil
	}
	x, xok := a.(decimal.Decimal)
	y, yok := b.(decimal.Decimal)
	if xok && yok && t != model.TypeFloat {
		switch op {
		case "+":
			return x.Add(y), nil
		case "-":
			return x.Sub(y), nil
		case "*":
			return x.Mul(y), nil
		}
	}
	p, q := toFloat(a), toFloat(b)
	switch op {
	case "+":
		return p + q, nil
	case "-":
		return p - q, nil
	case "*":
		return p * q, nil
	}
	return nil, fmt.Errorf("unknown operator %s", op)
}

// divide is fractional division, NULL on a zero divisor. Exact operands
// are divided exactly and rounded once.
func divide(a, b Value) Value {
	if toFloat(b) == 0 {
		if r := toRat(b); r == nil || r.Sign() == 0 {
			return nil
		}
	}
	_, xok := a.(decimal.Decimal)
	_, yok := b.(decimal.Decimal)
	if xok && yok {
		return ratFloat(new(big.Rat).Quo(toRat(a), toRat(b)))
	}
	return toFloat(a) / toFloat(b)
}

// compareOp applies a comparison operator, NULL when either side is.
func compareOp(op string, a, b Value) (Value, error) {
	if a == nil || b == nil {
		return nil, nil
	}
	c, err := compare(a, b)
	if err != nil {
		return nil, err
	}
	switch op {
	case "=":
		return c == 0, nil
	case "<>":
		return c != 0, nil
	case "<":
		return c < 0, nil
	case "<=":
		return c <= 0, nil
	case ">":
		return c > 0, nil
	case ">=":
		return c >= 0, nil
	}
	return nil, fmt.Errorf("unknown comparison %s", op)
}

// and3 and or3 are three-valued logic.
func and3(a, b Value) Value {
	if a == false || b == false {
		return false
	}
	if a == nil || b == nil {
		return nil
	}
	return true
}

func or3(a, b Value) Value {
	if a == true || b == true {
		return true
	}
	if a == nil || b == nil {
		return nil
	}
	return false
}

// text renders a value as DuckDB casts it to VARCHAR (decimal columns
// hold six places).
func text(v Value, t model.Type) string {
	switch x := v.(type) {
	case decimal.Decimal:
		if t == model.TypeDecimal {
			return x.StringFixed(6)
		}
		return x.String()
	case float64:
		return fmt.Sprint(x)
	case string:
		return x
	case bool:
		return fmt.Sprint(x)
	case time.Time:
		if t == model.TypeDate {
			return x.Format(time.DateOnly)
		}
		return x.Format("2006-01-02 15:04:05")
	}
	return ""
}
