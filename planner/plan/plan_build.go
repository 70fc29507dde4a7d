package plan

import (
	"fmt"
	"maps"
	"slices"
	"strings"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
)

type planner struct {
	q     *model.Query
	p     *Plan
	diags grammar.Diagnostics
	// owner is the innermost measure being compiled; narrowedBy and
	// editedBy name the measures whose narrowing or edit is in force (for
	// readable names).
	owner      *model.Measure
	narrowedBy string
	editedBy   string
	taken      map[string]bool
	// measureNames are the query's measures: output columns.
	measureNames map[string]bool
	rels         map[string]*Rel
	values       map[string]*ValueRef
	inputs       map[*Scan]map[string]*Input
	texts        map[model.Expr]string
	// distinct maps the per-grain counts planned for distinct counts to
	// the aggregates they stand for (see plan_distinct.go).
	distinct map[*PerLeaf]distinctOrigin
	// timeEnds are the relations that compute a window edit's E: they stay
	// scans (a window edit's relation reads them on their own).
	timeEnds map[*Rel]bool
	// cellOrders maps a window edit's range relation to the time key it
	// may be computed over as a window over the base's cells, or -1.
	cellOrders map[*Rel]int
	// movedTables are the copies of calendars `back` joins, by name.
	movedTables map[string]*model.Table
	// backs are the dates of the back edits in force in the expression
	// being compiled (see twoAxes).
	backs []*model.Column
	// computed holds each measure's value compiled in a cell of a context
	// (see measureValue); iterTables the iteration tables found per measure.
	computed   map[string]model.Expr
	iterTables map[*model.Measure][]*model.Table
}

// NewPlan plans a query: every measure is compiled into arithmetic over
// aggregates, each computed in the (possibly edited) cell of its measure
// by a scan of its iteration table, or by a per-grain sub-context.
func NewPlan(q *model.Query) (*Plan, grammar.Diagnostics) {
	pl := &planner{q: q, p: &Plan{Query: q, Moves: map[*model.Link]Move{}}, movedTables: map[string]*model.Table{}, taken: map[string]bool{}, rels: map[string]*Rel{},
		values: map[string]*ValueRef{}, inputs: map[*Scan]map[string]*Input{}, texts: map[model.Expr]string{},
		distinct: map[*PerLeaf]distinctOrigin{}, timeEnds: map[*Rel]bool{}, cellOrders: map[*Rel]int{},
		computed: map[string]model.Expr{}, iterTables: map[*model.Measure][]*model.Table{}}
	pl.measureNames = map[string]bool{}
	for _, m := range q.Measures {
		pl.measureNames[m.Name] = true
	}
	pl.p.Sets = GroupingSets(q.Totals, len(q.Groups))
	root := &Context{Sets: pl.p.Sets, Filters: q.Filters}
	for i, g := range q.Groups {
		root.Keys = append(root.Keys, Key{Name: q.GroupNames[i], Col: g, Pos: q.GroupPos[i]})
	}
	pl.p.Root = root
	start := cell{}
	for _, f := range q.Filters {
		start.filters = append(start.filters, cellFilter{e: f, rows: true})
	}
	for _, m := range q.Measures {
		pl.owner, pl.narrowedBy, pl.editedBy = m, "", ""
		for _, t := range pl.iterationTables(m.Expr) {
			pl.base(root, t)
		}
		if e := pl.compile(root, &model.MeasureRef{Pos: m.Pos, Measure: m}, start); e != nil {
			pl.p.Outputs = append(pl.p.Outputs, &Output{Name: m.Name, Measure: m, Expr: e})
		}
	}
	for _, k := range q.Order {
		key := SortKey{Desc: k.Desc}
		if k.Measure == nil {
			key.Group = q.GroupNames[k.Group]
		}
		for _, out := range pl.p.Outputs {
			if k.Measure != nil && out.Measure == k.Measure {
				key.Output = out
			}
		}
		if k.Measure == nil || key.Output != nil {
			pl.p.Order = append(pl.p.Order, key)
		}
	}
	if !pl.diags.HasErrors() {
		pl.useWindows(root)
		pl.timeCells(root)
		pl.shiftCells(root)
		pl.distinctLeaves(root)
		for _, s := range pl.p.Scans {
			pl.checkReach(s)
		}
		pl.hoistNarrowings(root)
		for _, s := range pl.p.Scans {
			pl.joins(s)
		}
		pl.cautions()
	}
	if pl.diags.HasErrors() {
		return nil, pl.diags
	}
	return pl.p, pl.diags
}

