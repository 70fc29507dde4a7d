package plan

import (
	"fmt"
	"github.com/rollwise/rollwise/planner/model"
	"slices"
	"sort"
	"strings"
)

// Time edits in plans (language.md, "Time"):
//
//   - `m[D = latest]` and `m[D = earliest]` are per-grain aggregates over D:
//     m in each group of D of the cell, the group with the latest
//     (earliest) D kept (PerLeaf.Func "latest" or "earliest").
//   - `m[D back N UNIT]` moves the cell's time-bound constraints: a
//     time-bound key groups the rows by its expression over D moved
//     forward N units (Key.Expr), a time-bound filter reads D moved
//     forward, a stored column of D's calendar is read from a copy of the
//     calendar joined on the moved D (Plan.Moves). Nothing else changes,
//     so the scans are the usual ones (or shifts of cells, see
//     plan_timecells.go).
//   - the window edits (to date, running, last) read the rows again for
//     every cell: a scan whose cells are the context's, each aggregating
//     the rows whose D lies in the range its E sets (TimeRange).

// movedFunc is the row function that moves a date forward: Args are the
// date and an integer literal (the count); Unit is the unit.
const movedFunc = "date_move"

// timeBound reports whether a constraint on col is time-bound to the date
// column d: col is d, a derived column of d's table computed from d alone,
// or a column of d's calendar (d's own table when d is its key, or the
// table d's link reaches).
func timeBound(d, col *model.Column) bool {
	if col == d || (calendarOf(d) != nil && col.Table == calendarOf(d)) {
		return true
	}
	if col.Table != d.Table || col.Derived == nil {
		return false
	}
	only := false
	for _, c := range model.Columns(col.Derived) {
		if c.Stored() {
			if c != d {
				return false
			}
			only = true
		}
	}
	return only
}

// calendarOf is the calendar table of the date column d, or nil.
func calendarOf(d *model.Column) *model.Table {
	for _, l := range d.Table.Links {
		if len(l.FromCols) == 1 && l.FromCols[0] == d {
			return l.To
		}
	}
	if len(d.Table.Key) == 1 && d.Table.Key[0] == d {
		return d.Table
	}
	return nil
}

// allBound reports whether e reads columns and every one is time-bound to d.
func allBound(e model.Expr, d *model.Column) bool {
	n := 0
	ok := !mentions(e, func(c *model.Column) bool { n++; return !timeBound(d, c) })
	return ok && n > 0
}

// moveTime substitutes, in a row expression over time-bound columns, d
// moved forward by ed's count and unit for d (derived columns computed
// from d alone are read through); a stored column of d's calendar reads
// the calendar's row of the moved date (see movedColumn), and a derived
// one is its formula over that row, NULL where the moved date finds none.
func (pl *planner) moveTime(e model.Expr, ed *model.CellEdit) model.Expr {
	return substitute(e, func(r *model.ColRef) model.Expr {
		switch {
		case r.Col == ed.Col:
			return &model.Func{Pos: ed.Pos, Name: movedFunc, Unit: ed.Unit, T: r.Col.Type,
				Args: []model.Expr{r, &model.Lit{Pos: ed.Pos, T: model.TypeInteger, Text: fmt.Sprint(ed.N)}}}
		case !timeBound(ed.Col, r.Col):
			return r
		case r.Col.Derived == nil:
			return &model.ColRef{Pos: r.Pos, Col: pl.movedColumn(r.Col, ed)}
		}
		x := pl.moveTime(r.Col.Derived, ed)
		if r.Col.Table == ed.Col.Table && allBound(r.Col.Derived, ed.Col) && !mentions(r.Col.Derived, func(c *model.Column) bool { return c != ed.Col && c.Derived == nil }) {
			return x
		}
		key := pl.movedColumn(calendarKey(ed.Col), ed)
		return &model.CaseExpr{Pos: r.Pos, T: r.Col.Type, Whens: []model.WhenArm{{
			Cond: &model.IsNullExpr{Pos: r.Pos, X: &model.ColRef{Pos: r.Pos, Col: key}, Not: true}, Then: x}}}
	})
}

