package dialects

import (
	"strconv"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// mysql is MySQL 8 and MariaDB 10.5 or later (checked live against
// MariaDB 10.11). It assumes the default SQL mode's string rules: a
// backslash is an escape character (no NO_BACKSLASH_ESCAPES) and "..." is
// a string (no ANSI_QUOTES); rollwise's own connections set that mode.
var mysql = &Dialect{
	name: "mysql",
	// Only WITH ROLLUP, no GROUPING SETS, and MariaDB has no GROUPING()
	// (§4, checked), so totals are a UNION ALL of groupings; no FILTER
	// (§5, checked); no NULLS LAST (NULLs sort first ascending, checked).
	caps: Caps{},
	// CAST targets differ from column types in MySQL: SIGNED for
	// integers, CHAR for text, DOUBLE (MySQL 8.0.17+, MariaDB).
	types: typeNames{integer: "SIGNED", decimal: "DECIMAL(38, 6)", float: "DOUBLE", text: "CHAR",
		date: "DATE", timestamp: "DATETIME(6)", boolean: "SIGNED"},
	// Text columns compare byte by byte, as in DuckDB: the default
	// collations ignore case and accents ('rose' = 'Rose'), and PAD SPACE
	// ones trailing spaces. utf8mb4_bin is the binary collation both MySQL
	// and MariaDB have; MariaDB's utf8mb4_nopad_bin (and MySQL's
	// utf8mb4_0900_bin) also keep trailing spaces significant; the loader
	// picks one by server.
	columns: &typeNames{integer: "BIGINT", decimal: "DECIMAL(38,6)", float: "DOUBLE",
		text: "TEXT CHARACTER SET utf8mb4 COLLATE utf8mb4_bin", date: "DATE", timestamp: "DATETIME(6)", boolean: "BOOLEAN"},
	// Backquotes, a backquote inside doubled (mariadb.com/kb/en/identifier-names, §1).
	quotes: "``",
	// A backslash is an escape character in MySQL strings (§2), so it is
	// doubled; a quote is doubled; NUL, which would end the statement in C
	// clients, is written \0 (dev.mysql.com/doc/refman/8.0/en/string-literals.html,
	// table of escape sequences). The standard typed date literals are
	// accepted (checked).
	escape: strings.NewReplacer(`\`, `\\`, `'`, `''`, "\x00", `\0`),
	// avg of integers and decimals is a DECIMAL with 4 more digits
	// (div_precision_increment, §3), so the input is made a double, as
	// DuckDB computes it.
	aggs: sampleStats(nil),
	// No median aggregate (§7: MariaDB's MEDIAN is a window function only).
	refused: map[string]refusal{"median": medianRefusal("MySQL has no median aggregate and MariaDB's MEDIAN is a window function only")},
	// / on integers gives a DECIMAL with 4 decimal places (§3, checked:
	// 1/3 = 0.3333), so the dividend is made a double. A double becomes an
	// integer rounding half to even and a decimal half away from zero, as
	// in DuckDB (checked), so the plain CAST is right.
	floatDivide: true,
	// GREATEST and LEAST return NULL as soon as one argument is NULL
	// (checked), so NULLs are stepped over.
	calls:           map[string]string{"greatest": "GREATEST", "least": "LEAST"},
	nullsInExtremes: true,
	call:            mysqlCall,
	dateTrunc:       mysqlDateTrunc,
	// EXTRACT(WEEK ...) counts Sunday-based weeks; WEEK(d, 3) is the ISO
	// week, as DuckDB's week (dev.mysql.com date functions, WEEK modes).
	extract: func(unit, arg string) string {
		if unit == "week" {
			return "WEEK(" + arg + ", 3)"
		}
		return "EXTRACT(" + strings.ToUpper(unit) + " FROM " + arg + ")"
	},
	// DATE_ADD's month arithmetic clamps to the month's last day (MySQL
	// and MariaDB manuals, DATE_ADD: "the day is adjusted to the maximum
	// days in the new month").
	moveDate: func(arg string, n int, unit string, _ model.Type) string {
		return "DATE_ADD(" + arg + ", INTERVAL " + strconv.Itoa(n) + " " + map[string]string{"day": "DAY", "month": "MONTH"}[unit] + ")"
	},
	// <=>; MySQL has no IS NOT DISTINCT FROM (§8).
	nullSafeEqual: "<=>",
	// || is a logical OR in the default SQL mode (checked: 'a' || 'b' =
	// 0); CONCAT is NULL when an argument is.
	concat: func(a, b string) string { return "CONCAT(" + a + ", " + b + ")" },
	// MariaDB refuses a WITH clause of more than 64 elements ("Too many
	// WITH elements in WITH clause", checked on MariaDB 10.11), which a
	// deep layered query exceeds, so layers are nested derived tables.
	// MySQL and MariaDB merge a derived table into the query that reads it
	// (copying its expressions), unless it has a LIMIT
	// (dev.mysql.com/doc/refman/8.0/en/derived-table-optimization.html;
	// mariadb.com/kb/en/derived-table-merge-optimization): with the largest
	// LIMIT, which keeps every row, the 25-deep layered block runs in 0.06 s
	// on MariaDB 10.11 rather than 5.6 s.
	layerTail: "\n  LIMIT 18446744073709551615",
	view:      ViewDDL{Style: CreateOrReplace, OrderBy: true, ColumnList: true},
}

// mysqlCall: ROUND of a double rounds half to even (checked: ROUND(2.5e0)
// = 2) while DECIMAL rounds half away from zero, as DuckDB, so a double is
// rounded as a DECIMAL(65, 30) where it fits (a double of 1e30 or more has
// no fraction to round).
func mysqlCall(name string, args []string, types []model.Type) (string, bool) {
	if name != "round" || len(types) == 0 || types[0] != model.TypeFloat {
		return "", false
	}
	x := args[0]
	a := append([]string{"CAST(" + x + " AS DECIMAL(65, 30))"}, args[1:]...)
	return "CASE WHEN ABS(" + x + ") < 1e30 THEN CAST(ROUND(" + strings.Join(a, ", ") +
		") AS DOUBLE) ELSE " + plainCall("ROUND", args) + " END", true
}

// mysqlDateTrunc: MySQL has no date_trunc (§9). WEEKDAY is 0 on Monday,
// so weeks start on Monday as in DuckDB.
func mysqlDateTrunc(unit, arg string, t model.Type) string {
	d := "CAST(" + arg + " AS DATE)"
	var s string
	switch unit {
	case "day":
		s = d
	case "week":
		s = "DATE_SUB(" + d + ", INTERVAL WEEKDAY(" + arg + ") DAY)"
	case "month":
		s = "DATE_SUB(" + d + ", INTERVAL DAYOFMONTH(" + arg + ") - 1 DAY)"
	case "quarter":
		s = "MAKEDATE(YEAR(" + arg + "), 1) + INTERVAL (QUARTER(" + arg + ") - 1) * 3 MONTH"
	default:
		s = "MAKEDATE(YEAR(" + arg + "), 1)"
	}
	if t == model.TypeTimestamp {
		return "CAST(" + s + " AS DATETIME(6))"
	}
	return s
}
