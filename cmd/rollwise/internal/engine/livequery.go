package engine

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"

	"github.com/rollwise/rollwise/planner/model"
	"github.com/shopspring/decimal"
)

// typeOfColumn reads a result column's logical type from the type the
// server reports, for a query whose types nobody else knows (a handwritten
// SQL file): TypeNull keeps the driver's value.
func typeOfColumn(name string) model.Type {
	n := strings.ToUpper(name)
	switch {
	case strings.Contains(n, "INT"):
		return model.TypeInteger
	case strings.Contains(n, "NUMERIC"), strings.Contains(n, "DECIMAL"):
		return model.TypeDecimal
	case strings.Contains(n, "FLOAT"), strings.Contains(n, "DOUBLE"), strings.Contains(n, "REAL"):
		return model.TypeFloat
	case n == "DATE":
		return model.TypeDate
	case strings.Contains(n, "TIMESTAMP"), n == "DATETIME":
		return model.TypeTimestamp
	case strings.Contains(n, "BOOL"):
		return model.TypeBoolean
	case strings.Contains(n, "CHAR"), strings.Contains(n, "TEXT"):
		return model.TypeText
	}
	return model.TypeNull
}

// liveValue converts a driver value to the Go type Result promises for a
// column of logical type want. dbType is the driver's type name, for
// messages.
func liveValue(v any, dbType string, want model.Type) (any, error) {
	if b, ok := v.([]byte); ok {
		v = string(b)
	}
	if v == nil {
		return nil, nil
	}
	if want == model.TypeNull {
		return normalize(v, dbType)
	}
	var out any
	var err error
	switch want {
	case model.TypeInteger:
		out, err = toInteger(v)
	case model.TypeDecimal:
		out, err = toDecimal(v)
	case model.TypeFloat:
		out, err = toFloat(v)
	case model.TypeText:
		out, err = toText(v)
	case model.TypeDate:
		var t time.Time
		t, err = toTime(v)
		out = time.Date(t.Year(), t.Month(), t.Day(), 0, 0, 0, 0, time.UTC)
	case model.TypeTimestamp:
		out, err = toTime(v)
	case model.TypeBoolean:
		out, err = toBool(v)
	default:
		return normalize(v, dbType)
	}
	if err != nil {
		return nil, fmt.Errorf("cannot read %v (%s) as %s: %v", v, dbType, want, err)
	}
	return out, nil
}

// asNumber reads the numeric driver values: integers, floats and decimal
// text. It returns exactly one of an int64, a float64 or a decimal.
func asNumber(v any) (any, error) {
	switch x := v.(type) {
	case int64:
		return x, nil
	case int32, int16, int8, int, uint8, uint16, uint32, uint64, float32:
		return normalize(x, "")
	case float64:
		return x, nil
	case decimal.Decimal:
		return x, nil
	case bool:
		if x {
			return int64(1), nil
		}
		return int64(0), nil
	case string:
		s := strings.TrimSpace(x)
		if i, err := strconv.ParseInt(s, 10, 64); err == nil {
			return i, nil
		}
		if d, err := decimal.NewFromString(s); err == nil {
			return d, nil
		}
		if f, err := strconv.ParseFloat(s, 64); err == nil {
			return f, nil // NaN, Infinity
		}
		return nil, fmt.Errorf("not a number")
	}
	return nil, fmt.Errorf("a %T is not a number", v)
}

func toInteger(v any) (any, error) {
	n, err := asNumber(v)
	if err != nil {
		return nil, err
	}
	switch x := n.(type) {
	case int64:
		return x, nil
	case float64:
		if x != math.Trunc(x) || math.Abs(x) > 1<<53 {
			return nil, fmt.Errorf("not a whole number")
		}
		return int64(x), nil
	}
	d := n.(decimal.Decimal)
	if !d.IsInteger() {
		return nil, fmt.Errorf("not a whole number")
	}
	if d.BigInt().IsInt64() {
		return d.IntPart(), nil
	}
	// Wider than 64 bits (a sum of big integers): exact, as DuckDB's
	// HUGEINT results are.
	return d, nil
}

func toDecimal(v any) (any, error) {
	n, err := asNumber(v)
	if err != nil {
		return nil, err
	}
	switch x := n.(type) {
	case int64:
		return decimal.NewFromInt(x), nil
	case float64:
		// SQLite keeps decimals as floats: the shortest decimal that
		// reads back as the same float.
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return x, nil
		}
		return decimal.NewFromFloat(x), nil
	}
	return n, nil
}

func toFloat(v any) (any, error) {
	n, err := asNumber(v)
	if err != nil {
		return nil, err
	}
	switch x := n.(type) {
	case int64:
		return float64(x), nil
	case decimal.Decimal:
		f, _ := x.Float64()
		return f, nil
	}
	return n, nil
}

func toText(v any) (any, error) {
	switch x := v.(type) {
	case string:
		return x, nil
	case time.Time:
		return nil, fmt.Errorf("a time is not text")
	}
	n, err := normalize(v, "")
	if err != nil {
		return nil, err
	}
	return fmt.Sprint(n), nil
}

// timeLayouts are the text forms of dates and timestamps the engines send:
// ISO dates, SQL timestamps with or without fractions, RFC 3339.
var timeLayouts = []string{time.DateOnly, "2006-01-02 15:04:05.999999999", time.RFC3339Nano, "2006-01-02 15:04:05.999999999Z07:00"}

func toTime(v any) (time.Time, error) {
	switch x := v.(type) {
	case time.Time:
		return x.UTC(), nil
	case string:
		s := strings.TrimSpace(x)
		for _, layout := range timeLayouts {
			if t, err := time.Parse(layout, s); err == nil {
				return t.UTC(), nil
			}
		}
		return time.Time{}, fmt.Errorf("not a date or timestamp")
	}
	return time.Time{}, fmt.Errorf("a %T is not a date or timestamp", v)
}

func toBool(v any) (any, error) {
	switch x := v.(type) {
	case bool:
		return x, nil
	case string:
		switch strings.ToLower(strings.TrimSpace(x)) {
		case "1", "t", "true":
			return true, nil
		case "0", "f", "false":
			return false, nil
		}
		return nil, fmt.Errorf("not a boolean")
	}
	n, err := asNumber(v)
	if err != nil {
		return nil, err
	}
	switch n {
	case int64(1):
		return true, nil
	case int64(0):
		return false, nil
	}
	return nil, fmt.Errorf("not 0 or 1")
}
