// Package verify checks a handwritten SQL rollup against the measure
// definitions: it runs the handwritten query and the compiled one on the
// same engine, aligns their rows by the group values (total rows
// included), compares every measure value, and explains each difference
// by finding the usual wrong formula that reproduces the handwritten
// value on the same data (sum-of-ratios, fan-out, product-of-sums...).
//
// The package never prints on its own and never touches cobra: Run
// returns a Report, and WriteText and WriteJSON write it.
package verify

import (
	"context"
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/engine"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
)

// The diagnoses: the wrong formulas verify knows how to recognise.
const (
	// SumOfRatios: a total that adds the ratios of the rows it covers.
	SumOfRatios = "sum-of-ratios"
	// AverageOfRatios: a ratio averaged over rows instead of re-evaluated.
	AverageOfRatios = "average-of-ratios"
	// ProductOfSums: sum(a) * sum(b) in place of sum(a * b).
	ProductOfSums = "product-of-sums"
	// FanOut: a join that repeats the fact rows, multiplying a sum.
	FanOut = "fan-out"
	// SumOfDistinctCounts: a total that adds the rows' distinct counts.
	SumOfDistinctCounts = "sum-of-distinct-counts"
	// FilterIgnored: a narrowing, a pin or a query filter not applied.
	FilterIgnored = "filter-ignored"
	// FilterLeaked: a query filter applied where the measure drops it.
	FilterLeaked = "filter-leaked"
	// NullAsZero: NULLs counted as zeros.
	NullAsZero = "null-as-zero"
	// DroppedUnmatched: fact rows whose link finds no match are dropped,
	// as an inner join does.
	DroppedUnmatched = "dropped-unmatched"
)

// Spec is what to compare, as the command line gives it.
type Spec struct {
	Measures []string
	By       []string
	Where    string
	Totals   string
	// Map maps a measure, or a --by reference as written, to the
	// handwritten column that holds it, where the column is not named
	// after the measure (or the column's name).
	Map map[string]string
	// GroupingColumn names a handwritten column computed with
	// GROUPING(g1, ..., gn) over the --by columns in order: it tells
	// total rows from genuine NULL groups.
	GroupingColumn string
	// Tolerance is the relative tolerance for inexact values; see Agree.
	Tolerance float64
}

// Input is everything Run needs.
type Input struct {
	Spec Spec
	// Model, Query and Plan are the compiled query; Compiled its SQL.
	Model    *model.Model
	Query    *model.Query
	Plan     *plan.Plan
	Compiled string
	// Handwritten is the SQL to check; SQLName names it in messages.
	Handwritten string
	SQLName     string
	Dialect     *dialects.Dialect
}

// inputErr says that nothing could be compared because of how verify was
// asked: a column the handwritten SQL lacks, a measure mapped to a column
// of text, a bad option. It is a usage error.
func inputErr(format string, args ...any) error {
	return failure.Usagef(format, args...)
}

// SQLError says that the handwritten SQL failed on the engine.
type SQLError struct {
	Name string
	Err  error
}

func (e *SQLError) Error() string {
	return fmt.Sprintf("the handwritten SQL %s failed: %v", e.Name, e.Err)
}

func (e *SQLError) Unwrap() error { return e.Err }

// Report is the outcome of a comparison.
type Report struct {
	SQLName   string
	Groups    []string
	Measures  []string
	Totals    string
	Tolerance float64
	// Matched counts rows found on both sides; Compared the values
	// compared in them.
	Matched  int
	Compared int
	// Differences are the values that disagree, in rollwise's row order.
	Differences []Difference
	// SQLOnly and RollwiseOnly are the rows found on one side only.
	SQLOnly      []Unmatched
	RollwiseOnly []Unmatched
	// Ambiguous are the rows that could not be told apart: NULL keys
	// that could be a genuine NULL group or a total.
	Ambiguous []Ambiguity
	// Notes are remarks on the comparison (columns not compared, formulas
	// not computable).
	Notes []string
}

// OK reports whether everything agrees.
func (r *Report) OK() bool {
	return len(r.Differences) == 0 && len(r.SQLOnly) == 0 && len(r.RollwiseOnly) == 0 && len(r.Ambiguous) == 0
}

// RowID names a result row by its group values.
type RowID struct {
	// Keys are the group values, one per --by column.
	Keys []any
	// RolledUp names the --by columns rolled up (a total row); nil for a
	// handwritten row whose totals could not be told from NULL groups.
	RolledUp []string
	// Known is false for such a handwritten row.
	Known bool
}

// Difference is one value that disagrees.
type Difference struct {
	Row      RowID
	Measure  string
	SQL      Value
	Rollwise Value
	// Diagnosis names the wrong formula that reproduces the SQL's value,
	// or is "" when none does; Explanation says what it computes.
	Diagnosis   string
	Explanation string
	// AlsoFits names other formulas that give the same value.
	AlsoFits []string
}

