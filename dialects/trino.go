package dialects

import (
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// trino is Trino (and Presto's SQL).
type trino struct{ ansi }

func (trino) Name() string { return "trino" }

// Caps: GROUPING SETS over column names (§4; rollwise groups over named
// columns of a CTE), FILTER (§5), NULLS LAST; no exact median, only
// approx_percentile (§7); no COUNT(DISTINCT) OVER (§6).
func (trino) Caps() Caps {
	return Caps{GroupingSets: true, FilterClause: true, ApproxMedian: true, SampleStats: true,
		NullsLast: true, PredicateValues: true, FullOuterJoin: true}
}

func (trino) TypeName(t model.Type) string {
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
		return "TIMESTAMP"
	case model.TypeBoolean:
		return "BOOLEAN"
	}
	return "VARCHAR"
}

func (d trino) ColumnType(t model.Type) string { return d.TypeName(t) }

func (d trino) Cast(arg string, _, to model.Type) string { return castWith(d, arg, to) }

// Agg: avg of a decimal is a decimal, so the inputs of avg and the
// statistics are made DOUBLE, as DuckDB computes them
// (trino.io/docs/current/functions/aggregate.html).
func (d trino) Agg(fn string, distinct bool, arg string) (string, error) {
	switch {
	case arg == "":
		return "count(*)", nil
	case distinct:
		return fn + "(DISTINCT " + arg + ")", nil
	case fn == "median":
		return "", &UnsupportedError{Dialect: d.Name(), Construct: "a median",
			Hint: "Trino has only approx_percentile: Render numbers the rows instead (render_median.go)"}
	case isStat(fn):
		return statName(fn) + "(CAST(" + arg + " AS DOUBLE))", nil
	}
	return fn + "(" + arg + ")", nil
}

// approxMedian: approx_percentile(x, 0.5) (§7).
func (trino) approxMedian(arg string) string {
	return "approx_percentile(CAST(" + arg + " AS DOUBLE), 0.5)"
}

// Divide: integer division truncates in Trino (§3).
func (trino) Divide(l, r string) string {
	return "CAST(" + l + " AS DOUBLE) / NULLIF(" + r + ", 0)"
}

// DateTrunc: date_trunc keeps the argument's type; weeks start on Monday
// (trino.io/docs/current/functions/datetime.html).
func (trino) DateTrunc(unit, arg string, _ model.Type) string {
	return "date_trunc('" + unit + "', " + arg + ")"
}

// BitAnd: Trino has no & operator; bitwise_and
// (trino.io/docs/current/functions/bitwise.html).
func (trino) BitAnd(a, b string) string { return "bitwise_and(" + a + ", " + b + ")" }

// Call: greatest and least return NULL when an argument is NULL in Trino
// (functions/comparison.html), so NULLs are stepped over as DuckDB does.
func (trino) Call(name string, args []string, _ []model.Type) (string, error) {
	switch name {
	case "greatest", "least":
		return nullIgnoring(name, args), nil
	}
	return plainCall(name, args), nil
}

// GroupingID: grouping(a, b, ...) returns the bit mask (§4).
func (trino) GroupingID(keys []string) string { return "grouping(" + strings.Join(keys, ", ") + ")" }
