// Package dialects renders logical plans as SQL for each engine. A dialect
// is one description (a Dialect value in the engine's file): data for what
// is data (type names, quoting, capabilities, aggregate spellings, view
// DDL) and functions only for the spellings that need code. The renderer
// reads the description and does the rest once for every engine: count(*),
// DISTINCT, the float casts of statistics and ratios, the rewrites an
// engine needs where it lacks a construct, and the refusals, with an error
// naming the dialect, where it cannot express one exactly.
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

// Dialect describes one SQL engine. Its fields are set in the engine's
// file; the methods in spell.go read them. Every spelling is built only
// from its arguments (already rendered SQL) and from values it quotes
// itself, so that no name or value can leave its quotes.
type Dialect struct {
	name string
	caps Caps
	// types are the SQL types of casts; columns those of stored columns in
	// CREATE TABLE where they differ (nil: types).
	types   typeNames
	columns *typeNames

	// quotes are the identifier quotes, open and close ("" for `""`); a
	// close quote inside a name is doubled. ident replaces them where
	// quoting needs code.
	quotes string
	ident  func(name string) string
	// escape escapes the text of a '...' string literal (nil: a quote is
	// doubled); str replaces it where a literal needs code.
	escape *strings.Replacer
	str    func(s string) string
	// date and timestamp are the literals' templates, %s standing for the
	// validated text (YYYY-MM-DD[ HH:MM:SS]); bools the literals false and
	// true (zero: FALSE and TRUE).
	date, timestamp string
	bools           [2]string

	// aggs spell the aggregates whose spelling is not fn(x): %s stands for
	// the argument, %f for the argument cast to the float type. countAll
	// is count(*) ("" for count(*)).
	aggs     map[string]string
	countAll string
	// refused are the aggregates and scalar functions the engine cannot
	// compute exactly, by the language's name.
	refused map[string]refusal
	// approxMedian is the approximate median aggregate that --approximate
	// may use where the engine has no exact one (%s, %f as in aggs).
	approxMedian string

	// floatDivide casts the dividend of a ratio to the float type.
	floatDivide bool
	// roundToInteger rounds a number (%s) before a cast to integer, where
	// the engine's cast truncates; casts spell the casts to a type that
	// are not CAST(x AS type).
	roundToInteger string
	casts          map[model.Type]string

	// calls are the scalar functions' names where they differ;
	// nullsInExtremes tells that greatest and least return NULL as soon as
	// an argument is NULL, so NULLs are stepped over (nullIgnoring). call
	// spells what needs code; ok false leaves the rest to the data.
	calls           map[string]string
	nullsInExtremes bool
	call            func(name string, args []string, types []model.Type) (sql string, ok bool)

	// dateTrunc spells date_trunc; moveDate moves a date or timestamp
	// forward by a whole number of days or months, a month move clamping
	// to the target month's last day (2026-01-31 plus 1 month is
	// 2026-02-28), as a time edit's `back` needs (language.md, "Time");
	// extract spells extract where it is not EXTRACT(UNIT FROM x), with
	// week spelled weekUnit.
	dateTrunc func(unit, arg string, t model.Type) string
	moveDate  func(arg string, n int, unit string, t model.Type) string
	extract   func(unit, arg string) string
	weekUnit  string

	// bitAnd is the function of a & b ("" for the operator); nullSafeEqual
	// the operator of equality that treats two NULLs as equal ("" for IS
	// NOT DISTINCT FROM); concat spells a || b where it is not that.
	bitAnd        string
	nullSafeEqual string
	concat        func(a, b string) string
	// grouping is the function of the grouping id ("" for GROUPING);
	// groupingOneKey tells that it takes one key, so the mask is summed
	// from one call per key.
	grouping       string
	groupingOneKey bool
	// top: row limits are written SELECT TOP (n) rather than LIMIT n.
	top bool
	// noBoolValues: a predicate is not a value that can be selected (SQL
	// Server); BoolValue and Truth convert between predicates and 1/0.
	noBoolValues bool
	// columnName spells a report's column name where the engine's column
	// names cannot hold it as written (nil: as written).
	columnName func(name string) string
	// unifyDecimal is the type each branch of a decimal union is widened
	// to, where the engine's union can lose digits ("" for none).
	unifyDecimal string
	// materialize writes each layer AS MATERIALIZED, for engines that
	// would copy a CTE read once into the query that reads it; layerTail,
	// when set, nests the layers as derived tables in one CTE instead,
	// each ending with it (see render_layers.go).
	materialize bool
	layerTail   string
	// materializeShared writes a rows CTE that several scans read AS
	// MATERIALIZED (see sharedRows).
	materializeShared bool
	// view is how the engine creates views.
	view ViewDDL
}