// calendarKey is the key column of d's calendar: d itself when d is its
// table's key, else the column d's link reaches.
func calendarKey(d *model.Column) *model.Column {
	for _, l := range d.Table.Links {
		if len(l.FromCols) == 1 && l.FromCols[0] == d {
			return l.ToCols[0]
		}
	}
	return d
}

// movedColumn is col, a stored column of d's calendar (d = ed.Col), read
// on the calendar's row of d moved forward by ed: the column of a copy of
// the calendar joined on its key = d moved (Plan.Moves), one copy per
// calendar, moved date and move. A second date moved alike (another fact
// table's link to the same calendar) gets a copy of its own, named after
// its table: sharing the first one's joined it on the first date only
// (the engine could not find the copy from the other table).
func (pl *planner) movedColumn(col *model.Column, ed *model.CellEdit) *model.Column {
	cal := col.Table
	name := fmt.Sprintf("%s moved %d %s", cal.Name, ed.N, ed.Unit)
	m := pl.movedTables[name]
	for m != nil && !pl.movesFrom(m, ed.Col) {
		name += " for " + ed.Col.Table.Name
		m = pl.movedTables[name]
	}
	if m == nil {
		m = &model.Table{Name: name, Relation: cal.Relation, File: cal.File, NullTexts: cal.NullTexts, Pos: cal.Pos}
		for _, c := range cal.Columns {
			if c.Derived == nil {
				copied := *c
				copied.Table = m
				m.Columns = append(m.Columns, &copied)
			}
		}
		pl.movedTables[name] = m
		l := &model.Link{From: ed.Col.Table, FromCols: []*model.Column{ed.Col}, To: m,
			ToCols: []*model.Column{movedCopy(m, calendarKey(ed.Col))}, Pos: ed.Pos}
		pl.p.Moves[l] = Move{N: ed.N, Unit: ed.Unit}
	}
	return movedCopy(m, col)
}

// movesFrom reports whether m, a calendar's copy, is joined on date d.
func (pl *planner) movesFrom(m *model.Table, d *model.Column) bool {
	for l := range pl.p.Moves {
		if l.To == m {
			return l.FromCols[0] == d
		}
	}
	return false
}

// movedCopy is the copy in m of the calendar's column c.
func movedCopy(m *model.Table, c *model.Column) *model.Column {
	for _, x := range m.Columns {
		if x.Name == c.Name {
			return x
		}
	}
	return nil
}

// substitute copies a row expression with every column reference replaced
// by what f returns for it.
func substitute(e model.Expr, f func(*model.ColRef) model.Expr) model.Expr {
	sub := func(x model.Expr) model.Expr { return substitute(x, f) }
	switch e := e.(type) {
	case *model.ColRef:
		return f(e)
	case *model.BinOp:
		return &model.BinOp{Pos: e.Pos, Op: e.Op, L: sub(e.L), R: sub(e.R), T: e.T}
	case *model.UnOp:
		return &model.UnOp{Pos: e.Pos, Op: e.Op, X: sub(e.X)}
	case *model.Func:
		out := *e
		out.Args = nil
		for _, a := range e.Args {
			out.Args = append(out.Args, sub(a))
		}
		return &out
	case *model.CaseExpr:
		out := &model.CaseExpr{Pos: e.Pos, T: e.T}
		for _, w := range e.Whens {
			out.Whens = append(out.Whens, model.WhenArm{Cond: sub(w.Cond), Then: sub(w.Then)})
		}
		if e.Else != nil {
			out.Else = sub(e.Else)
		}
		return out
	case *model.InExpr:
		out := &model.InExpr{Pos: e.Pos, X: sub(e.X), Not: e.Not}
		for _, a := range e.List {
			out.List = append(out.List, sub(a))
		}
		return out
	case *model.IsNullExpr:
		return &model.IsNullExpr{Pos: e.Pos, X: sub(e.X), Not: e.Not}
	}
	return e
}

