// Package dialects renders logical plans as SQL for each engine. A dialect
// is described once: the few spellings that differ (quoting, literals,
// functions) and the capabilities the renderer consults to pick a rewrite
// or to refuse a construct with an error naming the dialect.
//
// The facts behind each dialect's rules are in docs/engine-facts.md
// (section numbers are cited as "§N" beside the rules), with the engines'
// own documents as sources; docs/dialects.md is the users' summary.
package dialects

import (
	"fmt"
	"sort"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// Caps are what an engine can do, as data.
type Caps struct {
	// GroupingSets: GROUP BY GROUPING SETS (...) with a grouping id
	// (GroupingID). Without it, total rows need UnionGroupingSets.
	GroupingSets bool
	// FilterClause: agg(x) FILTER (WHERE p). Without it, FilteredAgg puts
	// a CASE inside the aggregate.
	FilterClause bool
	// ExactMedian: an exact continuous median aggregate.
	ExactMedian bool
	// ApproxMedian: an approximate median aggregate, used only when the
	// user passes --approximate (see WithApproximate).
	ApproxMedian bool
	// SampleStats: the sample standard deviation and variance aggregates.
	SampleStats bool
	// NullsLast: ORDER BY x NULLS LAST. Without it, OrderKey sorts on
	// CASE WHEN x IS NULL THEN 1 ELSE 0 END first.
	NullsLast bool
	// DistinctWindow: COUNT(DISTINCT x) OVER (PARTITION BY ...). Without
	// it, a distinct count per window needs a pre-aggregate joined back.
	DistinctWindow bool
	// PredicateValues: a predicate is a value that can be selected and
	// stored (a boolean type). Without it (SQL Server), BoolValue and
	// Truth convert between predicates and 1/0.
	PredicateValues bool
	// FullOuterJoin: FULL OUTER JOIN.
	FullOuterJoin bool
	// Top: row limits are written SELECT TOP (n) rather than LIMIT n.
	Top bool
}

// Dialect is what differs between SQL engines. Every method returns SQL
// text built only from its arguments (already rendered SQL) and from
// values it quotes itself, so that no name or value can leave its quotes.
type Dialect interface {
	// Name is the dialect's name on the command line.
	Name() string
	Caps() Caps
	// Ident quotes an identifier.
	Ident(name string) string
	// String renders a string literal.
	String(s string) string
	// Date and Timestamp render date and timestamp literals
	// (already validated as YYYY-MM-DD[ HH:MM:SS]).
	Date(s string) string
	Timestamp(s string) string
	// Bool renders the literal true or false.
	Bool(v bool) string
	// TypeName is the SQL type for casts.
	TypeName(t model.Type) string
	// ColumnType is the SQL type of a stored column in CREATE TABLE.
	ColumnType(t model.Type) string
	// Cast converts an already rendered value of type from to type to.
	Cast(arg string, from, to model.Type) string
	// Agg spells an aggregate call over an already rendered argument
	// ("" for count(*)). It refuses, with an *UnsupportedError, an
	// aggregate the engine cannot compute exactly.
	Agg(fn string, distinct bool, arg string) (string, error)
	// Divide spells fractional division that gives NULL on a zero divisor.
	Divide(l, r string) string
	// DateTrunc and Extract spell the date functions.
	DateTrunc(unit, arg string, t model.Type) string
	Extract(unit, arg string) string
	// BitAnd spells a & b on integers.
	BitAnd(a, b string) string
	// NullSafeEqual spells equality that treats two NULLs as equal.
	NullSafeEqual(a, b string) string
	// Concat spells the text concatenation a || b (NULL if either is).
	Concat(a, b string) string
	// Call spells a scalar function of the language (coalesce, nullif,
	// abs, round, least, greatest, lower, upper) with DuckDB's meaning;
	// types are the arguments' types. It refuses, with an
	// *UnsupportedError, a function the engine cannot compute exactly.
	Call(name string, args []string, types []model.Type) (string, error)
	// GroupingID spells the grouping id of quoted group keys: a bit mask
	// of the rolled-up keys, the last key the lowest bit.
	GroupingID(keys []string) string
	// Limit returns what goes after SELECT (top) or at the end of the
	// statement (tail) to keep the first n rows.
	Limit(n int) (top, tail string)
	// BoolValue turns a predicate into a value that can be selected
	// (NULL when the predicate is unknown); Truth turns such a value (or
	// a boolean column) back into a predicate.
	BoolValue(pred string) string
	Truth(value string) string
}

// registry lists the dialects by name. It is built here, not in init().
var registry = map[string]Dialect{
	"duckdb":    duckdb{},
	"postgres":  postgres{},
	"sqlite":    sqlite{},
	"mysql":     mysql{},
	"sqlserver": sqlserver{},
	"snowflake": snowflake{},
	"bigquery":  bigquery{},
	"trino":     trino{},
	"spark":     spark{},
}

// Get returns the dialect called name, or an error listing the valid ones.
func Get(name string) (Dialect, error) {
	if d, ok := registry[strings.ToLower(name)]; ok {
		return d, nil
	}
	return nil, fmt.Errorf("unknown dialect %q; the dialects are %s", name, strings.Join(Names(), ", "))
}

// Names lists the dialects, sorted.
func Names() []string {
	var out []string
	for n := range registry {
		out = append(out, n)
	}
	sort.Strings(out)
	return out
}

// UnsupportedError says that a dialect cannot express a construct exactly.
type UnsupportedError struct {
	Dialect   string
	Construct string
	Hint      string
}

func (e *UnsupportedError) Error() string {
	s := fmt.Sprintf("%s cannot express %s exactly", e.Dialect, e.Construct)
	if e.Hint != "" {
		s += "; " + e.Hint
	}
	return s
}

// ansi holds the spellings most engines share; dialects embed it and
// override what differs.
type ansi struct{}

func (ansi) Ident(name string) string { return `"` + strings.ReplaceAll(name, `"`, `""`) + `"` }
func (ansi) String(s string) string   { return "'" + strings.ReplaceAll(s, "'", "''") + "'" }
func (ansi) Date(s string) string     { return "DATE '" + s + "'" }
func (ansi) Timestamp(s string) string {
	return "TIMESTAMP '" + s + "'"
}
func (ansi) Bool(v bool) string {
	if v {
		return "TRUE"
	}
	return "FALSE"
}
func (ansi) Divide(l, r string) string { return l + " / NULLIF(" + r + ", 0)" }
func (ansi) Extract(unit, arg string) string {
	return "EXTRACT(" + strings.ToUpper(unit) + " FROM " + arg + ")"
}
func (ansi) BitAnd(a, b string) string { return "(" + a + " & " + b + ")" }
func (ansi) NullSafeEqual(a, b string) string {
	return a + " IS NOT DISTINCT FROM " + b
}
func (ansi) Concat(a, b string) string       { return "(" + a + " || " + b + ")" }
func (ansi) GroupingID(keys []string) string { return "GROUPING(" + strings.Join(keys, ", ") + ")" }
func (ansi) Limit(n int) (string, string)    { return "", fmt.Sprintf("LIMIT %d", n) }
func (ansi) BoolValue(pred string) string    { return pred }
func (ansi) Truth(value string) string       { return value }

// Call spells the scalar functions as DuckDB names them; dialects whose
// functions differ in name or in meaning override it.
func (ansi) Call(name string, args []string, _ []model.Type) (string, error) {
	return plainCall(name, args), nil
}

func plainCall(name string, args []string) string {
	return name + "(" + strings.Join(args, ", ") + ")"
}

// castWith is CAST(arg AS type), the cast most dialects spell.
func castWith(d interface{ TypeName(model.Type) string }, arg string, to model.Type) string {
	return "CAST(" + arg + " AS " + d.TypeName(to) + ")"
}

// nullIgnoring spells greatest or least so that NULL arguments are
// ignored (DuckDB's meaning: NULL only when every argument is NULL) on an
// engine whose function returns NULL as soon as one argument is NULL:
// each argument is replaced by the first non-NULL of it and the others,
// which never changes the extreme (common practice: coalesce-wrapping the
// arguments is the usual way to make greatest and least skip NULLs).
func nullIgnoring(fn string, args []string) string {
	if len(args) == 1 {
		return args[0]
	}
	parts := make([]string, len(args))
	for i, a := range args {
		rest := []string{a}
		for j, b := range args {
			if j != i {
				rest = append(rest, b)
			}
		}
		parts[i] = "COALESCE(" + strings.Join(rest, ", ") + ")"
	}
	return fn + "(" + strings.Join(parts, ", ") + ")"
}

// statName maps the language's statistics to the standard sample
// aggregates: stddev and variance are the SAMPLE statistics (language.md),
// and the bare STDDEV/VARIANCE names mean the population in MySQL and
// MariaDB (§12), so the _samp names are always spelled out.
func statName(fn string) string {
	switch fn {
	case "stddev":
		return "stddev_samp"
	case "variance":
		return "var_samp"
	}
	return fn
}

// isStat reports whether fn is computed in floating point by the language
// (avg, median, stddev, variance are typed float by the planner).
func isStat(fn string) bool {
	switch fn {
	case "avg", "median", "stddev", "variance":
		return true
	}
	return false
}