// name gives a unique, readable name based on base; a measure name of
// the query is only ever given to that measure's own values.
func (pl *planner) name(base string) string {
	for i := 1; ; i++ {
		cand := base
		if i > 1 {
			cand = fmt.Sprintf("%s_%d", base, i)
		}
		if pl.taken[cand] || (cand != base && pl.measureNames[cand]) {
			continue
		}
		pl.taken[cand] = true
		return cand
	}
}

// iterationTables lists the tables whose rows a measure's value iterates
// over: the tables of every aggregate inside it.
func (pl *planner) iterationTables(e model.Expr) []*model.Table {
	var out []*model.Table
	add := func(ts ...*model.Table) {
		for _, t := range ts {
			if t != nil && !slices.Contains(out, t) {
				out = append(out, t)
			}
		}
	}
	model.Walk(e, func(x model.Expr) bool {
		switch x := x.(type) {
		case *model.Agg:
			add(x.Table)
		case *model.MeasureRef:
			ts, ok := pl.iterTables[x.Measure]
			if !ok {
				ts = pl.iterationTables(x.Measure.Expr)
				pl.iterTables[x.Measure] = ts
			}
			add(ts...)
		case *model.PerAgg:
			add(pl.perTables(x)...)
			return false
		}
		return true
	})
	return out
}

// perTables are the tables whose rows form the groups of a per-grain
// aggregate: X's iteration tables, or where X reads no table (count(*
// per ...)) the per columns' own table. The having clause only keeps or
// drops groups: which tables it reads never changes the groups.
func (pl *planner) perTables(pa *model.PerAgg) []*model.Table {
	if pa.X != nil {
		if ts := pl.iterationTables(pa.X); len(ts) > 0 {
			return ts
		}
	}
	for _, c := range pa.Per {
		reach := model.Reach(c.Table)
		all := true
		for _, o := range pa.Per {
			_, ok := reach[o.Table]
			all = all && ok
		}
		if all {
			return []*model.Table{c.Table}
		}
	}
	pl.diags.Errorf(pa.Pos, "no-iteration-table", "the per columns of this count(* per ...) are on tables that no one table reaches").Suggestion =
		"count over a measure instead: count(m per t.c)"
	return nil
}

