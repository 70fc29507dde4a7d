// Package plan is how rollwise plans a query: from a model.Query it builds
// the dialect-free logical plan (contexts, scans with their joins and
// leaves, grouping sets, edits as windows, ranges or join-backs,
// per-grain sub-contexts, each measure value computed once per cell) that the dialects
// package renders as SQL.
package plan

import (
	"math/bits"
	"sort"
	"strings"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
)

// Plan is the logical plan of one query, free of any SQL dialect. The root
// context evaluates the query's measures at its grain; per-grain measures
// open sub-contexts at a finer grain.
type Plan struct {
	Query *model.Query
	// Sets are the query's grouping sets, each a mask of the rolled-up
	// groups: bit 1<<(n-1-i) stands for group i, as SQL's
	// GROUPING(g1, ..., gn) counts.
	Sets    []uint64
	Root    *Context
	Outputs []*Output
	// Order is the keys the detail rows are sorted by (the request's
	// order), or nil for the default order by the group values.
	Order []SortKey
	// Scans lists every scan of every context, in creation order.
	Scans []*Scan
	// Cautions are things the reader of the numbers should know.
	Cautions []string
	// Moves are the links to copies of a calendar that `back` joins on a
	// moved date: To's key equals From's column moved forward.
	Moves map[*model.Link]Move
}

// Move is a date moved forward N Units.
type Move struct {
	N    int
	Unit string
}

// SortKey is a key of the report's order: an output (a measure), or,
// when Output is nil, the group column named Group.
type SortKey struct {
	Output *Output
	Group  string
	Desc   bool
}

// Key is a key column of a context: a query group, or a per-grain column.
type Key struct {
	Name string
	Col  *model.Column
	// Pos is where the key was asked for (an item of the group list, or a per list).
	Pos grammar.Pos
	// Expr, when set, is the row expression a scan groups by instead of
	// Col: Col read on rows whose date a time edit moves (`back`).
	Expr model.Expr
	// Pin marks the per key of `D = latest` (`= earliest`): it stands for
	// the pin D = E, a filter, which a later ungroup keeps (a drop, a
	// pin on D or a window edit over D removes it).
	Pin bool
}

// RowExpr is the row expression the key groups rows by.
func (k Key) RowExpr() model.Expr {
	if k.Expr != nil {
		return k.Expr
	}
	return &model.ColRef{Pos: k.Pos, Col: k.Col}
}

// Context is one grain of evaluation: its key columns, grouping sets and
// row filters, the relations that compute values at that grain, and the
// relations whose cells make up its rows.
type Context struct {
	Name    string
	Keys    []Key
	Sets    []uint64
	Filters []model.Expr
	// Rels are the scans and per-grain relations, in creation order.
	Rels []*Rel
	// Bases are the scans whose cells are the context's rows.
	Bases []*Rel
	// Values are the context's result columns (a sub-context's X and
	// having), expressions over ValueRefs.
	Values []*Input
}

// Rel is a relation joined to its context's rows: a scan of one table, or
// the aggregate of a per-grain sub-context. Its cells are keyed by Keys (a
// subset of the context's keys, as indexes) and a grouping id; GidOf maps
// each of the context's grouping masks to the Rel's own grouping id.
type Rel struct {
	Name   string
	Keys   []int
	Sets   []uint64
	GidOf  map[uint64]uint64
	Scan   *Scan
	Per    *PerRel
	Window *WindowRel
	Shift  *ShiftRel
	// Feeds is set on a scan whose cells only a shift reads: it is not
	// joined to the context's rows.
	Feeds bool
}

// ShiftRel computes `D back N UNIT` over another relation's cells: each
// cell of Source moves to the cell whose time key (the context's key
// Key, a grain of D itself) is its own moved forward N Units, and the
// cells that land on one key combine (Parts: sum, min, max). Its keys and
// grouping sets are Source's.
type ShiftRel struct {
	Source *Rel
	Key    int
	N      int
	Unit   string
	Parts  []*WindowPart
}

// WindowRel computes edited aggregates that decompose (sum, count, min,
// max) as windows over another relation's cells: the value of a cell whose
// edit removes some keys is the aggregate of the finer cells of the same
// grouping set that share the remaining keys. Its cells are the base's.
type WindowRel struct {
	Base *Rel
	// Partition lists the context keys the window keeps (by index).
	Partition []int
	Parts     []*WindowPart
	// Time is set for a window time edit (running, to date) planned over
	// the base's cells: see TimeWindow.
	Time *TimeWindow
}

// TimeWindow makes a WindowRel a window time edit's: each cell combines
// the cells of its grouping set that share the kept keys (Partition), lie
// in its Unit period (to date) and come no later in the order of the time
// key Order, a month, quarter, ... of D itself (see timeCells). A cell
// whose E is NULL is NULL.
type TimeWindow struct {
	Kind model.EditKind
	Unit string
	// Order is the index of the context's time key.
	Order int
	E     model.Expr
}

