package dialects

import (
	"regexp"
	"strconv"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// snowflake is Snowflake.
var snowflake = &Dialect{
	name: "snowflake",
	// GROUPING SETS with a multi-argument GROUPING (§4); no FILTER clause
	// (§5); NULLS LAST is supported.
	caps: Caps{GroupingSets: true, NullsLast: true},
	types: typeNames{integer: "NUMBER(38, 0)", decimal: "NUMBER(38, 6)", float: "FLOAT", text: "VARCHAR",
		date: "DATE", timestamp: "TIMESTAMP_NTZ", boolean: "BOOLEAN"},
	ident: snowflakeIdent,
	// Backslash sequences are processed in single-quoted strings (§2,
	// docs.snowflake.com data-types-text, escape sequences), so a
	// backslash is doubled; a quote is doubled.
	escape: strings.NewReplacer(`\`, `\\`, `'`, `''`),
	// CAST of ISO text, read by the AUTO input formats.
	date: "CAST('%s' AS DATE)", timestamp: "CAST('%s' AS TIMESTAMP_NTZ)",
	// avg of a NUMBER is a NUMBER with a few more decimal places (§3's
	// scale rule), so the inputs of avg and the statistics are made FLOAT,
	// as DuckDB computes them; MEDIAN is exact (§7, docs.snowflake.com
	// median).
	aggs: sampleStats(map[string]string{"median": "median(%s)"}),
	// NUMBER / NUMBER keeps at most 12 decimal places (§3) and a zero
	// divisor is an error.
	floatDivide: true,
	// GREATEST and LEAST return NULL when an argument is NULL;
	// GREATEST_IGNORE_NULLS and LEAST_IGNORE_NULLS ignore them as DuckDB
	// does (docs.snowflake.com greatest_ignore_nulls, bundle 2024_03).
	call: func(name string, args []string, _ []model.Type) (string, bool) {
		if name != "greatest" && name != "least" {
			return "", false
		}
		if len(args) == 1 {
			return args[0], true
		}
		return plainCall(strings.ToUpper(name)+"_IGNORE_NULLS", args), true
	},
	// DATE_TRUNC keeps a DATE a DATE (§9); weeks start on Monday under the
	// default WEEK_START = 0 (docs.snowflake.com, date and time parts).
	dateTrunc: func(unit, arg string, _ model.Type) string {
		return "DATE_TRUNC('" + strings.ToUpper(unit) + "', " + arg + ")"
	},
	// WEEKISO is the ISO week; WEEK follows WEEK_OF_YEAR_POLICY.
	weekUnit: "weekiso",
	// DATEADD clamps a month move (docs.snowflake.com, DATEADD: adding a
	// month to January 31 gives the last day of February).
	moveDate: func(arg string, n int, unit string, _ model.Type) string {
		return "DATEADD(" + unit + ", " + strconv.Itoa(n) + ", " + arg + ")"
	},
	// No & operator; BITAND (docs.snowflake.com bitand).
	bitAnd: "BITAND",
	view:   ViewDDL{Style: CreateOrReplace, OrderBy: true, ColumnList: true},
}

// regularLower is a name Snowflake would store as written in upper case
// had it been written without quotes.
var regularLower = regexp.MustCompile(`^[a-z_][a-z0-9_$]*$`)

// snowflakeIdent: Snowflake stores unquoted names in upper case and
// resolves quoted names case-sensitively (§1, docs.snowflake.com
// identifiers-syntax), so a table created as `CREATE TABLE sales_lines` is
// SALES_LINES and "sales_lines" would not find it. A name that is all
// lower case and regular is therefore quoted in upper case, which resolves
// exactly as the unquoted name would while staying safe from keywords; any
// other name is quoted as written. A quote inside is doubled.
func snowflakeIdent(name string) string {
	if regularLower.MatchString(name) {
		name = strings.ToUpper(name)
	}
	return `"` + strings.ReplaceAll(name, `"`, `""`) + `"`
}