// compile turns a measure expression, evaluated in cell c of ctx, into
// arithmetic over values of relations.
func (pl *planner) compile(ctx *Context, e model.Expr, c cell) model.Expr {
	switch e := e.(type) {
	case *model.MeasureRef:
		return pl.measureValue(ctx, e.Measure, c)
	case *model.NarrowExpr:
		outer := pl.narrowedBy
		pl.narrowedBy = pl.owner.Name
		x := pl.compile(ctx, e.X, c.with(cellFilter{e: e.Pred}))
		pl.narrowedBy = outer
		return x
	case *model.EditExpr:
		outer := pl.editedBy
		pl.editedBy = pl.owner.Name
		defer func(n int) { pl.backs = pl.backs[:n] }(len(pl.backs))
		c2 := c
		for i, ed := range e.Edits {
			switch {
			case ed.Kind == model.EditBack:
				if pl.twoAxes(ed) {
					return nil
				}
				pl.backs = append(pl.backs, ed.Col)
				ok := false
				if c2, ok = pl.back(ctx, c2, ed); !ok {
					return nil
				}
				continue
			case ed.Kind.Time():
				x, _ := pl.timeEdit(ctx, e, i, c2)
				pl.editedBy = outer
				return x
			}
			c2 = c2.edit(ctx, ed)
		}
		x := pl.compile(ctx, e.X, c2)
		pl.editedBy = outer
		return x
	case *model.Agg:
		return pl.leaf(ctx, e, c)
	case *model.PerAgg:
		return pl.per(ctx, e, c, pl.owner.Name)
	case *model.BinOp:
		l, r := pl.compile(ctx, e.L, c), pl.compile(ctx, e.R, c)
		if l == nil || r == nil {
			return nil
		}
		return &model.BinOp{Pos: e.Pos, Op: e.Op, L: l, R: r, T: e.T}
	case *model.UnOp:
		if x := pl.compile(ctx, e.X, c); x != nil {
			return &model.UnOp{Pos: e.Pos, Op: e.Op, X: x}
		}
		return nil
	case *model.Func:
		f := *e
		f.Args = nil
		for _, a := range e.Args {
			x := pl.compile(ctx, a, c)
			if x == nil {
				return nil
			}
			f.Args = append(f.Args, x)
		}
		return &f
	case *model.CaseExpr:
		out := &model.CaseExpr{Pos: e.Pos, T: e.T}
		for _, w := range e.Whens {
			cond, then := pl.compile(ctx, w.Cond, c), pl.compile(ctx, w.Then, c)
			if cond == nil || then == nil {
				return nil
			}
			out.Whens = append(out.Whens, model.WhenArm{Cond: cond, Then: then})
		}
		if e.Else != nil {
			if out.Else = pl.compile(ctx, e.Else, c); out.Else == nil {
				return nil
			}
		}
		return out
	case *model.IsNullExpr:
		if x := pl.compile(ctx, e.X, c); x != nil {
			return &model.IsNullExpr{Pos: e.Pos, X: x, Not: e.Not}
		}
		return nil
	case *model.InExpr:
		in := &model.InExpr{Pos: e.Pos, Not: e.Not}
		if in.X = pl.compile(ctx, e.X, c); in.X == nil {
			return nil
		}
		for _, item := range e.List {
			x := pl.compile(ctx, item, c)
			if x == nil {
				return nil
			}
			in.List = append(in.List, x)
		}
		return in
	case *model.Lit:
		return e
	}
	pl.diags.Errorf(e.Position(), "internal", "cannot plan %T in measure %s", e, pl.owner.Name)
	return nil
}

// measureValue compiles measure m in cell c of ctx once: every later use
// of m in the same cell reads the same node. A value that is one column
// of a relation (or a literal) is that column; any other is a Computed
// node, which the renderer names where more than one expression uses it.
func (pl *planner) measureValue(ctx *Context, m *model.Measure, c cell) model.Expr {
	key := fmt.Sprintf("%p|%p|%d|%s|%s", ctx, m, c.removed, pl.filterKey(c.filters, true), pl.filterKey(c.filters, false))
	if len(c.moved) > 0 {
		keys := slices.Sorted(maps.Keys(c.moved))
		for _, i := range keys {
			key += fmt.Sprintf("|moved %d %s", i, pl.text(c.moved[i]))
		}
	}
	if c.window != nil {
		key += "|window " + windowKey(c)
	}
	if x, ok := pl.computed[key]; ok {
		return x
	}
	outer := pl.owner
	pl.owner = m
	x := pl.compile(ctx, m.Expr, c)
	pl.owner = outer
	switch x.(type) {
	case nil, *ValueRef, *model.Lit, *Computed:
	default:
		x = &Computed{Measure: m, X: x}
	}
	pl.computed[key] = x
	return x
}

// localKeys lists the keys of ctx that a cell with removed keys still
// groups by, and maps each of ctx's grouping masks to a mask over them.
func localKeys(ctx *Context, removed uint64, shift int) ([]int, []uint64, map[uint64]uint64) {
	n := len(ctx.Keys)
	var keep []int
	for i := range ctx.Keys {
		if removed&bit(i, n) == 0 {
			keep = append(keep, i)
		}
	}
	gid := map[uint64]uint64{}
	var sets []uint64
	for _, s := range ctx.Sets {
		l := compact(s|removed, n, keep) << shift
		gid[s] = l
		if !slices.Contains(sets, l) {
			sets = append(sets, l)
		}
	}
	return keep, sets, gid
}

