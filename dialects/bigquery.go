package dialects

import (
	"fmt"
	"strings"
	"unicode"

	"github.com/rollwise/rollwise/planner/model"
)

// bigquery is BigQuery (GoogleSQL).
type bigquery struct{ ansi }

func (bigquery) Name() string { return "bigquery" }

// Caps: GROUPING SETS, but GROUPING takes one argument (§4); no FILTER
// clause (§5); the exact PERCENTILE_CONT is a window function only, the
// aggregate median is APPROX_QUANTILES (§7); NULLS LAST is supported;
// COUNT(DISTINCT x) OVER (PARTITION BY ...) is (§6).
func (bigquery) Caps() Caps {
	return Caps{GroupingSets: true, ApproxMedian: true, SampleStats: true, NullsLast: true,
		DistinctWindow: true, PredicateValues: true, FullOuterJoin: true}
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

// Ident quotes with backquotes, escaping as in strings (§1).
func (bigquery) Ident(name string) string { return bqEscape(name, '`') }

// ColumnName: BigQuery column names hold letters, digits and underscores
// only (cloud.google.com/bigquery/docs/schemas), so the report's key
// columns, named after references such as plants.family or
// "sales.receipt_id per", are spelled plants__family and
// sales__receipt_id_per. The JSON and table output keep the names as
// written: only the SQL spells them so.
func (bigquery) ColumnName(name string) string {
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

// String: ” is not an escape in GoogleSQL (two adjacent literals), \' is
// (§2).
func (bigquery) String(s string) string { return bqEscape(s, '\'') }

// Timestamp: rollwise timestamps carry no time zone; GoogleSQL's DATETIME
// is the civil date and time, its TIMESTAMP an instant.
func (bigquery) Timestamp(s string) string { return "DATETIME '" + s + "'" }

func (bigquery) TypeName(t model.Type) string {
	switch t {
	case model.TypeInteger:
		return "INT64"
	case model.TypeDecimal:
		// NUMERIC: 38 digits, 9 after the point (zetasql data-types).
		return "NUMERIC"
	case model.TypeFloat:
		return "FLOAT64"
	case model.TypeDate:
		return "DATE"
	case model.TypeTimestamp:
		return "DATETIME"
	case model.TypeBoolean:
		return "BOOL"
	}
	return "STRING"
}

func (d bigquery) ColumnType(t model.Type) string { return d.TypeName(t) }

func (d bigquery) Cast(arg string, _, to model.Type) string { return castWith(d, arg, to) }

// Agg: avg of a NUMERIC is a NUMERIC, so the inputs of avg and the
// statistics are made FLOAT64, as DuckDB computes them
// (zetasql aggregate_functions.md, statistical_aggregate_functions.md).
func (d bigquery) Agg(fn string, distinct bool, arg string) (string, error) {
	switch {
	case arg == "":
		return "count(*)", nil
	case distinct:
		return fn + "(DISTINCT " + arg + ")", nil
	case fn == "median":
		return "", &UnsupportedError{Dialect: d.Name(), Construct: "a median",
			Hint: "PERCENTILE_CONT is a window function only in BigQuery: Render numbers the rows instead (render_median.go)"}
	case isStat(fn):
		return statName(fn) + "(CAST(" + arg + " AS FLOAT64))", nil
	}
	return fn + "(" + arg + ")", nil
}

// approxMedian: the middle of 2 quantiles (§7, zetasql
// approximate_aggregate_functions.md#approx_quantiles).
func (bigquery) approxMedian(arg string) string {
	return "APPROX_QUANTILES(" + arg + ", 2)[OFFSET(1)]"
}

// Divide: INT64 / INT64 is FLOAT64 but NUMERIC / NUMERIC is NUMERIC, and a
// zero divisor is an error (§3).
func (bigquery) Divide(l, r string) string {
	return "CAST(" + l + " AS FLOAT64) / NULLIF(" + r + ", 0)"
}

// DateTrunc: the part comes second, unquoted (§9); DATETIME values use
// DATETIME_TRUNC; WEEK starts on Sunday, ISOWEEK on Monday as in DuckDB
// (zetasql date_functions.md#date_trunc).
func (bigquery) DateTrunc(unit, arg string, t model.Type) string {
	part := strings.ToUpper(unit)
	if unit == "week" {
		part = "ISOWEEK"
	}
	if t == model.TypeTimestamp {
		return "DATETIME_TRUNC(" + arg + ", " + part + ")"
	}
	return "DATE_TRUNC(" + arg + ", " + part + ")"
}

// Extract: ISOWEEK is the ISO week (WEEK counts Sunday-based weeks).
func (bigquery) Extract(unit, arg string) string {
	part := strings.ToUpper(unit)
	if unit == "week" {
		part = "ISOWEEK"
	}
	return "EXTRACT(" + part + " FROM " + arg + ")"
}

// Call: GREATEST and LEAST return NULL when an argument is NULL
// (zetasql mathematical_functions.md), so NULLs are stepped over as
// DuckDB does.
func (bigquery) Call(name string, args []string, _ []model.Type) (string, error) {
	switch name {
	case "greatest", "least":
		return nullIgnoring(strings.ToUpper(name), args), nil
	}
	return plainCall(name, args), nil
}

// GroupingID: GROUPING takes one argument (§4), so the mask is summed
// from one bit per key.
func (bigquery) GroupingID(keys []string) string {
	if len(keys) == 1 {
		return "GROUPING(" + keys[0] + ")"
	}
	parts := make([]string, len(keys))
	for i, k := range keys {
		parts[i] = fmt.Sprintf("GROUPING(%s) * %d", k, uint64(1)<<(len(keys)-1-i))
		if i == len(keys)-1 {
			parts[i] = "GROUPING(" + k + ")"
		}
	}
	return "(" + strings.Join(parts, " + ") + ")"
}