// twoAxes refuses `D back N UNIT` inside or after a back on another date
// of the same calendar (a fact's date and the calendar's key it links to,
// or two facts' dates): a constraint moved along one would have to move
// along the other, which the language does not define (the reference
// evaluator refuses it too: "a constraint moved along ... cannot move
// along ... too"). Backs on the same date add up.
func (pl *planner) twoAxes(ed *model.CellEdit) bool {
	for _, d := range pl.backs {
		if d != ed.Col && calendarKey(d) == calendarKey(ed.Col) {
			pl.diags.Errorf(ed.Pos, "not-supported", "%s back after a back on %s moves one date along two columns, which has no defined meaning", ed.Col, d).Suggestion =
				fmt.Sprintf("move both along the same column: write %s back ... for both (or %s for both)", d, ed.Col)
			return true
		}
	}
	return false
}

// back applies `D back N UNIT` to the cell: its time-bound keys and
// filters, and the range of a window edit in force, read D moved forward
// N units.
func (pl *planner) back(ctx *Context, c cell, ed *model.CellEdit) (cell, bool) {
	out := cell{removed: c.removed, moved: map[int]model.Expr{}, window: c.window}
	for i, e := range c.moved {
		out.moved[i] = e
	}
	// a window's range time-bound to D reads D moved too; its scan reads
	// moved rows, never the base's cells
	out.window = c.window.each(func(w windowEdit) windowEdit {
		if timeBound(ed.Col, w.ed.Col) {
			w.at = pl.moveTime(w.at, ed)
		}
		w.order = -1
		return w
	})
	n := len(ctx.Keys)
	for i, k := range ctx.Keys {
		if c.removed&bit(i, n) != 0 || !timeBound(ed.Col, k.Col) {
			continue
		}
		from := k.RowExpr()
		if e, ok := c.moved[i]; ok {
			from = e
		}
		out.moved[i] = pl.moveTime(from, ed)
	}
	for _, f := range c.filters {
		if allBound(f.e, ed.Col) {
			f = cellFilter{e: pl.moveTime(f.e, ed), rows: f.rows}
		}
		out.filters = append(out.filters, f)
	}
	return out, true
}

// movedKey is a text for the moved keys of a cell, for finding shared
// relations.
func (pl *planner) movedKey(moved map[int]model.Expr) string {
	var t []string
	for i, e := range moved {
		t = append(t, fmt.Sprintf("%d:%s", i, pl.text(e)))
	}
	sort.Strings(t)
	return strings.Join(t, ",")
}

// movedKeys copies ctx's keys kept in a cell, each moved key with its
// expression.
func movedKeys(ctx *Context, keep []int, moved map[int]model.Expr) []Key {
	var out []Key
	for _, i := range keep {
		k := ctx.Keys[i]
		if e, ok := moved[i]; ok {
			k.Expr = e
		}
		out = append(out, k)
	}
	return out
}

// timeEdit compiles X edited by edits[i], a time edit, and the edits after
// it, in cell c. `D = latest` (`= earliest`) is the per-grain aggregate
// latest(X' per D), X' being X under the edits after it: its groups are
// the cell's rows (every filter of c applies, so E is the latest D among
// them), its key of D stands for the pin D = E (Key.Pin: a later ungroup
// keeps it, a later time edit moves or replaces it as the time-bound
// constraint it is), and X' is evaluated without the filters that the pin
// removes (pinStart).
func (pl *planner) timeEdit(ctx *Context, e *model.EditExpr, i int, c cell) (model.Expr, bool) {
	ed := e.Edits[i]
	if c.window != nil {
		// after a window edit: a pin within its range (see windowEdit)
		return pl.windowEdit(ctx, e, i, c)
	}
	switch ed.Kind {
	case model.EditLatest, model.EditEarliest:
		x := e.X
		if rest := e.Edits[i+1:]; len(rest) > 0 {
			x = &model.EditExpr{Pos: e.Pos, X: e.X, Edits: rest}
		}
		fn := "latest"
		if ed.Kind == model.EditEarliest {
			fn = "earliest"
		}
		pa := &model.PerAgg{Pos: ed.Pos, Func: fn, X: x, Per: []*model.Column{ed.Col}, T: e.X.Type()}
		return pl.per(ctx, pa, c, pl.owner.Name+"_"+fn), true
	}
	return pl.windowEdit(ctx, e, i, c)
}