// scanRel finds or adds the scan of t in ctx for a cell with the given
// removed keys and row filters.
func (pl *planner) scanRel(ctx *Context, t *model.Table, removed uint64, where []model.Expr, moved map[int]model.Expr, nameBase string) *Rel {
	key := pl.scanKey(ctx, t, removed, where)
	if len(moved) > 0 {
		key += "|moved " + pl.movedKey(moved)
	}
	if r, ok := pl.rels[key]; ok {
		return r
	}
	keep, sets, gid := localKeys(ctx, removed, 0)
	s := &Scan{Table: t, Where: where, Keys: movedKeys(ctx, keep, moved)}
	r := &Rel{Name: pl.name(nameBase), Keys: keep, Sets: sets, GidOf: gid, Scan: s}
	s.Name = r.Name
	pl.inputs[s] = map[string]*Input{}
	pl.rels[key] = r
	ctx.Rels = append(ctx.Rels, r)
	pl.p.Scans = append(pl.p.Scans, s)
	return r
}

// scanKey identifies the scan of t in ctx for a cell with the given
// removed keys and row filters.
func (pl *planner) scanKey(ctx *Context, t *model.Table, removed uint64, where []model.Expr) string {
	return fmt.Sprintf("%p|%s|%d|%s", ctx, t.Name, removed, pl.whereKey(where))
}

// base adds t's scan to the scans whose cells are ctx's rows.
func (pl *planner) base(ctx *Context, t *model.Table) {
	name := t.Name
	if ctx.Name != "" {
		name = ctx.Name + "_" + t.Name
	}
	r := pl.scanRel(ctx, t, 0, ctx.Filters, nil, name)
	if !slices.Contains(ctx.Bases, r) {
		ctx.Bases = append(ctx.Bases, r)
	}
}

// leaf finds or adds the scan leaf computing a in cell c.
func (pl *planner) leaf(ctx *Context, a *model.Agg, c cell) model.Expr {
	if pa := distinctAsPer(a); pa != nil && c.window == nil {
		// (under a window edit, a DISTINCT aggregate of the range scan)
		return pl.distinctPer(ctx, a, pa, c)
	}
	nameBase := a.Table.Name
	if ctx.Name != "" {
		nameBase = ctx.Name + "_" + a.Table.Name
	}
	if c.removed != 0 || len(c.moved) > 0 || pl.filterKey(c.filters, true) != pl.whereKey(ctx.Filters) {
		nameBase = pl.editedBy + "_" + a.Table.Name
	}
	var r *Rel
	if c.window != nil {
		r = pl.rangeRel(ctx, a.Table, c, nameBase)
	} else {
		r = pl.scanRel(ctx, a.Table, c.removed, rowFilters(c.filters), c.moved, nameBase)
	}
	key := r.Name + "|" + pl.text(a) + "|" + pl.filterKey(c.filters, false)
	if v, ok := pl.values[key]; ok {
		return &ValueRef{Pos: a.Pos, Rel: v.Rel, Column: v.Column, T: v.T, ZeroIfMissing: v.ZeroIfMissing}
	}
	s := r.Scan
	l := &Leaf{Name: pl.name(pl.aggName(ctx, c)), Func: a.Func, Distinct: a.Distinct, T: a.T}
	if a.Arg != nil {
		l.Arg = pl.input(s, l.Name+"_arg", a.Arg)
	}
	if extra := conj(c.filters, false); extra != nil {
		l.Filter = pl.input(s, l.Name+"_if", extra)
	}
	s.Leaves = append(s.Leaves, l)
	// A count is 0 in a cell its relation lacks, under a window edit too:
	// there a cell with E can lack the rows of one of X's tables (E came
	// from another), and a cell without E is NULL by windowEdit's guard
	// on E, which every X with a count gets (nullOverNoRows).
	v := &ValueRef{Pos: a.Pos, Rel: r, Column: l.Name, T: a.T, ZeroIfMissing: a.Func == "count"}
	pl.values[key] = v
	return v
}

