package dialects

import (
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// postgres is PostgreSQL (checked live against PostgreSQL 15).
type postgres struct{ ansi }

func (postgres) Name() string { return "postgres" }

// Caps: GROUPING SETS with a multi-argument GROUPING() (§4), FILTER (§5),
// NULLS LAST (§10), percentile_cont as an aggregate (§7). No
// COUNT(DISTINCT) OVER: the window call syntax has no DISTINCT (§6).
func (postgres) Caps() Caps {
	return Caps{GroupingSets: true, FilterClause: true, ExactMedian: true, SampleStats: true,
		NullsLast: true, PredicateValues: true, FullOuterJoin: true}
}

// String uses the escape-string form E'...' when s holds a backslash:
// with standard_conforming_strings off (a server setting), a backslash in
// a plain '...' literal is an escape character, and E'...' treats it as
// one whatever the setting, so doubling it is always right
// (postgresql.org/docs/current/sql-syntax-lexical.html#SQL-SYNTAX-STRINGS-ESCAPE).
func (postgres) String(s string) string {
	q := strings.ReplaceAll(s, "'", "''")
	if strings.Contains(s, `\`) {
		return "E'" + strings.ReplaceAll(q, `\`, `\\`) + "'"
	}
	return "'" + q + "'"
}

func (postgres) TypeName(t model.Type) string {
	switch t {
	case model.TypeInteger:
		return "BIGINT"
	case model.TypeDecimal:
		return "NUMERIC(38, 6)"
	case model.TypeFloat:
		return "DOUBLE PRECISION"
	case model.TypeDate:
		return "DATE"
	case model.TypeTimestamp:
		return "TIMESTAMP"
	case model.TypeBoolean:
		return "BOOLEAN"
	}
	return "TEXT"
}

func (d postgres) ColumnType(t model.Type) string { return d.TypeName(t) }

// Cast: a double is cast to bigint rounding half to even, as DuckDB does,
// and a numeric rounding half away from zero, as DuckDB does for decimals
// (both checked on the engines), so the plain CAST is right.
func (d postgres) Cast(arg string, _, to model.Type) string { return castWith(d, arg, to) }

// Agg casts the inputs of avg and the statistics to double precision:
// PostgreSQL's avg and stddev_samp of integers and numerics return
// numeric (functions-aggregate), where DuckDB returns DOUBLE, the type
// the planner gives them. The median is percentile_cont(0.5), an ordered-
// set aggregate that interpolates (functions-aggregate, §7).
func (postgres) Agg(fn string, distinct bool, arg string) (string, error) {
	switch {
	case arg == "":
		return "count(*)", nil
	case distinct:
		return fn + "(DISTINCT " + arg + ")", nil
	case fn == "median":
		return "percentile_cont(0.5) WITHIN GROUP (ORDER BY CAST(" + arg + " AS DOUBLE PRECISION))", nil
	case isStat(fn):
		return statName(fn) + "(CAST(" + arg + " AS DOUBLE PRECISION))", nil
	}
	return fn + "(" + arg + ")", nil
}

// Divide casts the dividend: integer / integer truncates in PostgreSQL
// (§3, functions-math), and numeric / numeric would not give the double
// the planner types a ratio as.
func (postgres) Divide(l, r string) string {
	return "CAST(" + l + " AS DOUBLE PRECISION) / NULLIF(" + r + ", 0)"
}

// DateTrunc: date_trunc of a date returns a timestamp with time zone
// (checked), which depends on the session's time zone, so the date is
// made a timestamp first and the result a date again.
func (postgres) DateTrunc(unit, arg string, t model.Type) string {
	if t == model.TypeDate {
		return "CAST(date_trunc('" + unit + "', CAST(" + arg + " AS TIMESTAMP)) AS DATE)"
	}
	return "date_trunc('" + unit + "', " + arg + ")"
}

// Extract: EXTRACT returns numeric (PostgreSQL 14+), DuckDB a BIGINT;
// `week` is the ISO week in both (functions-datetime).
func (postgres) Extract(unit, arg string) string {
	return "CAST(EXTRACT(" + strings.ToUpper(unit) + " FROM " + arg + ") AS BIGINT)"
}

// Call: round of a double precision value rounds half to even in
// PostgreSQL (checked: round(2.5::float8) = 2) and has no two-argument
// form, while DuckDB rounds half away from zero; numeric's round does, so
// a float is rounded as numeric. greatest and least ignore NULLs as in
// DuckDB (functions-conditional).
func (postgres) Call(name string, args []string, types []model.Type) (string, error) {
	if name == "round" && len(types) > 0 && types[0] == model.TypeFloat {
		a := append([]string{"CAST(" + args[0] + " AS NUMERIC)"}, args[1:]...)
		return "CAST(round(" + strings.Join(a, ", ") + ") AS DOUBLE PRECISION)", nil
	}
	return plainCall(name, args), nil
}

// Fence writes a layer AS MATERIALIZED (PostgreSQL 12+): PostgreSQL
// inlines a CTE read once (postgresql.org/docs/current/queries-with.html,
// "CTE Materialization") and then copies each of its expressions into
// every place that reads the column, which grows a chain of layers again
// (checked: the deepest measure of a 50-deep layered block had not planned
// after 15 minutes and 4.5 GB; with MATERIALIZED it runs at once).
func (postgres) Fence(name, body string) string { return name + " AS MATERIALIZED (\n" + body + "\n)" }