// Unmatched is a row found on one side only.
type Unmatched struct {
	Row RowID
	// Values are the row's measure values, in Report.Measures order.
	Values []Value
	// Diagnosis and Explanation say why the row is there, when a wrong
	// formula explains it.
	Diagnosis   string
	Explanation string
}

// Ambiguity is a set of handwritten rows that could match several
// rollwise rows.
type Ambiguity struct {
	SQLRows      []Unmatched
	RollwiseRows []Unmatched
	Reason       string
}

// Run compares the handwritten SQL with the compiled query.
func Run(ctx context.Context, in *Input, r engine.Engine) (*Report, error) {
	v, err := newVerifier(in, r)
	if err != nil {
		return nil, err
	}
	comp, err := v.runCompiled(ctx)
	if err != nil {
		return nil, err
	}
	hw, err := v.runHandwritten(ctx)
	if err != nil {
		return nil, err
	}
	v.comp, v.hw = comp, hw
	v.compare()
	if err := v.diagnose(ctx); err != nil {
		return nil, err
	}
	return v.rep, nil
}

// verifier holds the state of one comparison.
type verifier struct {
	in       *Input
	run      engine.Engine
	stmt     string // the handwritten query, checked by CheckQuery
	n        int    // number of --by columns
	measures []*model.Measure
	names    []string
	rep      *Report
	comp     []resultRow
	hw       *handwritten
	// compIndex maps a cell key to its rollwise row.
	compIndex map[string]int
	// pairs are the matched rows: rollwise index -> handwritten index.
	pairs map[int]int
}

func newVerifier(in *Input, r engine.Engine) (*verifier, error) {
	if in.Model == nil || in.Query == nil || in.Plan == nil || in.Dialect == nil {
		return nil, errors.New("verify: incomplete input")
	}
	tol := in.Spec.Tolerance
	if math.IsNaN(tol) || math.IsInf(tol, 0) || tol < 0 {
		return nil, inputErr("--tolerance must be a number of 0 or more, not %v", tol)
	}
	// Nothing reaches the engine unless the handwritten SQL is one query
	// that only reads.
	stmt, err := CheckQuery(in.Dialect.Name(), in.SQLName, in.Handwritten)
	if err != nil {
		return nil, err
	}
	v := &verifier{in: in, run: r, stmt: stmt, n: len(in.Query.Groups), pairs: map[int]int{}}
	for _, m := range in.Query.Measures {
		v.measures = append(v.measures, m)
		v.names = append(v.names, m.Name)
	}
	for m := range in.Spec.Map {
		if !slices.Contains(v.names, m) && !slices.Contains(in.Query.GroupNames, m) {
			return nil, inputErr("--map names %q, which is neither a measure of the query (%s) nor a --by column (%s)",
				m, strings.Join(v.names, ", "), strings.Join(in.Query.GroupNames, ", "))
		}
	}
	v.rep = &Report{SQLName: in.SQLName, Groups: in.Query.GroupNames, Measures: v.names,
		Totals: string(in.Query.Totals), Tolerance: tol}
	return v, nil
}

// rolledUp names the groups a mask rolls up (never nil).
func (v *verifier) rolledUp(mask uint64) []string { return v.in.Query.RolledUp(mask) }

// runCompiled runs the compiled query and reads its rows.
func (v *verifier) runCompiled(ctx context.Context) ([]resultRow, error) {
	res, err := v.run.Query(ctx, v.in.Compiled, nil)
	if err != nil {
		return nil, fmt.Errorf("the engine rejected rollwise's own query: %w", err)
	}
	rows, err := readCells(res, v.n, v.names)
	if err != nil {
		return nil, fmt.Errorf("internal error: %w", err)
	}
	v.compIndex = map[string]int{}
	for i, r := range rows {
		v.compIndex[cellKey(r.mask, r.keys)] = i
	}
	return rows, nil
}