// pinned reports whether pa is the per-grain aggregate of `D = latest`
// or `D = earliest` (see timeEdit): its per key is a pin.
func pinned(pa *model.PerAgg) bool {
	return pa.Func == "latest" || pa.Func == "earliest"
}

// pinStart is the cell in which a per-grain aggregate's X is compiled in
// its sub-context: base (under a window edit, the range: windowBases) with
// the sub-context's filters (those of the outer cell).
// Under a pin (pinned), the filters that read D together with another
// column are left out: the pin D = E removes every constraint that
// mentions D, and where one on D alone changes nothing (E meets it), one
// that also reads another column would keep other rows of E out
// ((returns.id = 2 or returns.day is null), found by TestDifferentialLive,
// regression case latest_under_mixed_filter). The groups, and so E, are
// still formed under every filter (the sub-context's bases).
func pinStart(pa *model.PerAgg, sub *Context, base cell) cell {
	start := base
	for _, f := range sub.Filters {
		d := pa.Per[0]
		if pinned(pa) && mentions(f, func(x *model.Column) bool { return x == d }) &&
			mentions(f, func(x *model.Column) bool { return x != d }) {
			continue
		}
		start.filters = append(start.filters, cellFilter{e: f, rows: true})
	}
	return start
}

// windowEdit compiles X under a window edit (to date, running, last) and
// the edits after it: the cell's E is the latest D among its rows of X's
// iteration tables; the edited cell drops the time-bound keys and filters,
// and its aggregates read the rows whose D lies in the range E sets
// (see TimeRange). The range is itself time-bound: a later window edit
// replaces it (its E the latest D of the range's rows), a later back
// moves the date it reads (see back), and `= latest` (`= earliest`)
// after it pins D to the latest (earliest) D of the range's rows, planned
// here as a range of that one day.
func (pl *planner) windowEdit(ctx *Context, e *model.EditExpr, i int, c cell) (model.Expr, bool) {
	ed := e.Edits[i]
	refuse := func(what string) (model.Expr, bool) {
		pl.diags.Errorf(ed.Pos, "not-supported", "%s %s %s is not planned into SQL yet", ed.Col, ed.TimeText(), what).Suggestion =
			"edit a measure that aggregates a table's column, such as sum(t.c)"
		return nil, false
	}
	pin := ed.Kind == model.EditLatest || ed.Kind == model.EditEarliest
	// E over several iteration tables is the latest of each one's latest
	// D (greatest skips NULLs); F the earliest of the earliest.
	fn, most := "max", "greatest"
	if ed.Kind == model.EditEarliest {
		fn, most = "min", "least"
	}
	var ends []model.Expr
	for _, t := range pl.iterationTables(e.X) {
		end := &model.Agg{Pos: ed.Pos, Func: fn, Arg: &model.ColRef{Pos: ed.Pos, Col: ed.Col}, Table: t, T: ed.Col.Type}
		ev, ok := pl.leaf(ctx, end, c).(*ValueRef)
		if !ok {
			return nil, false
		}
		pl.timeEnds[ev.Rel] = true
		ends = append(ends, ev)
	}
	var ev model.Expr
	switch len(ends) {
	case 0:
		return refuse("over a measure that reads no table")
	case 1:
		ev = ends[0]
	default:
		ev = &model.Func{Pos: ed.Pos, Name: most, Args: ends, T: ed.Col.Type}
	}
	rest := e.Edits[i+1:]
	out := cell{removed: c.removed, moved: map[int]model.Expr{},
		window: &windowEdit{ed: ed, e: ev, at: &model.ColRef{Pos: ed.Pos, Col: ed.Col}, order: -1, cells: ctx,
			prior: c.window.keep(func(w *windowEdit) bool { return !replaces(ed, w.ed.Col) })}}
	if len(rest) == 0 && c.window == nil {
		out.window.order = cellOrder(ctx, c, ed)
	}
	// A range replaces the time-bound keys and filters; a pin (after
	// another window) those that mention D.
	drop := func(col *model.Column) bool { return timeBound(ed.Col, pl.original(col)) }
	if pin {
		drop = func(col *model.Column) bool { return pl.original(col) == ed.Col }
	}
	n := len(ctx.Keys)
	for k, key := range ctx.Keys {
		if drop(key.Col) {
			out.removed |= bit(k, n)
		} else if m, ok := c.moved[k]; ok {
			out.moved[k] = m
		}
	}
	for _, f := range c.filters {
		some := mentions(f.e, drop)
		all := some && !mentions(f.e, func(col *model.Column) bool { return !drop(col) })
		if pin && !some || !pin && !all {
			out.filters = append(out.filters, f)
		}
	}
	x := e.X
	if slices.ContainsFunc(rest, func(r *model.CellEdit) bool { return r.Kind.Time() }) {
		// the later time edits apply in the range's cell
		x = &model.EditExpr{Pos: e.Pos, X: e.X, Edits: rest}
	} else {
		for _, r := range rest {
			out = out.edit(ctx, r)
		}
	}
	cx := pl.compile(ctx, x, out)
	if cx == nil {
		return nil, false
	}
	if out.window != nil && nullOverNoRows(x, map[*model.Measure]bool{}) {
		return cx, true
	}
	// A cell without E (no row of X's table, or no date) has NULL, even
	// where X itself is not NULL over no rows (a count, a coalesce), or
	// where a later edit removed the range and X reads other rows:
	// language.md, Time.
	return &model.CaseExpr{Pos: ed.Pos, Whens: []model.WhenArm{{Cond: &model.IsNullExpr{Pos: ed.Pos, X: ev, Not: true}, Then: cx}}, T: e.X.Type()}, true
}

