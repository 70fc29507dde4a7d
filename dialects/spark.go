package dialects

import (
	"strconv"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// spark is Spark SQL 3.4 or later and Databricks SQL.
var spark = &Dialect{
	name: "spark",
	// GROUPING SETS with grouping_id (§4), FILTER (§5), NULLS LAST.
	caps: Caps{GroupingSets: true, FilterClause: true, NullsLast: true},
	// TIMESTAMP_NTZ holds a date and time without a time zone, as rollwise
	// timestamps (sql-ref-datatypes.html; TIMESTAMP follows the session
	// time zone).
	types: typeNames{integer: "BIGINT", decimal: "DECIMAL(38, 6)", float: "DOUBLE", text: "STRING",
		date: "DATE", timestamp: "TIMESTAMP_NTZ", boolean: "BOOLEAN"},
	// Backquotes, a backquote inside doubled (§1,
	// spark.apache.org/docs/latest/sql-ref-identifier.html).
	quotes: "``",
	// A backslash is an escape character and '' is not a quote (two
	// adjacent literals), so both are escaped with a backslash (§2,
	// sql-ref-literals.html; assumes the default
	// spark.sql.parser.escapedStringLiterals=false).
	escape:    strings.NewReplacer(`\`, `\\`, `'`, `\'`),
	timestamp: "TIMESTAMP_NTZ '%s'",
	// The median is percentile(x, 0.5), exact and interpolating (§7,
	// api/sql percentile); avg of a decimal is a decimal, so the inputs of
	// avg and the statistics are made DOUBLE.
	aggs: sampleStats(map[string]string{"median": "percentile(%f, 0.5)"}),
	// / is fractional, but a zero divisor is an error under ANSI mode (the
	// default from Spark 4.0), hence NULLIF; the cast gives a DOUBLE also
	// for decimals (§3).
	floatDivide: true,
	// A fractional number cast to an integer is truncated in Spark, where
	// DuckDB rounds, so it is rounded first.
	roundToInteger: "round(%s)",
	// date_trunc returns a TIMESTAMP (§9); weeks start on Monday (api/sql
	// date_trunc).
	dateTrunc: func(unit, arg string, t model.Type) string {
		s := "date_trunc('" + strings.ToUpper(unit) + "', " + arg + ")"
		if t == model.TypeDate {
			return "CAST(" + s + " AS DATE)"
		}
		return "CAST(" + s + " AS TIMESTAMP_NTZ)"
	},
	moveDate: sparkMoveDate,
	// <=> (§8).
	nullSafeEqual: "<=>",
	// grouping_id(a, b, ...) (§4).
	grouping: "grouping_id",
	view:     ViewDDL{Style: CreateOrReplace, OrderBy: true, ColumnList: true},
}

// sparkMoveDate is add_months or date_add for dates, timestampadd for
// timestamps; since Spark 3.0 add_months clamps to the month's last day
// without moving a month's last day to the next month's last day (Spark
// SQL migration guide, 2.4 to 3.0).
func sparkMoveDate(arg string, n int, unit string, t model.Type) string {
	switch {
	case t == model.TypeTimestamp:
		return "timestampadd(" + strings.ToUpper(unit) + ", " + strconv.Itoa(n) + ", " + arg + ")"
	case unit == "month":
		return "add_months(" + arg + ", " + strconv.Itoa(n) + ")"
	}
	return "date_add(" + arg + ", " + strconv.Itoa(n) + ")"
}
