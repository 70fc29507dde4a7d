package dialects

import (
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// postgres is PostgreSQL (checked live against PostgreSQL 15).
var postgres = &Dialect{
	name: "postgres",
	// GROUPING SETS with a multi-argument GROUPING() (§4), FILTER (§5),
	// NULLS LAST (§10).
	caps: Caps{GroupingSets: true, FilterClause: true, NullsLast: true},
	types: typeNames{integer: "BIGINT", decimal: "NUMERIC(38, 6)", float: "DOUBLE PRECISION", text: "TEXT",
		date: "DATE", timestamp: "TIMESTAMP", boolean: "BOOLEAN"},
	str: postgresString,
	// avg and stddev_samp of integers and numerics return numeric
	// (functions-aggregate), where DuckDB returns DOUBLE, the type the
	// planner gives them. The median is percentile_cont(0.5), an ordered-
	// set aggregate that interpolates (functions-aggregate, §7).
	aggs: sampleStats(map[string]string{"median": "percentile_cont(0.5) WITHIN GROUP (ORDER BY %f)"}),
	// integer / integer truncates (§3, functions-math), and numeric /
	// numeric would not give the double the planner types a ratio as. A
	// double is cast to bigint rounding half to even, as DuckDB does, and
	// a numeric rounding half away from zero, as DuckDB does for decimals
	// (both checked on the engines), so the plain CAST is right.
	floatDivide: true,
	call:        postgresCall,
	// date_trunc of a date returns a timestamp with time zone (checked),
	// which depends on the session's time zone, so the date is made a
	// timestamp first and the result a date again.
	dateTrunc: func(unit, arg string, t model.Type) string {
		if t == model.TypeDate {
			return "CAST(date_trunc('" + unit + "', CAST(" + arg + " AS TIMESTAMP)) AS DATE)"
		}
		return "date_trunc('" + unit + "', " + arg + ")"
	},
	// EXTRACT returns numeric (PostgreSQL 14+), DuckDB a BIGINT; `week` is
	// the ISO week in both (functions-datetime).
	extract: func(unit, arg string) string {
		return "CAST(EXTRACT(" + strings.ToUpper(unit) + " FROM " + arg + ") AS BIGINT)"
	},
	moveDate: intervalMove,
	// PostgreSQL inlines a CTE read once
	// (postgresql.org/docs/current/queries-with.html, "CTE
	// Materialization") and then copies each of its expressions into every
	// place that reads the column, which grows a chain of layers again
	// (checked: the deepest measure of a 50-deep layered block had not
	// planned after 15 minutes and 4.5 GB; with MATERIALIZED, PostgreSQL
	// 12+, it runs at once).
	materialize: true,
	// CREATE OR REPLACE VIEW refuses to change a column's name or type:
	// that fails loudly, and is left to whoever owns the views that depend
	// on it (DROP ... CASCADE would remove them).
	view: ViewDDL{Style: CreateOrReplace, OrderBy: true, ColumnList: true},
}

// postgresString uses the escape-string form E'...' when s holds a
// backslash: with standard_conforming_strings off (a server setting), a
// backslash in a plain '...' literal is an escape character, and E'...'
// treats it as one whatever the setting, so doubling it is always right
// (postgresql.org/docs/current/sql-syntax-lexical.html#SQL-SYNTAX-STRINGS-ESCAPE).
func postgresString(s string) string {
	q := strings.ReplaceAll(s, "'", "''")
	if strings.Contains(s, `\`) {
		return "E'" + strings.ReplaceAll(q, `\`, `\\`) + "'"
	}
	return "'" + q + "'"
}

// postgresCall: round of a double precision value rounds half to even in
// PostgreSQL (checked: round(2.5::float8) = 2) and has no two-argument
// form, while DuckDB rounds half away from zero; numeric's round does, so
// a float is rounded as numeric. greatest and least ignore NULLs as in
// DuckDB (functions-conditional).
func postgresCall(name string, args []string, types []model.Type) (string, bool) {
	if name == "round" && len(types) > 0 && types[0] == model.TypeFloat {
		a := append([]string{"CAST(" + args[0] + " AS NUMERIC)"}, args[1:]...)
		return "CAST(round(" + strings.Join(a, ", ") + ") AS DOUBLE PRECISION)", true
	}
	return "", false
}
