package dialects

import (
	"strconv"

	"github.com/rollwise/rollwise/planner/model"
)

// duckdb is the embedded engine's dialect, and the reference meaning of
// every construct: the other dialects reproduce DuckDB's results.
var duckdb = &Dialect{
	name: "duckdb",
	caps: Caps{GroupingSets: true, FilterClause: true, NullsLast: true},
	types: typeNames{integer: "BIGINT", decimal: "DECIMAL(38, 6)", float: "DOUBLE", text: "VARCHAR",
		date: "DATE", timestamp: "TIMESTAMP", boolean: "BOOLEAN"},
	aggs: map[string]string{
		"stddev": "stddev_samp(%s)", "variance": "var_samp(%s)",
		// DuckDB's median averages the two middle values of an even count
		// for numbers: the continuous median (duckdb.org/docs, aggregates).
		// Over a DECIMAL it keeps the input's scale, so the mean of 1.5
		// and 3.0 came out 2.2 instead of 2.25: the median is a float
		// (language.md), and is computed over doubles.
		"median": "median(%f)",
	},
	dateTrunc: func(unit, arg string, t model.Type) string {
		s := "date_trunc('" + unit + "', " + arg + ")"
		if t == model.TypeDate {
			return "CAST(" + s + " AS DATE)"
		}
		return s
	},
	moveDate: intervalMove,
	// A CASE (or coalesce, least, greatest) whose result is a decimal gets
	// the most integer digits of its branches and whatever scale is left
	// of 38, so a branch typed DECIMAL(38,1), say round(x, 1), silently
	// rounds the others to one place
	// (testdata/differential/decimal_scale_round_case). DECIMAL(38,12)
	// holds every decimal of a column (scale 6) and of a product of two,
	// and a product of two such values still has 14 integer digits; a
	// value too large is an overflow error, never a rounding.
	unifyDecimal: "DECIMAL(38, 12)",
	// DuckDB 1.5 materializes a CTE read more than once by itself, but
	// under ORDER BY ... LIMIT it once left a column of such a CTE out of
	// what it kept, so a per-grain grouping read NULL for it and counted
	// 2 for 4 (regression case shared_rows_under_limit); written AS
	// MATERIALIZED, the CTE keeps every column.
	materializeShared: true,
	view:              ViewDDL{Style: CreateOrReplace, OrderBy: true, ColumnList: true},
}

// intervalMove adds an interval, as DuckDB and PostgreSQL spell it; their
// month arithmetic clamps to the month's last day (PostgreSQL documents
// it in "Date/Time Functions and Operators", section 9.9). A date plus an
// interval is a timestamp there: cast back.
func intervalMove(arg string, n int, unit string, t model.Type) string {
	x := "(" + arg + " + INTERVAL '" + strconv.Itoa(n) + " " + unit + "')"
	if t == model.TypeDate {
		return "CAST(" + x + " AS DATE)"
	}
	return x
}