// aggName is the readable name of an aggregate of the measure being
// compiled, in cell c of ctx: the measure's, or that of the measure whose
// edit or narrowing is in force.
func (pl *planner) aggName(ctx *Context, c cell) string {
	base := pl.owner.Name
	if ctx.Name != "" {
		base = ctx.Name + "_" + base
	}
	switch {
	case pl.editedBy != "" && pl.editedBy != pl.owner.Name:
		base = pl.editedBy + "_" + pl.owner.Name
	case pl.narrowedBy != "" && conj(c.filters, false) != nil:
		base = pl.narrowedBy
	}
	return base
}

// input finds or adds a row-level value of the scan.
func (pl *planner) input(s *Scan, name string, e model.Expr) *Input {
	key := pl.text(e)
	if in, ok := pl.inputs[s][key]; ok {
		return in
	}
	in := &Input{Name: pl.name(name), Expr: e}
	pl.inputs[s][key] = in
	s.Inputs = append(s.Inputs, in)
	return in
}

// per plans AGG(X per P having H) in cell c: a sub-context keyed by the
// cell's remaining keys plus the per columns, whose value X (and H) are
// aggregated back to the cell's keys. Per-grain aggregates over the same
// groups (the same per columns, iteration tables and cell) share one
// sub-context, each a leaf of its relation. name is the base of the
// leaf's name and of a new sub-context's.
func (pl *planner) per(ctx *Context, pa *model.PerAgg, c cell, name string) model.Expr {
	var texts []string
	for _, f := range c.filters {
		texts = append(texts, fmt.Sprint(f.rows)+pl.text(f.e))
	}
	slices.Sort(texts)
	key := fmt.Sprintf("%p|per|%s|%d|%s|%s|%s", ctx, pl.text(pa), c.removed, strings.Join(texts, " and "), pl.movedKey(c.moved), windowKey(c))
	if v, ok := pl.values[key]; ok {
		return &ValueRef{Pos: pa.Pos, Rel: v.Rel, Column: v.Column, T: v.T, ZeroIfMissing: v.ZeroIfMissing}
	}
	r, fresh := pl.perRel(ctx, pa, c, name)
	sub := r.Per.Sub
	start := pinStart(pa, sub, r.Per.start)
	outerNarrow, outerEdit := pl.narrowedBy, pl.editedBy
	pl.narrowedBy, pl.editedBy = "", ""
	leaf := &PerLeaf{Func: pa.Func, PerKeys: sub.Keys[len(r.Keys):], T: pa.T}
	if pa.X != nil {
		x := pl.compile(sub, pa.X, start)
		if x == nil {
			return nil
		}
		leaf.Value = &Input{Name: pl.name(pl.owner.Name + "_value"), Expr: x}
		sub.Values = append(sub.Values, leaf.Value)
	}
	if pa.Having != nil {
		h := pl.compile(sub, pa.Having, start)
		if h == nil {
			return nil
		}
		leaf.Having = &Input{Name: pl.name(pl.owner.Name + "_keep"), Expr: h}
		sub.Values = append(sub.Values, leaf.Having)
	}
	pl.narrowedBy, pl.editedBy = outerNarrow, outerEdit
	leaf.Name = pl.name(name)
	r.Per.Leaves = append(r.Per.Leaves, leaf)
	if fresh {
		ctx.Rels = append(ctx.Rels, r)
	}
	v := &ValueRef{Pos: pa.Pos, Rel: r, Column: leaf.Name, T: pa.T, ZeroIfMissing: pa.Func == "count"}
	pl.values[key] = v
	return v
}

