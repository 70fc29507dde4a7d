package dialects

import (
	"strconv"

	"github.com/rollwise/rollwise/planner/model"
)

// trino is Trino (and Presto's SQL).
var trino = &Dialect{
	name: "trino",
	// GROUPING SETS over column names (§4; rollwise groups over named
	// columns of a CTE), FILTER (§5), NULLS LAST.
	caps: Caps{GroupingSets: true, FilterClause: true, NullsLast: true},
	types: typeNames{integer: "BIGINT", decimal: "DECIMAL(38, 6)", float: "DOUBLE", text: "VARCHAR",
		date: "DATE", timestamp: "TIMESTAMP", boolean: "BOOLEAN"},
	// avg of a decimal is a decimal, so the inputs of avg and the
	// statistics are made DOUBLE, as DuckDB computes them
	// (trino.io/docs/current/functions/aggregate.html).
	aggs: sampleStats(nil),
	// No exact median, only approx_percentile (§7).
	refused:      map[string]refusal{"median": medianRefusal("Trino has only approx_percentile")},
	approxMedian: "approx_percentile(%f, 0.5)",
	// Integer division truncates in Trino (§3).
	floatDivide: true,
	// greatest and least return NULL when an argument is NULL
	// (functions/comparison.html), so NULLs are stepped over as DuckDB
	// does.
	nullsInExtremes: true,
	// date_trunc keeps the argument's type; weeks start on Monday
	// (trino.io/docs/current/functions/datetime.html).
	dateTrunc: func(unit, arg string, _ model.Type) string {
		return "date_trunc('" + unit + "', " + arg + ")"
	},
	// date_add's month arithmetic clamps to the month's last day
	// (trino.io, "Date and time functions", date_add).
	moveDate: func(arg string, n int, unit string, _ model.Type) string {
		return "date_add('" + unit + "', " + strconv.Itoa(n) + ", " + arg + ")"
	},
	// No & operator; bitwise_and (trino.io/docs/current/functions/bitwise.html).
	bitAnd: "bitwise_and",
	// grouping(a, b, ...) returns the bit mask (§4).
	grouping: "grouping",
	// CREATE VIEW names no columns: the query is wrapped in a SELECT that
	// renames them.
	view: ViewDDL{Style: CreateOrReplace, OrderBy: true},
}
