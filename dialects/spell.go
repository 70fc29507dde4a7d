package dialects

import (
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// The spellings, read from a dialect's description. Each returns SQL text
// built only from its arguments (already rendered SQL) and from values it
// quotes itself.

// Name is the dialect's name on the command line.
func (d *Dialect) Name() string { return d.name }

// Caps are the constructs the renderer consults.
func (d *Dialect) Caps() Caps { return d.caps }

// ViewDDL is how the dialect creates views.
func (d *Dialect) ViewDDL() ViewDDL { return d.view }

// WithViewDDL returns d's spellings with o's view statements, under o's
// name, so that o's view scripts can be tried on d's engine (the tests run
// SQL Server's and SQLite's on the embedded DuckDB).
func (d *Dialect) WithViewDDL(o *Dialect) *Dialect {
	c := *d
	c.name, c.view = o.name, o.view
	return &c
}

// Ident quotes an identifier.
func (d *Dialect) Ident(name string) string {
	if d.ident != nil {
		return d.ident(name)
	}
	open, close := `"`, `"`
	if d.quotes != "" {
		open, close = d.quotes[:1], d.quotes[1:]
	}
	return open + strings.ReplaceAll(name, close, close+close) + close
}

// ansiString doubles a quote inside a '...' literal.
var ansiString = strings.NewReplacer("'", "''")

// String renders a string literal.
func (d *Dialect) String(s string) string {
	switch {
	case d.str != nil:
		return d.str(s)
	case d.escape != nil:
		return "'" + d.escape.Replace(s) + "'"
	}
	return "'" + ansiString.Replace(s) + "'"
}

// Date and Timestamp render date and timestamp literals (already
// validated as YYYY-MM-DD[ HH:MM:SS]).
func (d *Dialect) Date(s string) string { return fill(or(d.date, "DATE '%s'"), s) }

// Timestamp renders a timestamp literal; see Date.
func (d *Dialect) Timestamp(s string) string { return fill(or(d.timestamp, "TIMESTAMP '%s'"), s) }

// or is s, or def when s is "".
func or(s, def string) string {
	if s == "" {
		return def
	}
	return s
}

// Bool renders the literal true or false.
func (d *Dialect) Bool(v bool) string {
	i := 0
	if v {
		i = 1
	}
	if d.bools[i] != "" {
		return d.bools[i]
	}
	return [2]string{"FALSE", "TRUE"}[i]
}

// TypeName is the SQL type for casts.
func (d *Dialect) TypeName(t model.Type) string { return d.types.of(t) }

// ColumnType is the SQL type of a stored column in CREATE TABLE.
func (d *Dialect) ColumnType(t model.Type) string {
	if d.columns != nil {
		return d.columns.of(t)
	}
	return d.types.of(t)
}

// Cast converts an already rendered value of type from to type to.
func (d *Dialect) Cast(arg string, from, to model.Type) string {
	if c, ok := d.casts[to]; ok {
		return fill(c, arg)
	}
	if to == model.TypeInteger && (from == model.TypeDecimal || from == model.TypeFloat) && d.roundToInteger != "" {
		arg = fill(d.roundToInteger, arg)
	}
	return d.castTo(arg, to)
}

func (d *Dialect) castTo(arg string, to model.Type) string {
	return "CAST(" + arg + " AS " + d.TypeName(to) + ")"
}

// Agg spells an aggregate call over an already rendered argument ("" for
// count(*)). It refuses, with an *UnsupportedError, an aggregate the
// engine cannot compute exactly.
func (d *Dialect) Agg(fn string, distinct bool, arg string) (string, error) {
	if arg == "" {
		if d.countAll != "" {
			return d.countAll, nil
		}
		return "count(*)", nil
	}
	spelling, ok := d.aggs[fn]
	if !ok {
		if r, refused := d.refused[fn]; refused {
			return "", d.refuse(r)
		}
		spelling = fn + "(%s)"
	}
	if distinct {
		return fill(strings.Replace(spelling, "%f", "%s", 1), "DISTINCT "+arg), nil
	}
	return d.fillArg(spelling, arg), nil
}

// fillArg puts arg in place of %s, or arg made a float in place of %f.
func (d *Dialect) fillArg(spelling, arg string) string {
	if strings.Contains(spelling, "%f") {
		return strings.Replace(spelling, "%f", d.castTo(arg, model.TypeFloat), 1)
	}
	return fill(spelling, arg)
}

// fill puts s in place of the %s of template.
func fill(template, s string) string { return strings.Replace(template, "%s", s, 1) }

func (d *Dialect) refuse(r refusal) error {
	return &UnsupportedError{Dialect: d.name, Construct: r.construct, Hint: r.hint}
}

// exactMedian reports whether the engine has an exact median aggregate.
func (d *Dialect) exactMedian() bool {
	_, ok := d.aggs["median"]
	return ok
}

// Divide spells fractional division that gives NULL on a zero divisor.
func (d *Dialect) Divide(l, r string) string {
	if d.floatDivide {
		l = d.castTo(l, model.TypeFloat)
	}
	return l + " / NULLIF(" + r + ", 0)"
}

// DateTrunc spells date_trunc(unit, arg) of an argument of type t.
func (d *Dialect) DateTrunc(unit, arg string, t model.Type) string {
	return d.dateTrunc(unit, arg, t)
}

// Extract spells extract(unit from arg).
func (d *Dialect) Extract(unit, arg string) string {
	if d.extract != nil {
		return d.extract(unit, arg)
	}
	if unit == "week" && d.weekUnit != "" {
		unit = d.weekUnit
	}
	return "EXTRACT(" + strings.ToUpper(unit) + " FROM " + arg + ")"
}

// BitAnd spells a & b on integers.
func (d *Dialect) BitAnd(a, b string) string {
	if d.bitAnd != "" {
		return d.bitAnd + "(" + a + ", " + b + ")"
	}
	return "(" + a + " & " + b + ")"
}

// NullSafeEqual spells equality that treats two NULLs as equal.
func (d *Dialect) NullSafeEqual(a, b string) string {
	if d.nullSafeEqual != "" {
		return a + " " + d.nullSafeEqual + " " + b
	}
	return a + " IS NOT DISTINCT FROM " + b
}

// Concat spells the text concatenation a || b (NULL if either is).
func (d *Dialect) Concat(a, b string) string {
	if d.concat != nil {
		return d.concat(a, b)
	}
	return "(" + a + " || " + b + ")"
}

// Call spells a scalar function of the language (coalesce, nullif, abs,
// round, least, greatest, lower, upper) with DuckDB's meaning; types are
// the arguments' types. It refuses, with an *UnsupportedError, a function
// the engine cannot compute exactly.
func (d *Dialect) Call(name string, args []string, types []model.Type) (string, error) {
	if r, ok := d.refused[name]; ok {
		return "", d.refuse(r)
	}
	if d.call != nil {
		if s, ok := d.call(name, args, types); ok {
			return s, nil
		}
	}
	fn := name
	if n, ok := d.calls[name]; ok {
		fn = n
	}
	if d.nullsInExtremes && (name == "greatest" || name == "least") {
		return nullIgnoring(fn, args), nil
	}
	return plainCall(fn, args), nil
}

// GroupingID spells the grouping id of quoted group keys: a bit mask of
// the rolled-up keys, the last key the lowest bit.
func (d *Dialect) GroupingID(keys []string) string {
	fn := d.grouping
	if fn == "" {
		fn = "GROUPING"
	}
	if !d.groupingOneKey || len(keys) == 1 {
		return fn + "(" + strings.Join(keys, ", ") + ")"
	}
	parts := make([]string, len(keys))
	for i, k := range keys {
		parts[i] = fmt.Sprintf("%s(%s) * %d", fn, k, uint64(1)<<(len(keys)-1-i))
		if i == len(keys)-1 {
			parts[i] = fn + "(" + k + ")"
		}
	}
	return "(" + strings.Join(parts, " + ") + ")"
}

// Limit returns what goes after SELECT (top) or at the end of the
// statement (tail) to keep the first n rows.
func (d *Dialect) Limit(n int) (top, tail string) {
	if d.top {
		return fmt.Sprintf("TOP (%d)", n), ""
	}
	return "", fmt.Sprintf("LIMIT %d", n)
}

// BoolValue turns a predicate into a value that can be selected (NULL
// when the predicate is unknown).
func (d *Dialect) BoolValue(pred string) string {
	if d.noBoolValues {
		return "CASE WHEN " + pred + " THEN 1 WHEN NOT (" + pred + ") THEN 0 END"
	}
	return pred
}

// Truth turns a value made by BoolValue (or a boolean column) back into a
// predicate.
func (d *Dialect) Truth(value string) string {
	if d.noBoolValues {
		return "(" + value + " = 1)"
	}
	return value
}
