// Package dialects renders logical plans as SQL for each engine. A dialect
// is described once: the few spellings that differ (quoting, literals,
// functions) and the capabilities the renderer consults to pick a rewrite
// or to refuse a construct with an error naming the dialect.
package dialects

import (
	"fmt"
	"sort"
	"strings"

	"github.com/rollwise/rollwise/planner"
)

// Caps are what an engine can do, as data.
type Caps struct {
	// GroupingSets: GROUP BY GROUPING SETS (...) with GROUPING(...).
	GroupingSets bool
	// FilterClause: agg(x) FILTER (WHERE p).
	FilterClause bool
	// ExactMedian: an exact continuous median aggregate.
	ExactMedian bool
	// NullsLast: ORDER BY x NULLS LAST.
	NullsLast bool
}

// Dialect is what differs between SQL engines.
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
	// TypeName is the SQL type for casts.
	TypeName(t planner.Type) string
	// Agg spells an aggregate call over an already rendered argument
	// ("" for count(*)).
	Agg(fn string, distinct bool, arg string) (string, error)
	// Divide spells fractional division that gives NULL on a zero divisor.
	Divide(l, r string) string
	// DateTrunc and Extract spell the date functions.
	DateTrunc(unit, arg string, t planner.Type) string
	Extract(unit, arg string) string
	// BitAnd spells a & b on integers.
	BitAnd(a, b string) string
	// NullSafeEqual spells equality that treats two NULLs as equal.
	NullSafeEqual(a, b string) string
}

var registry = map[string]Dialect{
	"duckdb": duckdb{},
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
func (ansi) Divide(l, r string) string { return l + " / NULLIF(" + r + ", 0)" }
func (ansi) Extract(unit, arg string) string {
	return "EXTRACT(" + strings.ToUpper(unit) + " FROM " + arg + ")"
}
func (ansi) BitAnd(a, b string) string { return "(" + a + " & " + b + ")" }
func (ansi) NullSafeEqual(a, b string) string {
	return a + " IS NOT DISTINCT FROM " + b
}

// duckdb is the embedded engine's dialect.
type duckdb struct{ ansi }

func (duckdb) Name() string { return "duckdb" }
func (duckdb) Caps() Caps {
	return Caps{GroupingSets: true, FilterClause: true, ExactMedian: true, NullsLast: true}
}

func (duckdb) TypeName(t planner.Type) string {
	switch t {
	case planner.TypeInteger:
		return "BIGINT"
	case planner.TypeDecimal:
		return "DECIMAL(38, 6)"
	case planner.TypeFloat:
		return "DOUBLE"
	case planner.TypeDate:
		return "DATE"
	case planner.TypeTimestamp:
		return "TIMESTAMP"
	case planner.TypeBoolean:
		return "BOOLEAN"
	}
	return "VARCHAR"
}

func (duckdb) Agg(fn string, distinct bool, arg string) (string, error) {
	switch {
	case arg == "":
		return "count(*)", nil
	case distinct:
		return fn + "(DISTINCT " + arg + ")", nil
	}
	switch fn {
	case "stddev":
		fn = "stddev_samp"
	case "variance":
		fn = "var_samp"
	case "median":
		// DuckDB's median averages the two middle values of an even count
		// for numbers: the continuous median (duckdb.org/docs, aggregates).
		fn = "median"
	}
	return fn + "(" + arg + ")", nil
}

func (duckdb) DateTrunc(unit, arg string, t planner.Type) string {
	s := "date_trunc('" + unit + "', " + arg + ")"
	if t == planner.TypeDate {
		return "CAST(" + s + " AS DATE)"
	}
	return s
}
