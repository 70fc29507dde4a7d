package dialects

import (
	"regexp"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// snowflake is Snowflake.
type snowflake struct{ ansi }

func (snowflake) Name() string { return "snowflake" }

// Caps: GROUPING SETS with a multi-argument GROUPING (§4); no FILTER
// clause (§5); MEDIAN is exact (§7); NULLS LAST is supported.
func (snowflake) Caps() Caps {
	return Caps{GroupingSets: true, ExactMedian: true, ApproxMedian: true, SampleStats: true,
		NullsLast: true, PredicateValues: true, FullOuterJoin: true}
}

// regularLower is a name Snowflake would store as written in upper case
// had it been written without quotes.
var regularLower = regexp.MustCompile(`^[a-z_][a-z0-9_$]*$`)

// Ident: Snowflake stores unquoted names in upper case and resolves
// quoted names case-sensitively (§1, docs.snowflake.com identifiers-syntax),
// so a table created as `CREATE TABLE sales_lines` is SALES_LINES and
// "sales_lines" would not find it. A name that is all lower case and
// regular is therefore quoted in upper case, which resolves exactly as the
// unquoted name would while staying safe from keywords; any other name is
// quoted as written. A quote inside is doubled.
func (snowflake) Ident(name string) string {
	if regularLower.MatchString(name) {
		name = strings.ToUpper(name)
	}
	return `"` + strings.ReplaceAll(name, `"`, `""`) + `"`
}

// String: backslash sequences are processed in single-quoted strings
// (§2, docs.snowflake.com data-types-text, escape sequences), so a
// backslash is doubled; a quote is doubled.
func (snowflake) String(s string) string {
	return "'" + strings.NewReplacer(`\`, `\\`, `'`, `''`).Replace(s) + "'"
}

// Date and Timestamp: CAST of ISO text, read by the AUTO input formats.
func (snowflake) Date(s string) string      { return "CAST('" + s + "' AS DATE)" }
func (snowflake) Timestamp(s string) string { return "CAST('" + s + "' AS TIMESTAMP_NTZ)" }

func (snowflake) TypeName(t model.Type) string {
	switch t {
	case model.TypeInteger:
		return "NUMBER(38, 0)"
	case model.TypeDecimal:
		return "NUMBER(38, 6)"
	case model.TypeFloat:
		return "FLOAT"
	case model.TypeDate:
		return "DATE"
	case model.TypeTimestamp:
		return "TIMESTAMP_NTZ"
	case model.TypeBoolean:
		return "BOOLEAN"
	}
	return "VARCHAR"
}

func (d snowflake) ColumnType(t model.Type) string { return d.TypeName(t) }

func (d snowflake) Cast(arg string, _, to model.Type) string { return castWith(d, arg, to) }

// Agg: avg of a NUMBER is a NUMBER with a few more decimal places (§3's
// scale rule), so the inputs of avg and the statistics are made FLOAT, as
// DuckDB computes them; MEDIAN is exact (docs.snowflake.com median).
func (snowflake) Agg(fn string, distinct bool, arg string) (string, error) {
	switch {
	case arg == "":
		return "count(*)", nil
	case distinct:
		return fn + "(DISTINCT " + arg + ")", nil
	case fn == "median":
		return "median(" + arg + ")", nil
	case isStat(fn):
		return statName(fn) + "(CAST(" + arg + " AS FLOAT))", nil
	}
	return fn + "(" + arg + ")", nil
}

// approxMedian: APPROX_PERCENTILE (docs.snowflake.com approx_percentile).
func (snowflake) approxMedian(arg string) string { return "APPROX_PERCENTILE(" + arg + ", 0.5)" }

// Divide: NUMBER / NUMBER keeps at most 12 decimal places (§3) and a zero
// divisor is an error.
func (snowflake) Divide(l, r string) string {
	return "CAST(" + l + " AS FLOAT) / NULLIF(" + r + ", 0)"
}

// DateTrunc keeps a DATE a DATE (§9); weeks start on Monday under the
// default WEEK_START = 0 (docs.snowflake.com, date and time parts).
func (snowflake) DateTrunc(unit, arg string, _ model.Type) string {
	return "DATE_TRUNC('" + strings.ToUpper(unit) + "', " + arg + ")"
}

// Extract: WEEKISO is the ISO week; WEEK follows WEEK_OF_YEAR_POLICY.
func (snowflake) Extract(unit, arg string) string {
	if unit == "week" {
		unit = "weekiso"
	}
	return "EXTRACT(" + strings.ToUpper(unit) + " FROM " + arg + ")"
}

// BitAnd: Snowflake has no & operator; BITAND (docs.snowflake.com bitand).
func (snowflake) BitAnd(a, b string) string { return "BITAND(" + a + ", " + b + ")" }

// Call: GREATEST and LEAST return NULL when an argument is NULL;
// GREATEST_IGNORE_NULLS and LEAST_IGNORE_NULLS ignore them as DuckDB does
// (docs.snowflake.com greatest_ignore_nulls, bundle 2024_03).
func (snowflake) Call(name string, args []string, _ []model.Type) (string, error) {
	switch name {
	case "greatest", "least":
		if len(args) == 1 {
			return args[0], nil
		}
		return strings.ToUpper(name) + "_IGNORE_NULLS(" + strings.Join(args, ", ") + ")", nil
	}
	return plainCall(name, args), nil
}
