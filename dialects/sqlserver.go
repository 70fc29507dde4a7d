package dialects

import (
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// sqlserver is SQL Server 2022 or later and Azure SQL (T-SQL): DATETRUNC,
// IS [NOT] DISTINCT FROM and GREATEST/LEAST are new in 2022
// (learn.microsoft.com/sql/sql-server/what-s-new-in-sql-server-2022).
type sqlserver struct{}

func (sqlserver) Name() string { return "sqlserver" }

// Caps: GROUPING SETS with GROUPING_ID (§4); no FILTER (§5); no NULLS
// LAST (NULLs sort first ascending); the exact PERCENTILE_CONT is a window
// function only (§7), APPROX_PERCENTILE_CONT an aggregate (2022+); no
// COUNT(DISTINCT) OVER (§6); no boolean values (§8: bit is a number, a
// predicate cannot be selected); TOP instead of LIMIT (§10).
func (sqlserver) Caps() Caps {
	return Caps{GroupingSets: true, ApproxMedian: true, SampleStats: true, FullOuterJoin: true, Top: true}
}

// Ident quotes with brackets, a closing bracket inside doubled
// (learn.microsoft.com/sql/relational-databases/databases/database-identifiers).
func (sqlserver) Ident(name string) string { return "[" + strings.ReplaceAll(name, "]", "]]") + "]" }

// String: N'...' keeps every Unicode character (a plain '...' literal is
// converted to the database's code page); a quote inside is doubled (§2).
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
func (sqlserver) String(s string) string {
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

// Date and Timestamp: T-SQL has no typed literals; 'YYYY-MM-DD' converts to
// date and datetime2 whatever the session's DATEFORMAT and language.
func (sqlserver) Date(s string) string      { return "CAST('" + s + "' AS DATE)" }
func (sqlserver) Timestamp(s string) string { return "CAST('" + s + "' AS DATETIME2)" }

// Bool: T-SQL has no TRUE or FALSE; the literals are written as
// predicates, and BoolValue turns them into 1 and 0 where a value is due.
func (sqlserver) Bool(v bool) string {
	if v {
		return "(1 = 1)"
	}
	return "(1 = 0)"
}

func (sqlserver) TypeName(t model.Type) string {
	switch t {
	case model.TypeInteger:
		return "BIGINT"
	case model.TypeDecimal:
		return "DECIMAL(38, 6)"
	case model.TypeFloat:
		return "FLOAT"
	case model.TypeDate:
		return "DATE"
	case model.TypeTimestamp:
		return "DATETIME2"
	case model.TypeBoolean:
		return "BIT"
	}
	return "NVARCHAR(MAX)"
}

func (d sqlserver) ColumnType(t model.Type) string { return d.TypeName(t) }

// Cast: converting a float or decimal to an integer truncates in T-SQL
// (learn.microsoft.com/sql/t-sql/functions/cast-and-convert-transact-sql,
// "truncated"), where DuckDB rounds, so it is rounded first.
func (d sqlserver) Cast(arg string, from, to model.Type) string {
	if to == model.TypeInteger && (from == model.TypeDecimal || from == model.TypeFloat) {
		arg = "ROUND(" + arg + ", 0)"
	}
	return castWith(d, arg, to)
}

// Agg: COUNT returns int and overflows past 2^31, COUNT_BIG returns bigint
// (learn.microsoft.com/sql/t-sql/functions/count-big-transact-sql); AVG of
// an int column returns int (§3), so the input is made a float; the sample
// statistics are STDEV and VAR (§12).
func (d sqlserver) Agg(fn string, distinct bool, arg string) (string, error) {
	switch {
	case arg == "":
		return "COUNT_BIG(*)", nil
	case distinct && fn == "count":
		return "COUNT_BIG(DISTINCT " + arg + ")", nil
	case distinct:
		return strings.ToUpper(fn) + "(DISTINCT " + arg + ")", nil
	case fn == "count":
		return "COUNT_BIG(" + arg + ")", nil
	case fn == "median":
		return "", &UnsupportedError{Dialect: d.Name(), Construct: "a median",
			Hint: "PERCENTILE_CONT is a window function only in SQL Server: Render numbers the rows instead (render_median.go)"}
	case fn == "stddev":
		return "STDEV(CAST(" + arg + " AS FLOAT))", nil
	case fn == "variance":
		return "VAR(CAST(" + arg + " AS FLOAT))", nil
	case fn == "avg":
		return "AVG(CAST(" + arg + " AS FLOAT))", nil
	}
	return strings.ToUpper(fn) + "(" + arg + ")", nil
}

// approxMedian: APPROX_PERCENTILE_CONT, an aggregate (SQL Server 2022,
// learn.microsoft.com/sql/t-sql/functions/approx-percentile-cont-transact-sql).
func (sqlserver) approxMedian(arg string) string {
	return "APPROX_PERCENTILE_CONT(0.5) WITHIN GROUP (ORDER BY " + arg + ")"
}

// Divide: integer / integer truncates (§3), and a zero divisor is an error.
func (sqlserver) Divide(l, r string) string {
	return "CAST(" + l + " AS FLOAT) / NULLIF(" + r + ", 0)"
}

// DateTrunc: DATETRUNC keeps the argument's type; iso_week starts weeks on
// Monday whatever DATEFIRST says
// (learn.microsoft.com/sql/t-sql/functions/datetrunc-transact-sql).
func (sqlserver) DateTrunc(unit, arg string, _ model.Type) string {
	if unit == "week" {
		unit = "iso_week"
	}
	return "DATETRUNC(" + unit + ", " + arg + ")"
}

// Extract: DATEPART; iso_week is the ISO week, as DuckDB's week.
func (sqlserver) Extract(unit, arg string) string {
	if unit == "week" {
		unit = "iso_week"
	}
	return "DATEPART(" + unit + ", " + arg + ")"
}

func (sqlserver) BitAnd(a, b string) string { return "(" + a + " & " + b + ")" }

// NullSafeEqual: IS NOT DISTINCT FROM, SQL Server 2022+ (§8).
func (sqlserver) NullSafeEqual(a, b string) string { return a + " IS NOT DISTINCT FROM " + b }

// Concat: + on text; NULL when either side is (CONCAT_NULL_YIELDS_NULL,
// on by default), where CONCAT() would read NULL as ”. The casts keep +
// from adding numbers.
func (sqlserver) Concat(a, b string) string {
	return "(CAST(" + a + " AS NVARCHAR(MAX)) + CAST(" + b + " AS NVARCHAR(MAX)))"
}

// Call: ROUND needs its length argument; GREATEST and LEAST (2022+)
// ignore NULLs as DuckDB does.
func (sqlserver) Call(name string, args []string, _ []model.Type) (string, error) {
	if name == "round" && len(args) == 1 {
		args = append(args, "0")
	}
	return plainCall(strings.ToUpper(name), args), nil
}

// GroupingID: GROUPING takes one column in T-SQL; GROUPING_ID takes several
// and computes the same bit mask (§4).
func (sqlserver) GroupingID(keys []string) string {
	return "GROUPING_ID(" + strings.Join(keys, ", ") + ")"
}

// Limit: TOP (n) right after SELECT (§10).
func (sqlserver) Limit(n int) (string, string) { return fmt.Sprintf("TOP (%d)", n), "" }

// BoolValue: a predicate cannot be selected in T-SQL; it becomes 1, 0 or
// NULL (unknown). Truth reads such a value (or a bit column) back.
func (sqlserver) BoolValue(pred string) string {
	return "CASE WHEN " + pred + " THEN 1 WHEN NOT (" + pred + ") THEN 0 END"
}
func (sqlserver) Truth(value string) string { return "(" + value + " = 1)" }
