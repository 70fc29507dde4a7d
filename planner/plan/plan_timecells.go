package plan

import (
	"fmt"
	"slices"

	"github.com/rollwise/rollwise/planner/model"
)

// Window time edits over the report's cells. A running total or a period
// to date in a context grouped by a month (quarter, year, day) of D itself
// is, where exact, a window over the base scan's cells instead of a
// second read of the facts with a range join (docs/benchmarks.md, "Time
// edits"). Let X be a cell and tk its time key, date_trunc(G, D) or D:
//
//   - E (the latest D of X's rows) lies in X's period tk, and every row of
//     that period passes X's constraints (they are not time-bound, or
//     determined by the period: the conditions below), so the rows with
//     D <= E are the rows of the periods up to tk, as tk grows with D;
//   - to date UNIT starts at start_of_UNIT(E), which is the start of a
//     period of tk when UNIT is G or coarser: the range is the periods of
//     the same UNIT up to tk;
//   - those periods' rows, with X's kept keys, are exactly the cells of
//     X's grouping set that share X's kept keys (every row is in one cell
//     of each set), provided the base read them: the time-bound filters
//     the edit replaces keep or drop whole UNIT periods (to date) or there
//     are none (running).
//
// So the value is the window aggregate (sum of sums and counts, min of
// mins, max of maxes) over those cells, NULL where E is NULL.

// within lists, for each grain of a time key ("" is D itself), the units
// whose periods are unions of the grain's periods.
var within = map[string][]string{
	"":        {"day", "week", "month", "quarter", "year"},
	"day":     {"day", "week", "month", "quarter", "year"},
	"week":    {"week"},
	"month":   {"month", "quarter", "year"},
	"quarter": {"quarter", "year"},
	"year":    {"year"},
}

// keyGrain is G when col is date_trunc(G, d) (a derived column of d's
// table) and "" when col is d; ok is false otherwise.
func keyGrain(d, col *model.Column) (string, bool) {
	if col == d {
		return "", true
	}
	if col.Table != d.Table || col.Derived == nil {
		return "", false
	}
	if f, ok := col.Derived.(*model.Func); ok && f.Name == "date_trunc" && isCol(f.Args[0], d) {
		return f.Unit, true
	}
	return "", false
}

func isCol(e model.Expr, c *model.Column) bool {
	r, ok := e.(*model.ColRef)
	return ok && r.Col == c
}

// determinedBy reports whether e reads d only through values fixed within
// each period of grain g: date_trunc or extract of d by a unit within g,
// d itself where g is "" (or a day of a date), derived columns of those.
func determinedBy(e model.Expr, d *model.Column, g string) bool {
	return fixedWithin(e, d, g, func(x model.Expr) bool { return isCol(x, d) })
}

// fixedWithin is determinedBy with isD telling what stands for d: d, or
// d moved forward (the moved filters of `back`, see shiftable).
func fixedWithin(e model.Expr, d *model.Column, g string, isD func(model.Expr) bool) bool {
	ok := true
	model.Walk(e, func(x model.Expr) bool {
		if isD(x) {
			ok = ok && (g == "" || g == "day" && d.Type == model.TypeDate)
			return false
		}
		switch x := x.(type) {
		case *model.Func:
			if (x.Name == "date_trunc" || x.Name == "extract") && len(x.Args) == 1 && isD(x.Args[0]) {
				ok = ok && slices.Contains(within[g], x.Unit)
				return false
			}
		case *model.ColRef:
			if x.Col.Table == d.Table && x.Col.Derived != nil {
				ok = ok && fixedWithin(x.Col.Derived, d, g, isD)
			} else {
				ok = false
			}
		}
		return ok
	})
	return ok
}

