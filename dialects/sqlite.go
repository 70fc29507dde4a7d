package dialects

import (
	"strconv"

	"github.com/rollwise/rollwise/planner/model"
)

// sqlite is SQLite 3.39 or later (checked live against 3.54 through
// modernc.org/sqlite). Dates and timestamps are ISO 8601 text
// ('YYYY-MM-DD', 'YYYY-MM-DD HH:MM:SS'), which sorts and compares like the
// values (sqlite.org/lang_datefunc.html); decimals are 64-bit floats, as
// SQLite has no exact decimal type.
var sqlite = &Dialect{
	name: "sqlite",
	// No GROUPING SETS or ROLLUP (§4, checked); FILTER on aggregates (§5,
	// lang_aggfunc), NULLS LAST (3.30+).
	caps: Caps{FilterClause: true, NullsLast: true},
	// The storage classes a CAST converts to (lang_expr.html#castexpr);
	// REAL affinity for decimal columns, so that every value is a float
	// (NUMERIC affinity would store 10.00 as the integer 10).
	types: typeNames{integer: "INTEGER", decimal: "REAL", float: "REAL", text: "TEXT",
		date: "TEXT", timestamp: "TEXT", boolean: "INTEGER"},
	// Backquotes, which SQLite accepts for MySQL compatibility
	// (sqlite.org/lang_keywords.html) and always reads as an identifier,
	// where a double-quoted name that matches no column silently becomes a
	// string literal (sqlite.org/quirks.html#dblquote; checked: SELECT
	// "nosuch" returns 'nosuch'). A backquote inside is doubled.
	quotes: "``",
	// No DATE '...' literal: dates are text.
	date: "'%s'", timestamp: "'%s'",
	// No median or sample statistics built in (§7, §12: checked, "no such
	// function"). upper and lower change the case of ASCII letters only
	// (lang_corefunc.html#upper; checked: upper('ünï') is 'üNï'), so they
	// are refused, unless --approximate.
	refused: map[string]refusal{
		"median":   medianRefusal("SQLite has no median aggregate (its percentile extension is not built in by default)"),
		"stddev":   {construct: "the sample standard deviation", hint: "SQLite has no stddev or variance aggregate"},
		"variance": {construct: "the sample variance", hint: "SQLite has no stddev or variance aggregate"},
		"upper":    sqliteCase("upper"),
		"lower":    sqliteCase("lower"),
	},
	// integer / integer truncates in SQLite (§3, checked: 7/2 = 3).
	floatDivide: true,
	// Dates are converted by the date functions; a number is made an
	// integer by rounding first, as CAST(x AS INTEGER) truncates in SQLite
	// where DuckDB rounds (checked: a decimal 2.5 becomes 3).
	casts:          map[model.Type]string{model.TypeDate: "date(%s)", model.TypeTimestamp: "datetime(%s)"},
	roundToInteger: "round(%s)",
	// greatest and least are the scalar max and min, which return NULL
	// when any argument is NULL (lang_corefunc.html), so NULLs are stepped
	// over as DuckDB does.
	calls:           map[string]string{"greatest": "max", "least": "min"},
	nullsInExtremes: true,
	dateTrunc:       sqliteDateTrunc,
	extract:         sqliteExtract,
	moveDate:        sqliteMoveDate,
	// IS compares NULLs as equal (lang_expr.html; IS NOT DISTINCT FROM
	// only from 3.39).
	nullSafeEqual: "IS",
	// SQLite's query flattener otherwise copies each expression of a layer
	// into every place that reads its column (checked: 0.9 s for a 25-deep
	// layered block, 18 s for 35 deep; with MATERIALIZED, SQLite 3.35+,
	// sqlite.org/lang_with.html#materialization_hints, milliseconds).
	materialize: true,
	// No replace form: DROP VIEW IF EXISTS, then CREATE VIEW (§11).
	view: ViewDDL{Style: DropAndCreate, OrderBy: true, ColumnList: true},
}

// sqliteCase refuses upper or lower beyond ASCII, which --approximate
// accepts.
func sqliteCase(fn string) refusal {
	return refusal{construct: fn + "() of non-ASCII letters",
		hint:        "SQLite changes the case of ASCII letters only; pass --approximate to accept that",
		approximate: "SQLite's upper and lower change the case of ASCII letters only"}
}

// sqliteDateTrunc uses the date function modifiers (lang_datefunc.html):
// weeks start on Monday as in DuckDB ('-6 days' then 'weekday 1', the
// next Monday on or after); a quarter steps back (month - 1) % 3 months.
func sqliteDateTrunc(unit, arg string, t model.Type) string {
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

// sqliteExtract uses strftime; %V is the ISO week, as DuckDB's week (3.46+).
func sqliteExtract(unit, arg string) string {
	switch unit {
	case "quarter":
		return "((CAST(strftime('%m', " + arg + ") AS INTEGER) + 2) / 3)"
	case "week":
		return "CAST(strftime('%V', " + arg + ") AS INTEGER)"
	}
	f := map[string]string{"year": "%Y", "month": "%m", "day": "%d"}[unit]
	return "CAST(strftime('" + f + "', " + arg + ") AS INTEGER)"
}

// sqliteMoveDate uses the date function modifiers
// (sqlite.org/lang_datefunc.html). Their month arithmetic rolls over
// (January 31 plus 1 month is March 3), so a month move goes to the target
// month's first day and adds the original day less one, at most the
// target month's last day less one. A timestamp keeps its time of day (to
// the millisecond).
func sqliteMoveDate(arg string, n int, unit string, t model.Type) string {
	var day string
	if unit == "day" {
		day = "date(" + arg + ", '" + strconv.Itoa(n) + " days')"
	} else {
		last := "CAST(strftime('%d', date(" + arg + ", 'start of month', '" + strconv.Itoa(n+1) + " months', '-1 day')) AS INTEGER)"
		day = "date(" + arg + ", 'start of month', '" + strconv.Itoa(n) + " months', '+' || (MIN(CAST(strftime('%d', " + arg + ") AS INTEGER), " + last + ") - 1) || ' days')"
	}
	if t == model.TypeTimestamp {
		return "strftime('%Y-%m-%d %H:%M:%f', " + day + " || ' ' || strftime('%H:%M:%f', " + arg + "))"
	}
	return day
}
