package dialects

import (
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// spark is Spark SQL 3.4 or later and Databricks SQL.
type spark struct{ ansi }

func (spark) Name() string { return "spark" }

// Caps: GROUPING SETS with grouping_id (§4), FILTER (§5), NULLS LAST, an
// exact percentile (§7); no COUNT(DISTINCT) OVER (§6,
// DISTINCT_WINDOW_FUNCTION_UNSUPPORTED).
func (spark) Caps() Caps {
	return Caps{GroupingSets: true, FilterClause: true, ExactMedian: true, ApproxMedian: true,
		SampleStats: true, NullsLast: true, PredicateValues: true, FullOuterJoin: true}
}

// Ident quotes with backquotes, a backquote inside doubled (§1,
// spark.apache.org/docs/latest/sql-ref-identifier.html).
func (spark) Ident(name string) string { return "`" + strings.ReplaceAll(name, "`", "``") + "`" }

// String: a backslash is an escape character and ” is not a quote (two
// adjacent literals), so both are escaped with a backslash (§2,
// sql-ref-literals.html; assumes the default
// spark.sql.parser.escapedStringLiterals=false).
func (spark) String(s string) string {
	return "'" + strings.NewReplacer(`\`, `\\`, `'`, `\'`).Replace(s) + "'"
}

// Timestamp: TIMESTAMP_NTZ holds a date and time without a time zone, as
// rollwise timestamps (sql-ref-datatypes.html; TIMESTAMP follows the
// session time zone).
func (spark) Timestamp(s string) string { return "TIMESTAMP_NTZ '" + s + "'" }

func (spark) TypeName(t model.Type) string {
	switch t {
	case model.TypeInteger:
		return "BIGINT"
	case model.TypeDecimal:
		return "DECIMAL(38, 6)"
	case model.TypeFloat:
		return "DOUBLE"
	case model.TypeDate:
		return "DATE"
	case model.TypeTimestamp:
		return "TIMESTAMP_NTZ"
	case model.TypeBoolean:
		return "BOOLEAN"
	}
	return "STRING"
}

func (d spark) ColumnType(t model.Type) string { return d.TypeName(t) }

// Cast: a fractional number cast to an integer is truncated in Spark,
// where DuckDB rounds, so it is rounded first.
func (d spark) Cast(arg string, from, to model.Type) string {
	if to == model.TypeInteger && (from == model.TypeDecimal || from == model.TypeFloat) {
		arg = "round(" + arg + ")"
	}
	return castWith(d, arg, to)
}

// Agg: the median is percentile(x, 0.5), exact and interpolating (§7,
// api/sql percentile); avg of a decimal is a decimal, so the inputs of avg
// and the statistics are made DOUBLE.
func (spark) Agg(fn string, distinct bool, arg string) (string, error) {
	switch {
	case arg == "":
		return "count(*)", nil
	case distinct:
		return fn + "(DISTINCT " + arg + ")", nil
	case fn == "median":
		return "percentile(CAST(" + arg + " AS DOUBLE), 0.5)", nil
	case isStat(fn):
		return statName(fn) + "(CAST(" + arg + " AS DOUBLE))", nil
	}
	return fn + "(" + arg + ")", nil
}

// approxMedian: percentile_approx (§7).
func (spark) approxMedian(arg string) string { return "percentile_approx(" + arg + ", 0.5)" }

// Divide: / is fractional, but a zero divisor is an error under ANSI mode
// (the default from Spark 4.0), hence NULLIF; the cast gives a DOUBLE
// also for decimals (§3).
func (spark) Divide(l, r string) string {
	return "CAST(" + l + " AS DOUBLE) / NULLIF(" + r + ", 0)"
}

// DateTrunc: date_trunc returns a TIMESTAMP (§9); weeks start on Monday
// (api/sql date_trunc).
func (spark) DateTrunc(unit, arg string, t model.Type) string {
	s := "date_trunc('" + strings.ToUpper(unit) + "', " + arg + ")"
	if t == model.TypeDate {
		return "CAST(" + s + " AS DATE)"
	}
	return "CAST(" + s + " AS TIMESTAMP_NTZ)"
}

// NullSafeEqual: <=> (§8).
func (spark) NullSafeEqual(a, b string) string { return a + " <=> " + b }

// GroupingID: grouping_id(a, b, ...) (§4).
func (spark) GroupingID(keys []string) string {
	return "grouping_id(" + strings.Join(keys, ", ") + ")"
}
