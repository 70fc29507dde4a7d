package reference

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"

	"github.com/shopspring/decimal"

	"github.com/rollwise/rollwise/planner/model"
)

// subEval evaluates a child expression in the caller's context: a row for
// row expressions, a cell for measure expressions.
type subEval func(model.Expr) (Value, error)

// scalar evaluates the operators that row and measure expressions share
// (literals, arithmetic, comparisons, logic, functions, case, in, is
// null), with sub evaluating the operands. ok is false for any other node.
func scalar(e model.Expr, sub subEval) (v Value, ok bool, err error) {
	switch e := e.(type) {
	case *model.Lit:
		v, err = litValue(e)
		return v, true, err
	case *model.BinOp:
		v, err = binOp(e, sub)
		return v, true, err
	case *model.UnOp:
		x, err := sub(e.X)
		if err != nil || x == nil {
			return nil, true, err
		}
		if e.Op == "not" {
			b, isBool := x.(bool)
			if !isBool {
				return nil, true, fmt.Errorf("not of a %s value", kindOf(x))
			}
			return !b, true, nil
		}
		switch n := x.(type) {
		case decimal.Decimal:
			return n.Neg(), true, nil
		case float64:
			return -n, true, nil
		}
		return nil, true, fmt.Errorf("cannot negate a %s value", kindOf(x))
	case *model.Func:
		args := make([]Value, len(e.Args))
		for i, a := range e.Args {
			if args[i], err = sub(a); err != nil {
				return nil, true, err
			}
		}
		v, err = function(e, args)
		return v, true, err
	case *model.CaseExpr:
		for _, w := range e.Whens {
			c, err := sub(w.Cond)
			if err != nil {
				return nil, true, err
			}
			if truth(c) {
				v, err = sub(w.Then)
				return v, true, err
			}
		}
		if e.Else == nil {
			return nil, true, nil
		}
		v, err = sub(e.Else)
		return v, true, err
	case *model.InExpr:
		v, err = in(e, sub)
		return v, true, err
	case *model.IsNullExpr:
		x, err := sub(e.X)
		if err != nil {
			return nil, true, err
		}
		return (x == nil) != e.Not, true, nil
	}
	return nil, false, nil
}

func binOp(e *model.BinOp, sub subEval) (Value, error) {
	l, err := sub(e.L)
	if err != nil {
		return nil, err
	}
	r, err := sub(e.R)
	if err != nil {
		return nil, err
	}
	switch e.Op {
	case "and":
		return and3(l, r), nil
	case "or":
		return or3(l, r), nil
	case "=", "<>", "<", "<=", ">", ">=":
		return compareOp(e.Op, l, r)
	case "||":
		if l == nil || r == nil {
			return nil, nil
		}
		return text(l, e.L.Type()) + text(r, e.R.Type()), nil
	}
	return arith(e.Op, l, r, e.T)
}

// in is x [not] in (list) with SQL's NULL rules: NULL when x is NULL, or
// when no item matches and some item is NULL.
func in(e *model.InExpr, sub subEval) (Value, error) {
	x, err := sub(e.X)
	if err != nil || x == nil {
		return nil, err
	}
	sawNull := false
	for _, it := range e.List {
		v, err := sub(it)
		if err != nil {
			return nil, err
		}
		if v == nil {
			sawNull = true
			continue
		}
		c, err := compare(x, v)
		if err != nil {
			return nil, err
		}
		if c == 0 {
			return !e.Not, nil
		}
	}
	if sawNull {
		return nil, nil
	}
	return e.Not, nil
}

// function applies a scalar function to evaluated arguments.
func function(f *model.Func, args []Value) (Value, error) {
	switch f.Name {
	case "coalesce":
		for _, a := range args {
			if a != nil {
				return a, nil
			}
		}
		return nil, nil
	case "nullif":
		if args[0] == nil || args[1] == nil {
			return args[0], nil
		}
		c, err := compare(args[0], args[1])
		if err != nil {
			return nil, err
		}
		if c == 0 {
			return nil, nil
		}
		return args[0], nil
	case "abs":
		switch x := args[0].(type) {
		case decimal.Decimal:
			return x.Abs(), nil
		case float64:
			return math.Abs(x), nil
		}
		return nil, nil
	case "round":
		return round(args)
	case "least", "greatest":
		// NULL arguments are skipped, as in DuckDB and PostgreSQL.
		var best Value
		for _, a := range args {
			if a == nil {
				continue
			}
			if best == nil {
				best = a
				continue
			}
			c, err := compare(a, best)
			if err != nil {
				return nil, err
			}
			if (f.Name == "least" && c < 0) || (f.Name == "greatest" && c > 0) {
				best = a
			}
		}
		return best, nil
	case "lower", "upper":
		s, ok := args[0].(string)
		if !ok {
			return nil, nil
		}
		if f.Name == "lower" {
			return strings.ToLower(s), nil
		}
		return strings.ToUpper(s), nil
	case "cast":
		return cast(args[0], f.Args[0].Type(), f.CastTo)
	case "extract":
		return extract(f.Unit, args[0])
	case "date_trunc":
		t, ok := args[0].(time.Time)
		if !ok {
			return nil, nil
		}
		return truncate(f.Unit, t), nil
	}
	return nil, fmt.Errorf("unknown function %s", f.Name)
}