// Caps are the constructs an engine has that the renderer consults to
// pick a rewrite where it lacks one.
type Caps struct {
	// GroupingSets: GROUP BY GROUPING SETS (...) with a grouping id
	// (GroupingID). Without it, total rows are a UNION ALL of groupings.
	GroupingSets bool
	// FilterClause: agg(x) FILTER (WHERE p). Without it, filteredAgg puts
	// a CASE inside the aggregate.
	FilterClause bool
	// NullsLast: ORDER BY x NULLS LAST. Without it, OrderKey sorts on
	// CASE WHEN x IS NULL THEN 1 ELSE 0 END first.
	NullsLast bool
}

// typeNames are a dialect's names of the language's types.
type typeNames struct {
	integer, decimal, float, text, date, timestamp, boolean string
}

func (n *typeNames) of(t model.Type) string {
	switch t {
	case model.TypeInteger:
		return n.integer
	case model.TypeDecimal:
		return n.decimal
	case model.TypeFloat:
		return n.float
	case model.TypeDate:
		return n.date
	case model.TypeTimestamp:
		return n.timestamp
	case model.TypeBoolean:
		return n.boolean
	}
	return n.text
}

// refusal is a construct an engine cannot compute exactly: what it is, a
// hint, and, when --approximate may spell it by its plain call, the note
// that says what is then approximate.
type refusal struct {
	construct, hint, approximate string
}

// all lists the dialects. It is built here, not in init().
var all = []*Dialect{duckdb, postgres, sqlite, mysql, sqlserver, snowflake, bigquery, trino, spark}

// Get returns the dialect called name, or an error listing the valid ones.
func Get(name string) (*Dialect, error) {
	for _, d := range all {
		if strings.EqualFold(d.name, name) {
			return d, nil
		}
	}
	return nil, fmt.Errorf("unknown dialect %q; the dialects are %s", name, strings.Join(Names(), ", "))
}

// Names lists the dialects, sorted.
func Names() []string {
	var out []string
	for _, d := range all {
		out = append(out, d.name)
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

func plainCall(name string, args []string) string {
	return name + "(" + strings.Join(args, ", ") + ")"
}

// sampleStats spell avg and the sample statistics over the argument made
// a float, as DuckDB computes them: avg of an integer or a decimal is an
// integer or a decimal on several engines (§3), and the bare STDDEV and
// VARIANCE mean the population in MySQL and MariaDB (§12), so the _samp
// names are always spelled out (stddev and variance are the SAMPLE
// statistics: language.md). with adds a dialect's own entries.
func sampleStats(with map[string]string) map[string]string {
	out := map[string]string{"avg": "avg(%f)", "stddev": "stddev_samp(%f)", "variance": "var_samp(%f)"}
	for k, v := range with {
		out[k] = v
	}
	return out
}

// medianRefusal refuses an aggregate median where the engine has none;
// the renderer then numbers the rows with window functions instead
// (render_median.go), so only a direct Agg call meets it.
func medianRefusal(hint string) refusal {
	return refusal{construct: "a median", hint: hint + ": Render numbers the rows instead (render_median.go)"}
}