// compare aligns the rows and compares the values of matched rows.
func (v *verifier) compare() {
	a := align(v.n, v.in.Plan.Sets, v.comp, v.compIndex, v.hw)
	v.pairs = a.pairs
	for ci := range v.comp {
		hi, ok := a.pairs[ci]
		if !ok {
			continue
		}
		v.rep.Matched++
		c, h := v.comp[ci], v.hw.rows[hi]
		for j := range v.names {
			v.rep.Compared++
			if !Agree(h.vals[j], c.vals[j], v.rep.Tolerance) {
				v.rep.Differences = append(v.rep.Differences, Difference{
					Row: v.compID(c), Measure: v.names[j], SQL: h.vals[j], Rollwise: c.vals[j]})
			}
		}
	}
	for _, hi := range a.sqlOnly {
		v.rep.SQLOnly = append(v.rep.SQLOnly, Unmatched{Row: v.hwID(v.hw.rows[hi]), Values: v.hw.rows[hi].vals})
	}
	for _, ci := range a.rwOnly {
		v.rep.RollwiseOnly = append(v.rep.RollwiseOnly, Unmatched{Row: v.compID(v.comp[ci]), Values: v.comp[ci].vals})
	}
	for _, g := range a.ambiguous {
		amb := Ambiguity{Reason: v.ambiguityReason(g)}
		for _, hi := range g.hw {
			amb.SQLRows = append(amb.SQLRows, Unmatched{Row: v.hwID(v.hw.rows[hi]), Values: v.hw.rows[hi].vals})
		}
		for _, ci := range g.comp {
			amb.RollwiseRows = append(amb.RollwiseRows, Unmatched{Row: v.compID(v.comp[ci]), Values: v.comp[ci].vals})
		}
		v.rep.Ambiguous = append(v.rep.Ambiguous, amb)
	}
	v.rep.Notes = append(v.rep.Notes, v.hw.notes...)
	v.rep.Notes = append(v.rep.Notes, v.keyKindNotes()...)
	if extra := v.unaskedTotals(); extra > 0 {
		v.rep.Notes = append(v.rep.Notes, fmt.Sprintf(
			"%d of the SQL's rows are totals the query does not ask for (--totals %s); --totals all asks for every total", extra, v.rep.Totals))
	}
	if len(v.rep.RollwiseOnly) > 0 && v.hw.masks == nil && len(v.in.Plan.Sets) > 1 {
		totalsOnly := true
		for _, u := range v.rep.RollwiseOnly {
			totalsOnly = totalsOnly && len(u.Row.RolledUp) > 0
		}
		if totalsOnly && !v.hw.anyNullKey() {
			v.rep.Notes = append(v.rep.Notes, fmt.Sprintf(
				"the SQL has no total rows (no NULL group values) while the query asks for --totals %s; use GROUP BY ROLLUP(...) in the SQL, or --totals none",
				v.rep.Totals))
		}
	}
}

// unaskedTotals counts the SQL-only rows that a grouping column marks as
// totals of a kind the query's --totals does not compute.
func (v *verifier) unaskedTotals() int {
	asked := map[uint64]bool{}
	for _, s := range v.in.Plan.Sets {
		asked[s] = true
	}
	n := 0
	for _, u := range v.rep.SQLOnly {
		if m := v.maskOf(u.Row); u.Row.Known && m != 0 && !asked[m] {
			n++
		}
	}
	return n
}

func (v *verifier) compID(r resultRow) RowID {
	return RowID{Keys: r.keys, RolledUp: v.rolledUp(r.mask), Known: true}
}

func (v *verifier) hwID(r resultRow) RowID {
	if !r.known {
		return RowID{Keys: r.keys}
	}
	return RowID{Keys: r.keys, RolledUp: v.rolledUp(r.mask), Known: true}
}

// ambiguityReason explains why rows could not be matched and what to do.
func (v *verifier) ambiguityReason(g ambiguous) string {
	var cols []string
	for i, name := range v.in.Query.GroupNames {
		if g.pattern&(1<<(v.n-1-i)) != 0 {
			cols = append(cols, name)
		}
	}
	if v.hw.masks != nil || g.pattern == 0 {
		return fmt.Sprintf("%d handwritten rows have the same group values; each cell should appear once (is a --by column missing from the SQL's GROUP BY, or are some of them total rows, which --totals and --grouping-column would tell apart?)", len(g.hw))
	}
	var sqlCols []string
	for _, c := range v.hw.groupCols {
		sqlCols = append(sqlCols, quoteSQLName(c))
	}
	s := fmt.Sprintf("NULL in %s can be a genuine NULL group or a total row, and rollwise has %d rows that fit %d handwritten row(s)",
		strings.Join(cols, ", "), len(g.comp), len(g.hw))
	return s + fmt.Sprintf("; compute GROUPING(%s) AS grouping_id in the SQL and pass --grouping-column grouping_id",
		strings.Join(sqlCols, ", "))
}

// quoteSQLName quotes a column name for a suggestion when it needs it.
func quoteSQLName(s string) string {
	plain := s != ""
	for i, c := range s {
		plain = plain && (c == '_' || c >= 'a' && c <= 'z' || i > 0 && c >= '0' && c <= '9')
	}
	if plain {
		return s
	}
	return `"` + strings.ReplaceAll(s, `"`, `""`) + `"`
}

// keyKindNotes notes group columns whose values are of different kinds on
// the two sides (text against numbers), which can never match.
func (v *verifier) keyKindNotes() []string {
	var notes []string
	for i, name := range v.in.Query.GroupNames {
		ck, hk := "", ""
		for _, r := range v.comp {
			if k := keyKind(r.keys[i]); k != "" && r.mask&(1<<(v.n-1-i)) == 0 {
				ck = k
				break
			}
		}
		for _, r := range v.hw.rows {
			if k := keyKind(r.keys[i]); k != "" {
				hk = k
				break
			}
		}
		if ck != "" && hk != "" && ck != hk {
			notes = append(notes, fmt.Sprintf("the SQL's column %s holds %s where rollwise's %s holds %s: no row can match; cast it in the SQL",
				v.hw.groupCols[i], hk, name, ck))
		}
	}
	return notes
}
