package dialects

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// sqlserver is SQL Server 2022 or later and Azure SQL (T-SQL): DATETRUNC,
// IS [NOT] DISTINCT FROM and GREATEST/LEAST are new in 2022
// (learn.microsoft.com/sql/sql-server/what-s-new-in-sql-server-2022).
var sqlserver = &Dialect{
	name: "sqlserver",
	// GROUPING SETS with GROUPING_ID (§4); no FILTER (§5); no NULLS LAST
	// (NULLs sort first ascending).
	caps: Caps{GroupingSets: true},
	types: typeNames{integer: "BIGINT", decimal: "DECIMAL(38, 6)", float: "FLOAT", text: "NVARCHAR(MAX)",
		date: "DATE", timestamp: "DATETIME2", boolean: "BIT"},
	// Brackets, a closing bracket inside doubled
	// (learn.microsoft.com/sql/relational-databases/databases/database-identifiers).
	quotes: "[]",
	str:    sqlserverString,
	// No typed literals; 'YYYY-MM-DD' converts to date and datetime2
	// whatever the session's DATEFORMAT and language. No TRUE or FALSE:
	// the literals are written as predicates, and BoolValue turns them
	// into 1 and 0 where a value is due.
	date: "CAST('%s' AS DATE)", timestamp: "CAST('%s' AS DATETIME2)",
	bools: [2]string{"(1 = 0)", "(1 = 1)"},
	// COUNT returns int and overflows past 2^31, COUNT_BIG returns bigint
	// (learn.microsoft.com/sql/t-sql/functions/count-big-transact-sql);
	// AVG of an int column returns int (§3), so the input is made a float;
	// the sample statistics are STDEV and VAR (§12).
	countAll: "COUNT_BIG(*)",
	aggs: map[string]string{"count": "COUNT_BIG(%s)", "sum": "SUM(%s)", "min": "MIN(%s)", "max": "MAX(%s)",
		"avg": "AVG(%f)", "stddev": "STDEV(%f)", "variance": "VAR(%f)"},
	// The exact PERCENTILE_CONT is a window function only (§7);
	// APPROX_PERCENTILE_CONT is an aggregate (SQL Server 2022,
	// learn.microsoft.com/sql/t-sql/functions/approx-percentile-cont-transact-sql).
	refused:      map[string]refusal{"median": medianRefusal("PERCENTILE_CONT is a window function only in SQL Server")},
	approxMedian: "APPROX_PERCENTILE_CONT(0.5) WITHIN GROUP (ORDER BY %s)",
	// integer / integer truncates (§3), and a zero divisor is an error.
	floatDivide: true,
	// Converting a float or decimal to an integer truncates
	// (learn.microsoft.com/sql/t-sql/functions/cast-and-convert-transact-sql,
	// "truncated"), where DuckDB rounds, so it is rounded first.
	roundToInteger: "ROUND(%s, 0)",
	// GREATEST and LEAST (2022+) ignore NULLs as DuckDB does.
	calls: map[string]string{"coalesce": "COALESCE", "nullif": "NULLIF", "abs": "ABS", "round": "ROUND",
		"least": "LEAST", "greatest": "GREATEST", "lower": "LOWER", "upper": "UPPER"},
	// ROUND needs its length argument.
	call: func(name string, args []string, _ []model.Type) (string, bool) {
		if name == "round" && len(args) == 1 {
			return plainCall("ROUND", append(args, "0")), true
		}
		return "", false
	},
	// DATETRUNC keeps the argument's type; iso_week starts weeks on Monday
	// whatever DATEFIRST says
	// (learn.microsoft.com/sql/t-sql/functions/datetrunc-transact-sql).
	dateTrunc: func(unit, arg string, _ model.Type) string {
		if unit == "week" {
			unit = "iso_week"
		}
		return "DATETRUNC(" + unit + ", " + arg + ")"
	},
	// DATEPART; iso_week is the ISO week, as DuckDB's week.
	extract: func(unit, arg string) string {
		if unit == "week" {
			unit = "iso_week"
		}
		return "DATEPART(" + unit + ", " + arg + ")"
	},
	// DATEADD clamps a month move to the target month's last day
	// (learn.microsoft.com, DATEADD: "the last day of the return month is
	// returned").
	moveDate: func(arg string, n int, unit string, _ model.Type) string {
		return "DATEADD(" + unit + ", " + strconv.Itoa(n) + ", " + arg + ")"
	},
	// Concatenation is + on text; NULL when either side is
	// (CONCAT_NULL_YIELDS_NULL, on by default), where CONCAT() would read
	// NULL as ''. The casts keep + from adding numbers.
	concat: func(a, b string) string {
		return "(CAST(" + a + " AS NVARCHAR(MAX)) + CAST(" + b + " AS NVARCHAR(MAX)))"
	},
	// GROUPING takes one column in T-SQL; GROUPING_ID takes several and
	// computes the same bit mask (§4).
	grouping: "GROUPING_ID",
	// TOP (n) right after SELECT (§10).
	top: true,
	// No boolean values (§8: bit is a number, a predicate cannot be
	// selected): a predicate becomes 1, 0 or NULL (unknown), read back
	// with = 1.
	noBoolValues: true,
	// CREATE OR ALTER VIEW (no OR REPLACE), alone in its batch; no ORDER
	// BY in a view (§11).
	view: ViewDDL{Style: CreateOrAlter, BatchEnd: "GO", ColumnList: true},
}

// sqlserverString: N'...' keeps every Unicode character (a plain '...'
// literal is converted to the database's code page); a quote inside is
// doubled (§2).
//
// A text with line breaks is written as pieces joined by + NCHAR(10) + (or
// NCHAR(13)), so no line of the SQL is inside a literal: sqlcmd and SSMS
// split a script at every line that is only GO, even inside a string
// (learn.microsoft.com/sql/t-sql/language-elements/sql-server-utilities-statements-go),
// and a backslash just before a line break inside a literal is a line
// continuation that T-SQL removes together with the break
// (learn.microsoft.com/sql/t-sql/language-elements/sql-server-utilities-statements-backslash).
// Concatenation of non-MAX strings is truncated at 8,000 bytes
// (learn.microsoft.com/sql/t-sql/language-elements/string-concatenation-transact-sql),
// so a long text starts from an NVARCHAR(MAX).
func sqlserverString(s string) string {
	if !strings.ContainsAny(s, "\r\n") {
		return "N'" + strings.ReplaceAll(s, "'", "''") + "'"
	}
	var parts []string
	if len(s) > 4000 { // UTF-8 bytes are never fewer than UTF-16 code units
		parts = append(parts, "CAST(N'' AS NVARCHAR(MAX))")
	}
	for s != "" {
		i := strings.IndexAny(s, "\r\n")
		if i < 0 {
			i = len(s)
		}
		if i > 0 {
			parts = append(parts, "N'"+strings.ReplaceAll(s[:i], "'", "''")+"'")
		}
		if i < len(s) {
			parts = append(parts, fmt.Sprintf("NCHAR(%d)", s[i]))
			i++
		}
		s = s[i:]
	}
	return "(" + strings.Join(parts, " + ") + ")"
}
