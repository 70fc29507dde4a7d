package dialects

import "github.com/rollwise/rollwise/planner/model"

// duckdb is the embedded engine's dialect, and the reference meaning of
// every construct: the other dialects reproduce DuckDB's results.
type duckdb struct{ ansi }

func (duckdb) Name() string { return "duckdb" }
func (duckdb) Caps() Caps {
	// COUNT(DISTINCT) works in any window (§6); FULL OUTER JOIN is standard.
	return Caps{GroupingSets: true, FilterClause: true, ExactMedian: true, ApproxMedian: true,
		SampleStats: true, NullsLast: true, DistinctWindow: true, PredicateValues: true, FullOuterJoin: true}
}

func (duckdb) TypeName(t model.Type) string {
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

func (d duckdb) ColumnType(t model.Type) string { return d.TypeName(t) }

func (d duckdb) Cast(arg string, _, to model.Type) string { return castWith(d, arg, to) }

func (duckdb) Agg(fn string, distinct bool, arg string) (string, error) {
	switch {
	case arg == "":
		return "count(*)", nil
	case distinct:
		return fn + "(DISTINCT " + arg + ")", nil
	}
	switch fn {
	case "stddev":
		fn = "stddev_samp"
	case "variance":
		fn = "var_samp"
	case "median":
		// DuckDB's median averages the two middle values of an even count
		// for numbers: the continuous median (duckdb.org/docs, aggregates).
		// Over a DECIMAL it keeps the input's scale, so the mean of 1.5
		// and 3.0 came out 2.2 instead of 2.25: the median is a float
		// (language.md), and is computed over doubles.
		return "median(CAST(" + arg + " AS DOUBLE))", nil
	}
	return fn + "(" + arg + ")", nil
}

func (duckdb) DateTrunc(unit, arg string, t model.Type) string {
	s := "date_trunc('" + unit + "', " + arg + ")"
	if t == model.TypeDate {
		return "CAST(" + s + " AS DATE)"
	}
	return s
}

// approxMedian: approx_quantile(x, 0.5) (duckdb.org/docs aggregates, §7).
func (duckdb) approxMedian(arg string) string { return "approx_quantile(" + arg + ", 0.5)" }

// UnifyDecimal widens one branch of a CASE (or an argument of coalesce,
// least, greatest) whose result is a decimal. DuckDB gives such a union the
// most integer digits of its branches and whatever scale is left of 38, so
// a branch typed DECIMAL(38,1), say round(x, 1), silently rounds the
// others to one place (testdata/differential/decimal_scale_round_case).
// DECIMAL(38,12) holds every decimal of a column (scale 6) and of a
// product of two, and a product of two such values still has 14 integer
// digits; a value too large is an overflow error, never a rounding.
func (duckdb) UnifyDecimal(x string) string { return "CAST(" + x + " AS DECIMAL(38, 12))" }