// cellOrder is the index of the time key of ctx over whose cells the
// window edit ed, the last edit applied in cell c, may be computed, or
// -1: the one key time-bound to D, a grain of D itself grouped in every
// grouping set and kept by c; to date's unit within its grain; c's
// time-bound filters (which E reads) fixed within each period of the key.
func cellOrder(ctx *Context, c cell, ed *model.CellEdit) int {
	if ed.Kind != model.EditRunning && ed.Kind != model.EditToDate || len(c.moved) > 0 {
		return -1
	}
	d, n, order := ed.Col, len(ctx.Keys), -1
	for i, k := range ctx.Keys {
		if timeBound(d, k.Col) {
			if order >= 0 {
				return -1
			}
			order = i
		}
	}
	if order < 0 || c.removed&bit(order, n) != 0 {
		return -1
	}
	for _, s := range ctx.Sets {
		if s&bit(order, n) != 0 {
			return -1
		}
	}
	g, ok := keyGrain(d, ctx.Keys[order].Col)
	if !ok || ed.Kind == model.EditToDate && !slices.Contains(within[g], ed.Unit) {
		return -1
	}
	for _, f := range c.filters {
		if allBound(f.e, d) && !determinedBy(f.e, d, g) {
			return -1
		}
	}
	return order
}

// timeCells turns the range scans of window edits into windows over the
// base scan's cells where cellOrder found them exact and the scan reads
// what the base reads: the same table, the base's row filters but the
// time-bound ones the edit replaces, and those keep or drop whole periods
// of to date's unit (a running total has none: the base lacks the rows
// they drop); aggregates that decompose; not a scan whose cells give a
// later window edit its E (the range scan reads them).
func (pl *planner) timeCells(ctx *Context) {
	for _, r := range ctx.Rels {
		if r.Per != nil {
			pl.timeCells(r.Per.Sub)
		}
	}
	if len(ctx.Bases) != 1 || ctx.Bases[0].Scan.Range != nil {
		// (a range scan's cells overlap: see useWindows)
		return
	}
	base := ctx.Bases[0]
	for _, r := range ctx.Rels {
		s := r.Scan
		if s == nil || s.Range == nil || pl.cellOrders[r] < 0 || pl.timeEnds[r] || s.Table != base.Scan.Table {
			continue
		}
		d := s.Range.D.Expr.(*model.ColRef).Col
		var kept []model.Expr
		whole := true
		for _, w := range base.Scan.Where {
			if !allBound(w, d) {
				kept = append(kept, w)
			} else if s.Range.Kind == model.EditRunning || !determinedBy(w, d, s.Range.Unit) {
				whole = false
			}
		}
		if !whole || pl.whereKey(kept) != pl.whereKey(s.Where) || slices.ContainsFunc(s.Leaves, func(l *Leaf) bool { return windowFunc(l) == "" }) {
			continue
		}
		pl.windowOver(r, &WindowRel{Base: base, Partition: s.Range.Match,
			Time: &TimeWindow{Kind: s.Range.Kind, Unit: s.Range.Unit, Order: pl.cellOrders[r], E: s.Range.E}})
	}
}

// Shifts over the report's cells. `D back N UNIT` groups the rows by the
// time key computed on D moved forward; where the key is a grain G of D
// itself (date_trunc(G, D), or D) and moving commutes with truncating
// (trunc_G(D + N UNIT) = trunc_G(D) + N UNIT: days and weeks on a day,
// whole weeks on a week, months on a month, whole quarters on a quarter,
// whole years on a year), the moved rows of a cell are the rows of the
// cells whose key, moved forward, is its key: the plan groups the rows
// once, by the unmoved key, and moves the cells.

// lifts reports whether moving by n units commutes with truncating to
// grain g (see above).
func lifts(g, unit string, n int) bool {
	months := map[string]int{"month": 1, "quarter": 3, "year": 12}
	switch g {
	case "":
		return true
	case "day":
		return true
	case "week":
		return unit == "week" || unit == "day" && n%7 == 0
	}
	step, ok := months[unit]
	return ok && months[g] > 0 && n*step%months[g] == 0
}

// movedBy reads a moved key's row expression: date_move(D, N) or
// date_trunc(G, date_move(D, N)) for the key's grain G.
func movedBy(e model.Expr, d *model.Column, g string) (n int, unit string, ok bool) {
	if f, isF := e.(*model.Func); isF && g != "" && f.Name == "date_trunc" && f.Unit == g {
		e = f.Args[0]
	}
	f, isF := e.(*model.Func)
	if !isF || f.Name != movedFunc || !isCol(f.Args[0], d) {
		return 0, "", false
	}
	lit, isLit := f.Args[1].(*model.Lit)
	if !isLit {
		return 0, "", false
	}
	if _, err := fmt.Sscan(lit.Text, &n); err != nil {
		return 0, "", false
	}
	return n, f.Unit, true
}