// keep copies the chain of ranges w (w and its priors) with only those
// keep reports.
func (w *windowEdit) keep(keep func(*windowEdit) bool) *windowEdit {
	if w == nil {
		return nil
	}
	prior := w.prior.keep(keep)
	if !keep(w) {
		return prior
	}
	out := *w
	out.prior = prior
	return &out
}

// each copies the chain of ranges w, each range as f returns it.
func (w *windowEdit) each(f func(windowEdit) windowEdit) *windowEdit {
	if w == nil {
		return nil
	}
	out := f(*w)
	out.prior = w.prior.each(f)
	return &out
}

// replaces reports whether the time edit ed, applied in a cell with a
// range on the date column d, removes that range: a range on a column
// time-bound to ed's (a window edit replaces it), or, for a pin (= latest,
// = earliest), a range on D or on the column D's link reaches, or the
// other way round (each row's two dates are one, so the pinned day lies
// in the range).
func replaces(ed *model.CellEdit, d *model.Column) bool {
	if ed.Kind != model.EditLatest && ed.Kind != model.EditEarliest {
		return timeBound(ed.Col, d)
	}
	return d == ed.Col || calendarKey(d) == ed.Col || calendarKey(ed.Col) == d
}

// original is the column of a calendar that col stands for when col is a
// column of a copy `back` joins (movedColumn), else col itself: a window
// edit replaces a moved constraint as it replaces the constraint.
func (pl *planner) original(col *model.Column) *model.Column {
	if pl.movedTables[col.Table.Name] != col.Table {
		return col
	}
	for l := range pl.p.Moves {
		if l.To == col.Table {
			if cal := calendarOf(l.FromCols[0]); cal != nil {
				if o := cal.Column(col.Name); o != nil {
					return o
				}
			}
		}
	}
	return col
}

