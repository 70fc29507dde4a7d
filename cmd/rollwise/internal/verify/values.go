package verify

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"

	"github.com/shopspring/decimal"
)

// DefaultTolerance is the relative tolerance used when --tolerance is not
// given: two values agree when they differ by at most
// DefaultTolerance * max(1, |a|, |b|). It absorbs the last-digit noise of
// floating-point sums added in a different order, and nothing a person
// would call a different number.
const DefaultTolerance = 1e-9

// Value is one measure value of a result row.
type Value struct {
	// Null is set for SQL NULL; the other fields are then zero.
	Null bool
	// Exact is set for integers and decimals, held in Dec. F holds the
	// value as a float either way.
	Exact bool
	Dec   decimal.Decimal
	F     float64
}

// Null is the NULL value.
var Null = Value{Null: true}

// exactValue makes an exact value.
func exactValue(d decimal.Decimal) Value {
	f, _ := d.Float64()
	return Value{Exact: true, Dec: d, F: f}
}

// floatValue makes an inexact value.
func floatValue(f float64) Value { return Value{F: f} }

// valueOf converts a normalised engine value. ok is false for values that
// are not numbers (text, booleans, dates).
func valueOf(v any) (Value, bool) {
	switch x := v.(type) {
	case nil:
		return Null, true
	case int64:
		return exactValue(decimal.NewFromInt(x)), true
	case decimal.Decimal:
		return exactValue(x), true
	case float64:
		return floatValue(x), true
	}
	return Value{}, false
}

// String shows the value to people: exact values in full, floats with ten
// significant digits.
func (v Value) String() string {
	switch {
	case v.Null:
		return "NULL"
	case v.Exact:
		return v.Dec.String()
	}
	return strconv.FormatFloat(v.F, 'g', 10, 64)
}

// JSON renders the value as a JSON literal at full precision (NaN and
// infinities, which JSON cannot hold, become null).
func (v Value) JSON() string {
	switch {
	case v.Null:
		return "null"
	case v.Exact:
		return v.Dec.String()
	case math.IsNaN(v.F) || math.IsInf(v.F, 0):
		return "null"
	}
	return strconv.FormatFloat(v.F, 'g', -1, 64)
}

// Agree reports whether two values are the same number: both NULL, or
// equal exactly when both are exact, or within the relative tolerance tol
// otherwise (|a-b| <= tol * max(1, |a|, |b|)).
func Agree(a, b Value, tol float64) bool {
	if a.Null || b.Null {
		return a.Null && b.Null
	}
	if a.Exact && b.Exact {
		return a.Dec.Equal(b.Dec)
	}
	if math.IsNaN(a.F) || math.IsNaN(b.F) {
		return math.IsNaN(a.F) && math.IsNaN(b.F)
	}
	if math.IsInf(a.F, 0) || math.IsInf(b.F, 0) {
		return a.F == b.F
	}
	return math.Abs(a.F-b.F) <= tol*math.Max(1, math.Max(math.Abs(a.F), math.Abs(b.F)))
}

// isZero reports whether v is the number 0.
func (v Value) isZero() bool { return !v.Null && v.F == 0 }

// keyText is a canonical text for a group value, so that the same value
// read from two queries (an integer as BIGINT or DECIMAL, a date as DATE
// or TIMESTAMP at midnight) gives the same key.
func keyText(v any) string {
	switch x := v.(type) {
	case nil:
		return "\x00null"
	case int64:
		return "n:" + strconv.FormatInt(x, 10)
	case decimal.Decimal:
		return "n:" + x.String()
	case float64:
		if x == math.Trunc(x) && math.Abs(x) < 1e15 {
			return "n:" + strconv.FormatInt(int64(x), 10)
		}
		return "n:" + decimal.NewFromFloat(x).String()
	case string:
		return "s:" + x
	case bool:
		return "b:" + strconv.FormatBool(x)
	case time.Time:
		return "t:" + showTime(x)
	}
	return fmt.Sprintf("?:%v", v)
}

// keyKind names the kind of a group value, for notes on columns whose
// values can never match.
func keyKind(v any) string {
	switch v.(type) {
	case nil:
		return ""
	case int64, decimal.Decimal, float64:
		return "numbers"
	case string:
		return "text"
	case bool:
		return "booleans"
	case time.Time:
		return "dates"
	}
	return fmt.Sprintf("%T", v)
}

// showKey shows a group value to people.
func showKey(v any) string {
	switch x := v.(type) {
	case nil:
		return "(null)"
	case decimal.Decimal:
		return x.String()
	case float64:
		return strconv.FormatFloat(x, 'g', -1, 64)
	case time.Time:
		return showTime(x)
	case string:
		return x
	}
	return fmt.Sprint(v)
}

// jsonKey renders a group value as a JSON literal.
func jsonKey(v any) string {
	switch x := v.(type) {
	case nil:
		return "null"
	case int64:
		return strconv.FormatInt(x, 10)
	case decimal.Decimal:
		return x.String()
	case float64:
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return "null"
		}
		return strconv.FormatFloat(x, 'g', -1, 64)
	case bool:
		return strconv.FormatBool(x)
	case time.Time:
		return strconv.Quote(showTime(x))
	case string:
		return strconv.Quote(x)
	}
	return strconv.Quote(fmt.Sprint(v))
}

func showTime(t time.Time) string {
	t = t.UTC()
	if t.Hour() == 0 && t.Minute() == 0 && t.Second() == 0 && t.Nanosecond() == 0 {
		return t.Format("2006-01-02")
	}
	return strings.TrimSuffix(t.Format("2006-01-02 15:04:05.999999999"), ".")
}