// round rounds half away from zero, to n places (default 0).
func round(args []Value) (Value, error) {
	if args[0] == nil || (len(args) == 2 && args[1] == nil) {
		return nil, nil
	}
	places := int32(0)
	if len(args) == 2 {
		d, ok := args[1].(decimal.Decimal)
		if !ok {
			return nil, fmt.Errorf("round takes a whole number of places")
		}
		places = int32(d.IntPart())
	}
	switch x := args[0].(type) {
	case decimal.Decimal:
		return x.Round(places), nil
	case float64:
		p := math.Pow(10, float64(places))
		return math.Round(x*p) / p, nil
	}
	return nil, fmt.Errorf("round of a %s value", kindOf(args[0]))
}

// cast converts v from type from to type to, as DuckDB does for the
// conversions the language needs (decimals hold six places; a decimal
// cast to integer rounds half away from zero, a float half to even).
func cast(v Value, from, to model.Type) (Value, error) {
	if v == nil {
		return nil, nil
	}
	switch to {
	case model.TypeInteger:
		switch x := v.(type) {
		case decimal.Decimal:
			return x.Round(0), nil
		case float64:
			return decimal.NewFromFloat(math.RoundToEven(x)), nil
		case string:
			d, err := decimal.NewFromString(strings.TrimSpace(x))
			if err != nil {
				return nil, fmt.Errorf("cannot cast %q to integer", x)
			}
			return d.Round(0), nil
		case bool:
			if x {
				return decimal.NewFromInt(1), nil
			}
			return decimal.NewFromInt(0), nil
		}
	case model.TypeDecimal:
		switch x := v.(type) {
		case decimal.Decimal:
			return x.Round(6), nil
		case float64:
			return decimal.NewFromFloat(x).Round(6), nil
		case string:
			d, err := decimal.NewFromString(strings.TrimSpace(x))
			if err != nil {
				return nil, fmt.Errorf("cannot cast %q to decimal", x)
			}
			return d.Round(6), nil
		}
	case model.TypeFloat:
		switch x := v.(type) {
		case decimal.Decimal, float64:
			return toFloat(x), nil
		case string:
			f, err := strconv.ParseFloat(strings.TrimSpace(x), 64)
			if err != nil {
				return nil, fmt.Errorf("cannot cast %q to float", x)
			}
			return f, nil
		}
	case model.TypeText:
		return text(v, from), nil
	case model.TypeDate:
		switch x := v.(type) {
		case time.Time:
			return truncate("day", x), nil
		case string:
			t, err := parseTime(strings.TrimSpace(x))
			if err != nil {
				return nil, err
			}
			return truncate("day", t), nil
		}
	case model.TypeTimestamp:
		switch x := v.(type) {
		case time.Time:
			return x, nil
		case string:
			return parseTime(strings.TrimSpace(x))
		}
	case model.TypeBoolean:
		switch x := v.(type) {
		case bool:
			return x, nil
		case string:
			return parseBool(x)
		case decimal.Decimal:
			return !x.IsZero(), nil
		}
	}
	return nil, fmt.Errorf("cannot cast a %s value to %s", kindOf(v), to)
}

func parseBool(s string) (bool, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "true", "t", "1", "yes", "y":
		return true, nil
	case "false", "f", "0", "no", "n":
		return false, nil
	}
	return false, fmt.Errorf("cannot read %q as a boolean", s)
}

// extract reads a date part: year, quarter, month, week (ISO) or day.
func extract(unit string, v Value) (Value, error) {
	t, ok := v.(time.Time)
	if !ok {
		return nil, nil
	}
	n := 0
	switch unit {
	case "year":
		n = t.Year()
	case "quarter":
		n = (int(t.Month())-1)/3 + 1
	case "month":
		n = int(t.Month())
	case "week":
		_, n = t.ISOWeek()
	case "day":
		n = t.Day()
	default:
		return nil, fmt.Errorf("unknown unit %s", unit)
	}
	return decimal.NewFromInt(int64(n)), nil
}

// truncate is date_trunc: the start of the day, ISO week (Monday),
// month, quarter or year.
func truncate(unit string, t time.Time) time.Time {
	t = t.UTC()
	day := time.Date(t.Year(), t.Month(), t.Day(), 0, 0, 0, 0, time.UTC)
	switch unit {
	case "week":
		back := (int(day.Weekday()) + 6) % 7
		return day.AddDate(0, 0, -back)
	case "month":
		return time.Date(t.Year(), t.Month(), 1, 0, 0, 0, 0, time.UTC)
	case "quarter":
		m := (int(t.Month())-1)/3*3 + 1
		return time.Date(t.Year(), time.Month(m), 1, 0, 0, 0, 0, time.UTC)
	case "year":
		return time.Date(t.Year(), 1, 1, 0, 0, 0, 0, time.UTC)
	}
	return day
}
