package dialects

import (
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// sqlite is SQLite 3.39 or later (checked live against 3.54 through
// modernc.org/sqlite). Dates and timestamps are ISO 8601 text
// ('YYYY-MM-DD', 'YYYY-MM-DD HH:MM:SS'), which sorts and compares like the
// values (sqlite.org/lang_datefunc.html); decimals are 64-bit floats, as
// SQLite has no exact decimal type.
type sqlite struct{ ansi }

func (sqlite) Name() string { return "sqlite" }

// Caps: no GROUPING SETS or ROLLUP (§4, checked); FILTER on aggregates
// (§5, lang_aggfunc), NULLS LAST (3.30+), FULL OUTER JOIN (3.39+); no
// median or sample statistics built in (§7, §12: checked, "no such
// function").
func (sqlite) Caps() Caps {
	return Caps{FilterClause: true, NullsLast: true, PredicateValues: true, FullOuterJoin: true}
}

// Ident quotes with backquotes, which SQLite accepts for MySQL
// compatibility (sqlite.org/lang_keywords.html) and always reads as an
// identifier, where a double-quoted name that matches no column silently
// becomes a string literal (sqlite.org/quirks.html#dblquote; checked:
// SELECT "nosuch" returns 'nosuch'). A backquote inside is doubled.
func (sqlite) Ident(name string) string { return "`" + strings.ReplaceAll(name, "`", "``") + "`" }

// Date and Timestamp: SQLite has no DATE '...' literal; dates are text.
func (d sqlite) Date(s string) string      { return d.String(s) }
func (d sqlite) Timestamp(s string) string { return d.String(s) }

// TypeName names the storage class a CAST converts to (lang_expr.html#castexpr).
func (sqlite) TypeName(t model.Type) string {
	switch t {
	case model.TypeInteger, model.TypeBoolean:
		return "INTEGER"
	case model.TypeDecimal, model.TypeFloat:
		return "REAL"
	}
	return "TEXT"
}

// ColumnType: REAL affinity for decimals, so that every value is a float
// (NUMERIC affinity would store 10.00 as the integer 10).
func (d sqlite) ColumnType(t model.Type) string { return d.TypeName(t) }

// Cast: dates are converted by the date functions; a number is made an
// integer by rounding first, as CAST(x AS INTEGER) truncates in SQLite
// where DuckDB rounds (checked: a decimal 2.5 becomes 3).
func (d sqlite) Cast(arg string, from, to model.Type) string {
	switch {
	case to == model.TypeDate:
		return "date(" + arg + ")"
	case to == model.TypeTimestamp:
		return "datetime(" + arg + ")"
	case to == model.TypeInteger && (from == model.TypeDecimal || from == model.TypeFloat):
		return "CAST(round(" + arg + ") AS INTEGER)"
	}
	return castWith(d, arg, to)
}

// Agg refuses the median and the sample statistics, which SQLite lacks.
func (d sqlite) Agg(fn string, distinct bool, arg string) (string, error) {
	switch {
	case arg == "":
		return "count(*)", nil
	case distinct:
		return fn + "(DISTINCT " + arg + ")", nil
	case fn == "median":
		return "", &UnsupportedError{Dialect: d.Name(), Construct: "a median",
			Hint: "SQLite has no median aggregate (its percentile extension is not built in by default): Render numbers the rows instead (render_median.go)"}
	case fn == "stddev" || fn == "variance":
		return "", &UnsupportedError{Dialect: d.Name(), Construct: "the sample " + map[string]string{"stddev": "standard deviation", "variance": "variance"}[fn],
			Hint: "SQLite has no stddev or variance aggregate"}
	}
	return fn + "(" + arg + ")", nil
}

// Divide: integer / integer truncates in SQLite (§3, checked: 7/2 = 3).
func (sqlite) Divide(l, r string) string {
	return "CAST(" + l + " AS REAL) / NULLIF(" + r + ", 0)"
}

// DateTrunc uses the date function modifiers (lang_datefunc.html): weeks
// start on Monday as in DuckDB ('-6 days' then 'weekday 1', the next
// Monday on or after); a quarter steps back (month - 1) % 3 months.
func (sqlite) DateTrunc(unit, arg string, t model.Type) string {
	fn := "date"
	if t == model.TypeTimestamp {
		fn = "datetime"
	}
	switch unit {
	case "day":
		if t == model.TypeTimestamp {
			return "datetime(" + arg + ", 'start of day')"
		}
		return "date(" + arg + ")"
	case "week":
		return fn + "(" + arg + ", 'start of day', '-6 days', 'weekday 1')"
	case "month":
		return fn + "(" + arg + ", 'start of month')"
	case "quarter":
		return fn + "(" + arg + ", 'start of month', '-' || ((CAST(strftime('%m', " + arg + ") AS INTEGER) - 1) % 3) || ' months')"
	}
	return fn + "(" + arg + ", 'start of year')"
}

// Extract uses strftime; %V is the ISO week, as DuckDB's week (3.46+).
func (sqlite) Extract(unit, arg string) string {
	switch unit {
	case "quarter":
		return "((CAST(strftime('%m', " + arg + ") AS INTEGER) + 2) / 3)"
	case "week":
		return "CAST(strftime('%V', " + arg + ") AS INTEGER)"
	}
	f := map[string]string{"year": "%Y", "month": "%m", "day": "%d"}[unit]
	return "CAST(strftime('" + f + "', " + arg + ") AS INTEGER)"
}

// NullSafeEqual: IS compares NULLs as equal (lang_expr.html; IS NOT
// DISTINCT FROM only from 3.39).
func (sqlite) NullSafeEqual(a, b string) string { return a + " IS " + b }

// Call: SQLite spells greatest and least as the scalar max and min, which
// return NULL when any argument is NULL (lang_corefunc.html), so NULLs
// are stepped over as DuckDB does. Its upper and lower change the case of
// ASCII letters only (lang_corefunc.html#upper; checked: upper('ünï') is
// 'üNï'), so they are refused, unless --approximate.
func (d sqlite) Call(name string, args []string, _ []model.Type) (string, error) {
	switch name {
	case "upper", "lower":
		return "", &UnsupportedError{Dialect: d.Name(), Construct: name + "() of non-ASCII letters",
			Hint: "SQLite changes the case of ASCII letters only; pass --approximate to accept that"}
	case "greatest":
		return nullIgnoring("max", args), nil
	case "least":
		return nullIgnoring("min", args), nil
	}
	return plainCall(name, args), nil
}

// approxCall: upper and lower for ASCII letters only.
func (sqlite) approxCall(name string, args []string, _ []model.Type) (string, string, bool) {
	if name == "upper" || name == "lower" {
		return plainCall(name, args), "SQLite's upper and lower change the case of ASCII letters only", true
	}
	return "", "", false
}

// Fence writes a layer AS MATERIALIZED (SQLite 3.35+,
// sqlite.org/lang_with.html#materialization_hints): SQLite's query
// flattener otherwise copies each expression of a layer into every place
// that reads its column (checked: 0.9 s for a 25-deep layered block, 18 s
// for 35 deep; with MATERIALIZED milliseconds).
func (sqlite) Fence(name, body string) string { return name + " AS MATERIALIZED (\n" + body + "\n)" }