// WindowPart is one window column: Func over the base's column Source.
type WindowPart struct {
	Name   string
	Func   string
	Source string
	T      model.Type
}

// Scan reads one iteration table (joined along links to what it needs),
// keeps the rows that pass the filters, and computes its leaves per cell.
type Scan struct {
	Name  string
	Table *model.Table
	Joins []*model.Link
	// Inner marks the joins that may drop a row whose link finds no
	// match, rendered as inner joins: a row filter rejects such rows
	// anyway (see innerJoins).
	Inner  map[*model.Link]bool
	Where  []model.Expr
	Keys   []Key
	Inputs []*Input
	Leaves []*Leaf
	// Range is set for the scan of a window edit (to date, running,
	// last): see TimeRange.
	Range *TimeRange
}

// TimeRange makes a scan a window edit's: its cells are its context's
// cells (every key, every grouping set), each aggregating the rows that
// match the cell's kept keys (the scan's Keys, matched where the cell
// groups by them) and whose date D lies in the cell's range: up to E, and
// from start_of_Unit(E) (to date) or after E - N Unit (last); or, for
// = latest and = earliest after another window edit, on E alone.
type TimeRange struct {
	Kind model.EditKind
	N    int
	Unit string
	// D is the date read on each row (the column, or the column moved by
	// the backs applied after the edit); E is the cell's latest D (or
	// earliest, for = earliest), a value (or the greatest, least of
	// values) of the context.
	D *Input
	E model.Expr
	// Match lists, for each of the scan's Keys, its index among the
	// context's keys.
	Match []int
	// Cells is the context whose cells (and E) the range belongs to when
	// it is not the scan's own: a per-grain sub-context under a window
	// edit, whose first keys are Cells' keys. Its cells are each cell of
	// Cells with the values of the scan's other keys (Match indexes past
	// Cells' keys) among the cell's rows in range.
	Cells *Context
	// Also lists the ranges of earlier window edits still in force (on
	// another date, see replaces in plan_time.go): a row is in the
	// cell's range when it lies in every one (their Match unused).
	Also []*TimeRange
}

// PerRel aggregates the values of a sub-context over its per-grain keys.
type PerRel struct {
	Sub    *Context
	Leaves []*PerLeaf
	// AfterCells marks the groups of a per-grain aggregate under a window
	// edit: the sub-context's range scans read the context's cells and
	// their E, so it is computed after them.
	AfterCells bool
	// start is the cell the sub-context's values are planned in, before
	// its filters.
	start cell
}

// PerLeaf is AGG(sub value) over the kept groups.
type PerLeaf struct {
	Name string
	Func string
	// Value is the sub-context value aggregated; nil for count(*).
	Value *Input
	// Having is the sub-context value that keeps a group, or nil. A
	// group with a NULL per-key is always skipped (NULL is not a group).
	Having  *Input
	PerKeys []Key
	T       model.Type
}

// Input is a named value computed row by row (in a scan) or cell by cell
// (in a context).
type Input struct {
	Name string
	Expr model.Expr
}

// Leaf is one aggregate computed by a scan in every cell.
type Leaf struct {
	Name     string
	Func     string
	Distinct bool
	// Arg is nil for count(*); Filter is nil when every row counts.
	Arg    *Input
	Filter *Input
	T      model.Type
}

// ValueRef reads a column of a relation in the current cell.
// ZeroIfMissing is set for counts, which are 0 in a cell the relation
// lacks.
type ValueRef struct {
	Pos           grammar.Pos
	Rel           *Rel
	Column        string
	T             model.Type
	ZeroIfMissing bool
}

// Type is the value's type.
func (e *ValueRef) Type() model.Type { return e.T }

// Position is where the value was written.
func (e *ValueRef) Position() grammar.Pos { return e.Pos }

// Output is one measure column of the result.
type Output struct {
	Name    string
	Measure *model.Measure
	Expr    model.Expr
}

// GroupingSets lists the grouping sets of a totals mode over n groups, the
// detail set first.
func GroupingSets(mode model.TotalsMode, n int) []uint64 {
	full := uint64(1)<<n - 1
	switch {
	case n == 0 || mode == model.TotalsNone:
		return []uint64{0}
	case mode == model.TotalsGrand:
		return []uint64{0, full}
	case mode == model.TotalsRollup:
		var out []uint64
		for j := 0; j <= n; j++ {
			out = append(out, uint64(1)<<j-1)
		}
		return out
	}
	var out []uint64
	for s := uint64(0); s <= full; s++ {
		out = append(out, s)
	}
	sort.SliceStable(out, func(i, j int) bool { return bits.OnesCount64(out[i]) < bits.OnesCount64(out[j]) })
	return out
}

// bit is the mask bit of key i among n keys.
func bit(i, n int) uint64 { return 1 << (n - 1 - i) }

