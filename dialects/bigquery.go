package dialects

import (
	"fmt"
	"strconv"
	"strings"
	"unicode"

	"github.com/rollwise/rollwise/planner/model"
)

// bigquery is BigQuery (GoogleSQL).
var bigquery = &Dialect{
	name: "bigquery",
	// GROUPING SETS (§4); no FILTER clause (§5); NULLS LAST is supported.
	caps: Caps{GroupingSets: true, NullsLast: true},
	// NUMERIC: 38 digits, 9 after the point (zetasql data-types).
	// Rollwise timestamps carry no time zone; GoogleSQL's DATETIME is the
	// civil date and time, its TIMESTAMP an instant.
	types: typeNames{integer: "INT64", decimal: "NUMERIC", float: "FLOAT64", text: "STRING",
		date: "DATE", timestamp: "DATETIME", boolean: "BOOL"},
	// Backquotes, escaping as in strings (§1).
	ident: func(name string) string { return bqEscape(name, '`') },
	// '' is not an escape in GoogleSQL (two adjacent literals), \' is (§2).
	str:       func(s string) string { return bqEscape(s, '\'') },
	timestamp: "DATETIME '%s'",
	// avg of a NUMERIC is a NUMERIC, so the inputs of avg and the
	// statistics are made FLOAT64, as DuckDB computes them (zetasql
	// aggregate_functions.md, statistical_aggregate_functions.md).
	aggs: sampleStats(nil),
	// The exact PERCENTILE_CONT is a window function only; the aggregate
	// median is the middle of 2 APPROX_QUANTILES (§7, zetasql
	// approximate_aggregate_functions.md#approx_quantiles).
	refused:      map[string]refusal{"median": medianRefusal("PERCENTILE_CONT is a window function only in BigQuery")},
	approxMedian: "APPROX_QUANTILES(%s, 2)[OFFSET(1)]",
	// INT64 / INT64 is FLOAT64 but NUMERIC / NUMERIC is NUMERIC, and a
	// zero divisor is an error (§3).
	floatDivide: true,
	// GREATEST and LEAST return NULL when an argument is NULL (zetasql
	// mathematical_functions.md), so NULLs are stepped over as DuckDB does.
	calls:           map[string]string{"greatest": "GREATEST", "least": "LEAST"},
	nullsInExtremes: true,
	// The part comes second, unquoted (§9); DATETIME values use
	// DATETIME_TRUNC; WEEK starts on Sunday, ISOWEEK on Monday as in
	// DuckDB (zetasql date_functions.md#date_trunc).
	dateTrunc: func(unit, arg string, t model.Type) string {
		part := strings.ToUpper(unit)
		if unit == "week" {
			part = "ISOWEEK"
		}
		if t == model.TypeTimestamp {
			return "DATETIME_TRUNC(" + arg + ", " + part + ")"
		}
		return "DATE_TRUNC(" + arg + ", " + part + ")"
	},
	// ISOWEEK is the ISO week (WEEK counts Sunday-based weeks).
	weekUnit: "isoweek",
	// DATE_ADD (DATETIME_ADD for timestamps, which are DATETIME here);
	// both clamp a month move to the month's last day (cloud.google.com,
	// "Date functions", DATE_ADD).
	moveDate: func(arg string, n int, unit string, t model.Type) string {
		fn := "DATE_ADD"
		if t == model.TypeTimestamp {
			fn = "DATETIME_ADD"
		}
		return fn + "(" + arg + ", INTERVAL " + strconv.Itoa(n) + " " + strings.ToUpper(unit) + ")"
	},
	// GROUPING takes one argument (§4), so the mask is summed from one bit
	// per key.
	groupingOneKey: true,
	columnName:     bigqueryColumnName,
	view:           ViewDDL{Style: CreateOrReplace, OrderBy: true, ColumnList: true},
}

// bqEscape escapes text for a quoted GoogleSQL token whose delimiter is
// quote: backslash starts an escape sequence, and a quoted string or
// identifier cannot hold a newline (github.com/google/zetasql
// docs/lexical.md: string literals, escape sequences; quoted identifiers
// "have the same escape sequences as string literals"). Other control
// characters are written \uXXXX.
func bqEscape(s string, quote byte) string {
	var b strings.Builder
	b.WriteByte(quote)
	for _, r := range s {
		switch {
		case r == '\\':
			b.WriteString(`\\`)
		case r == rune(quote):
			b.WriteByte('\\')
			b.WriteByte(quote)
		case r == '\n':
			b.WriteString(`\n`)
		case r == '\r':
			b.WriteString(`\r`)
		case r == '\t':
			b.WriteString(`\t`)
		case r < 0x20 || r == 0x7f:
			fmt.Fprintf(&b, `\u%04x`, r)
		default:
			b.WriteRune(r)
		}
	}
	b.WriteByte(quote)
	return b.String()
}

// bigqueryColumnName: BigQuery column names hold letters, digits and
// underscores only (cloud.google.com/bigquery/docs/schemas), so the
// report's key columns, named after references such as plants.family or
// "sales.receipt_id per", are spelled plants__family and
// sales__receipt_id_per. The JSON and table output keep the names as
// written: only the SQL spells them so.
func bigqueryColumnName(name string) string {
	var b strings.Builder
	for _, r := range name {
		switch {
		case r == '.':
			b.WriteString("__")
		case r == '_' || unicode.IsLetter(r) || unicode.IsDigit(r):
			b.WriteRune(r)
		default:
			b.WriteByte('_')
		}
	}
	return b.String()
}