// perRel finds or adds the per-grain relation whose sub-context forms the
// groups of pa in cell c: the cell's remaining keys plus the per columns,
// over the rows of pa's iteration tables that pass every filter of the
// cell. fresh reports a new relation, not yet among ctx's.
func (pl *planner) perRel(ctx *Context, pa *model.PerAgg, c cell, name string) (r *Rel, fresh bool) {
	tables := pl.perTables(pa)
	var texts, tnames, cols []string
	for _, f := range c.filters {
		texts = append(texts, pl.text(f.e))
	}
	slices.Sort(texts)
	for _, t := range tables {
		tnames = append(tnames, t.Name)
	}
	slices.Sort(tnames)
	for _, col := range pa.Per {
		cols = append(cols, model.Text(&model.ColRef{Col: col}))
	}
	key := fmt.Sprintf("per|%p|%s|%s|%d|%s|%s|%v|%s", ctx, strings.Join(cols, ","), strings.Join(tnames, ","), c.removed, strings.Join(texts, " and "), pl.movedKey(c.moved), pinned(pa), windowKey(c))
	if r, ok := pl.rels[key]; ok {
		return r, false
	}
	k := len(pa.Per)
	removed := c.removed
	if c.window != nil {
		// Under a window edit every key stays: the cell (all its keys)
		// sets E, hence the range of rows the groups come from.
		removed = 0
	}
	keep, sets, gid := localKeys(ctx, removed, k)
	sub := &Context{Name: pl.name(name + "_per")}
	var keyNames []string
	sub.Keys = movedKeys(ctx, keep, c.moved)
	for _, i := range keep {
		keyNames = append(keyNames, ctx.Keys[i].Name)
	}
	for _, col := range pa.Per {
		kn := col.String() + " per"
		for slices.Contains(keyNames, kn) {
			kn += " per"
		}
		keyNames = append(keyNames, kn)
		sub.Keys = append(sub.Keys, Key{Name: kn, Col: col, Pos: pa.Pos, Pin: pinned(pa)})
	}
	sub.Sets = sets
	for _, f := range c.filters {
		sub.Filters = append(sub.Filters, f.e)
	}
	r = &Rel{Name: sub.Name, Keys: keep, Sets: sets, GidOf: gid, Per: &PerRel{Sub: sub}}
	if c.window != nil {
		pl.windowBases(ctx, sub, r.Per, tables, c)
	} else {
		for _, t := range tables {
			pl.base(sub, t)
		}
	}
	pl.rels[key] = r
	return r, true
}

// windowBases makes the groups of a per-grain aggregate under a window
// edit (cell c of ctx): each of ctx's cells with the per columns' values
// among its rows in range, read by range scans of sub (whose first keys
// are ctx's, the cell; the rest, the per columns, are read on the rows).
// The sub-context's cells start from the same range: ctx's keys that c
// removed stay keys of sub (they name the cell, whose E sets the range)
// but constrain no row.
func (pl *planner) windowBases(ctx, sub *Context, pr *PerRel, tables []*model.Table, c cell) {
	n, ns := len(ctx.Keys), len(sub.Keys)
	start := cell{window: c.window.each(func(w windowEdit) windowEdit { w.order = -1; return w })}
	for i := range ctx.Keys {
		if c.removed&bit(i, n) != 0 {
			start.removed |= bit(i, ns)
		}
	}
	for _, f := range sub.Filters {
		start.filters = append(start.filters, cellFilter{e: f, rows: true})
	}
	pr.start = cell{removed: start.removed, window: start.window}
	pr.AfterCells = true
	for _, t := range tables {
		r := pl.rangeRel(sub, t, start, sub.Name+"_"+t.Name)
		if !slices.Contains(sub.Bases, r) {
			sub.Bases = append(sub.Bases, r)
		}
	}
}

// windowKey is a text for the window edit in force in cell c, if any:
// the edit, the date its rows are matched on and E.
func windowKey(c cell) string {
	var t []string
	for w := c.window; w != nil; w = w.prior {
		t = append(t, w.ed.Col.String()+" "+w.ed.TimeText()+" at "+model.Text(w.at)+" "+endKey(w.e))
	}
	return strings.Join(t, "; ")
}