// compact maps a mask over n keys to a mask over the keys listed in keep.
func compact(mask uint64, n int, keep []int) uint64 {
	var out uint64
	for j, i := range keep {
		if mask&bit(i, n) != 0 {
			out |= bit(j, len(keep))
		}
	}
	return out
}

// cell is what a measure expression is evaluated in: the context's keys
// that still group it, and its filters. A filter with rows set belongs to
// the context's row set (a conjunct of the request's filter, or any
// filter of a per-grain cell); the others (narrowings, pins) narrow
// single aggregates.
type cell struct {
	removed uint64
	filters []cellFilter
	// moved maps a key (by index) that `back` moves to its row expression.
	moved map[int]model.Expr
	// window is set by a window edit (to date, running, last).
	window *windowEdit
}

// windowEdit is a window edit in force in a cell: the edit (to date,
// running, last; or = latest, = earliest after another window edit) and
// the cell's E, as a value of the context.
type windowEdit struct {
	ed *model.CellEdit
	e  model.Expr
	// at is the date each row is matched on: D, or D moved forward by
	// the backs applied after the edit.
	at model.Expr
	// order is the index of the time key whose cells the edit may be
	// computed over (see cellOrder), or -1.
	order int
	// cells is the context whose cells carry E: the one the edit is in,
	// or, in a per-grain sub-context under the edit, the outer one (whose
	// keys the sub-context's first keys are; see windowBases).
	cells *Context
	// prior is a range of an earlier window edit still in force: on a
	// date this edit does not bind (see replaces), so both hold.
	prior *windowEdit
}

type cellFilter struct {
	e    model.Expr
	rows bool
}

func (c cell) with(f cellFilter) cell {
	return cell{removed: c.removed, filters: append(append([]cellFilter{}, c.filters...), f), moved: c.moved, window: c.window}
}

// mentions reports whether e reads column c directly.
func mentions(e model.Expr, c func(*model.Column) bool) bool {
	found := false
	model.Walk(e, func(x model.Expr) bool {
		if r, ok := x.(*model.ColRef); ok && c(r.Col) {
			found = true
		}
		return !found
	})
	return found
}

// edit applies one cell edit.
func (c cell) edit(ctx *Context, ed *model.CellEdit) cell {
	hit := func(col *model.Column) bool {
		switch {
		case ed.Col != nil:
			return col == ed.Col
		case ed.Table != nil:
			return col.Table == ed.Table
		}
		return true
	}
	out := cell{removed: c.removed, moved: c.moved, window: c.window}
	if ed.Kind != model.EditUngroup {
		// A window's date range is a constraint on D: an edit that
		// removes what mentions D (drop, drop D, drop D's table, a pin on
		// D) removes it too, as it does in the reference evaluator.
		out.window = c.window.keep(func(w *windowEdit) bool { return !hit(w.ed.Col) })
	}
	n := len(ctx.Keys)
	for i, k := range ctx.Keys {
		if hit(k.Col) && !(k.Pin && ed.Kind == model.EditUngroup) {
			out.removed |= bit(i, n)
		}
	}
	for _, f := range c.filters {
		if ed.Kind == model.EditUngroup || !mentions(f.e, hit) {
			out.filters = append(out.filters, f)
		}
	}
	if ed.Kind == model.EditPin {
		ref := &model.ColRef{Pos: ed.Pos, Col: ed.Col}
		var pred model.Expr
		if len(ed.Values) == 1 {
			pred = &model.BinOp{Pos: ed.Pos, Op: "=", L: ref, R: ed.Values[0], T: model.TypeBoolean}
		} else {
			in := &model.InExpr{Pos: ed.Pos, X: ref}
			for _, v := range ed.Values {
				in.List = append(in.List, v)
			}
			pred = in
		}
		out.filters = append(out.filters, cellFilter{e: pred})
	}
	return out
}

// text is Text(e), remembered: the plan's keys print the same
// expressions over and over (an expression never changes once built).
func (pl *planner) text(e model.Expr) string {
	if t, ok := pl.texts[e]; ok {
		return t
	}
	t := model.Text(e)
	pl.texts[e] = t
	return t
}

func (pl *planner) filterKey(fs []cellFilter, rows bool) string {
	var t []string
	for _, f := range fs {
		if f.rows == rows {
			t = append(t, pl.text(f.e))
		}
	}
	sort.Strings(t)
	return strings.Join(t, " and ")
}

func conj(fs []cellFilter, rows bool) model.Expr {
	var out model.Expr
	for _, f := range fs {
		if f.rows != rows {
			continue
		}
		if out == nil {
			out = f.e
		} else {
			out = &model.BinOp{Pos: f.e.Position(), Op: "and", L: out, R: f.e, T: model.TypeBoolean}
		}
	}
	return out
}

func rowFilters(fs []cellFilter) []model.Expr {
	var out []model.Expr
	for _, f := range fs {
		if f.rows {
			out = append(out, f.e)
		}
	}
	return out
}