// nullOverNoRows reports whether e is NULL whenever its aggregates see no
// row: every aggregate is one that is NULL over no rows (not a count) and
// nothing between them turns a NULL into a value (coalesce, case, is
// null). Where it may not be, a window edit guards its value with E.
func nullOverNoRows(e model.Expr, seen map[*model.Measure]bool) bool {
	ok := true
	model.Walk(e, func(x model.Expr) bool {
		switch x := x.(type) {
		case *model.Agg:
			ok = ok && x.Func != "count"
			return false
		case *model.PerAgg, *model.CaseExpr, *model.IsNullExpr, *model.InExpr, *model.EditExpr:
			ok = false
		case *model.Func:
			ok = ok && x.Name != "coalesce" && x.Name != "nullif"
		case *model.BinOp:
			ok = ok && x.Op != "and" && x.Op != "or"
		case *model.MeasureRef:
			if !seen[x.Measure] {
				seen[x.Measure] = true
				ok = ok && nullOverNoRows(x.Measure.Expr, seen)
			}
		}
		return ok
	})
	return ok
}

// rangeRel finds or adds the relation of a window edit's scan of t in cell
// c: cells keyed like ctx's, rows matched on the keys c keeps. In a
// per-grain sub-context under the edit (c.window.cells is not ctx), the
// cells are those of the outer context, each with the values of ctx's own
// kept keys (the per columns) among its rows in range.
func (pl *planner) rangeRel(ctx *Context, t *model.Table, c cell, nameBase string) *Rel {
	w := c.window
	where := rowFilters(c.filters)
	key := "range|" + pl.scanKey(ctx, t, c.removed, where) + "|moved " + pl.movedKey(c.moved) + "|" + windowKey(c)
	if r, ok := pl.rels[key]; ok {
		if pl.cellOrders[r] != w.order {
			pl.cellOrders[r] = -1
		}
		return r
	}
	n, nc := len(ctx.Keys), len(w.cells.Keys)
	var keys, match []int
	for i := range ctx.Keys {
		kept := c.removed&bit(i, n) == 0
		if i < nc || kept {
			keys = append(keys, i)
		}
		if kept {
			match = append(match, i)
		}
	}
	gid := map[uint64]uint64{}
	var sets []uint64
	for _, s := range ctx.Sets {
		gid[s] = compact(s, n, keys)
		if !slices.Contains(sets, gid[s]) {
			sets = append(sets, gid[s])
		}
	}
	s := &Scan{Table: t, Where: where, Keys: movedKeys(ctx, match, c.moved)}
	r := &Rel{Name: pl.name(nameBase), Keys: keys, Sets: sets, GidOf: gid, Scan: s}
	s.Name = r.Name
	pl.inputs[s] = map[string]*Input{}
	s.Range = &TimeRange{Kind: w.ed.Kind, N: w.ed.N, Unit: w.ed.Unit, E: w.e, Match: match,
		D: pl.input(s, r.Name+"_at", w.at)}
	for p := w.prior; p != nil; p = p.prior {
		s.Range.Also = append(s.Range.Also, &TimeRange{Kind: p.ed.Kind, N: p.ed.N, Unit: p.ed.Unit, E: p.e,
			D: pl.input(s, r.Name+"_at", p.at)})
	}
	if w.cells != ctx {
		s.Range.Cells = w.cells
	}
	pl.rels[key] = r
	pl.cellOrders[r] = w.order
	ctx.Rels = append(ctx.Rels, r)
	pl.p.Scans = append(pl.p.Scans, s)
	return r
}

// endKey is a text for a window edit's E: the relation columns it reads.
func endKey(e model.Expr) string {
	var t []string
	model.Walk(e, func(x model.Expr) bool {
		if v, ok := x.(*ValueRef); ok {
			t = append(t, v.Rel.Name+"."+v.Column)
		}
		return true
	})
	return strings.Join(t, ",")
}