// shiftCells turns the scans of `back` into shifts of cells where exact:
// the scan moves one key, a grain of D that lifts the move; its other
// keys and row filters are a scan's of the same table (the source, the
// base itself when they are the base's), but its moved filters; those
// are fixed within each period of the key and the key is grouped in
// every grouping set (so a cell that exists passes them, and so do the
// rows moved into it); its aggregates decompose and their filters are
// not moved. Only the query's own context is shifted: inside a
// per-grain group's context the unmoved source could be the moved scan
// itself (found by TestDifferentialLive: `(m1)[sales.day back 1 year;
// sales.qty = 1]` under a per-grain having rendered a CTE reading
// itself; regression case back_in_per_grain), so there the moved scan
// stays.
func (pl *planner) shiftCells(ctx *Context) {
	if len(ctx.Bases) != 1 {
		return
	}
	base := ctx.Bases[0]
	for _, r := range slices.Clone(ctx.Rels) {
		s := r.Scan
		if s == nil || s.Range != nil || s.Table != base.Scan.Table {
			continue
		}
		key, n, unit, d := -1, 0, "", (*model.Column)(nil)
		for j, k := range s.Keys {
			if k.Expr == nil {
				continue
			}
			i := r.Keys[j]
			for _, c := range model.Columns(k.Expr) {
				d = c
			}
			g, ok := keyGrain(d, ctx.Keys[i].Col)
			m, u, moved := movedBy(k.Expr, d, g)
			if key >= 0 || !ok || !moved || !lifts(g, u, m) {
				key = -2
				break
			}
			key, n, unit = i, m, u
		}
		if key < 0 || !pl.shiftable(ctx, r, key, d) {
			continue
		}
		var kept []model.Expr
		for _, w := range s.Where {
			if !movesDate(w) {
				kept = append(kept, w)
			}
		}
		var removed uint64
		for i := range ctx.Keys {
			if !slices.Contains(r.Keys, i) {
				removed |= bit(i, len(ctx.Keys))
			}
		}
		_, shared := pl.rels[pl.scanKey(ctx, s.Table, removed, kept)]
		src := pl.scanRel(ctx, s.Table, removed, kept, nil, r.Name+"_unmoved")
		src.Feeds = src.Feeds || !shared
		shift := &ShiftRel{Source: src, Key: key, N: n, Unit: unit}
		for _, l := range s.Leaves {
			sl := pl.baseLeaf(src.Scan, s, l)
			shift.Parts = append(shift.Parts, &WindowPart{Name: l.Name, Func: windowFunc(l), Source: sl.Name, T: l.T})
		}
		r.Scan, r.Shift = nil, shift
		pl.p.Scans = slices.DeleteFunc(pl.p.Scans, func(x *Scan) bool { return x == s })
	}
}

// shiftable checks the rest of shiftCells' conditions for r, a scan that
// moves the context's key by a lifting move of D.
func (pl *planner) shiftable(ctx *Context, r *Rel, key int, d *model.Column) bool {
	s := r.Scan
	g, _ := keyGrain(d, ctx.Keys[key].Col)
	for _, l := range s.Leaves {
		if windowFunc(l) == "" || l.Filter != nil && movesDate(l.Filter.Expr) || l.Arg != nil && movesDate(l.Arg.Expr) {
			return false
		}
	}
	n := len(ctx.Keys)
	for _, w := range s.Where {
		if !movesDate(w) {
			continue
		}
		movedD := func(x model.Expr) bool {
			f, ok := x.(*model.Func)
			return ok && f.Name == movedFunc && isCol(f.Args[0], d)
		}
		if !fixedWithin(w, d, g, movedD) {
			return false
		}
		for _, set := range ctx.Sets {
			if set&bit(key, n) != 0 {
				return false
			}
		}
	}
	return true
}

// movesDate reports whether e reads a date moved forward.
func movesDate(e model.Expr) bool {
	found := false
	model.Walk(e, func(x model.Expr) bool {
		if f, ok := x.(*model.Func); ok && f.Name == movedFunc {
			found = true
		}
		return !found
	})
	return found
}
