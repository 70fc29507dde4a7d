package plan

import (
	"github.com/rollwise/rollwise/planner/model"
	"slices"
)

// hoistNarrowings moves the narrowing conjuncts that every leaf of a scan
// shares from the leaves' filters into the scan's WHERE: an engine pushes
// a WHERE into its read of the table (and skips whole blocks of rows),
// where a FILTER clause makes it read and test every row.
//
// It is exact only where the scan's cells do not decide which rows the
// context has. A cell the WHERE leaves empty then goes missing, and a
// missing cell reads as the aggregates of no rows: NULL, and 0 for a
// count (ValueRef.ZeroIfMissing), as the FILTER clause gives over a cell
// where no row passes. So it applies to a scan that is not among its
// context's bases, and to the bases of a context without keys (a query
// without groups), whose one row exists whatever the scans hold: an
// aggregate without GROUP BY gives a row even over no rows. A base of a
// context with keys keeps its narrowings in FILTER clauses: its cells are
// the context's rows, and a group whose rows all fail the narrowing must
// stay. (Splitting such a base into a key-only scan and a filtered one
// would read the table twice; not done.)
func (pl *planner) hoistNarrowings(ctx *Context) {
	for _, r := range ctx.Rels {
		if r.Per != nil {
			pl.hoistNarrowings(r.Per.Sub)
		}
		if r.Scan == nil || r.Scan.Range != nil || (len(ctx.Keys) > 0 && slices.Contains(ctx.Bases, r)) {
			continue
		}
		pl.hoist(r.Scan)
	}
}

// hoist moves the conjuncts (split at the top-level and) common to every
// leaf's filter into s.Where, and leaves each leaf the rest of its own.
func (pl *planner) hoist(s *Scan) {
	if len(s.Leaves) == 0 {
		return
	}
	var shared []model.Expr
	for i, l := range s.Leaves {
		if l.Filter == nil {
			return
		}
		if i == 0 {
			// Repeats are harmless: they go into the WHERE once (below).
			shared = model.Conjuncts(l.Filter.Expr)
			continue
		}
		texts := map[string]bool{}
		for _, c := range model.Conjuncts(l.Filter.Expr) {
			texts[pl.text(c)] = true
		}
		shared = slices.DeleteFunc(shared, func(c model.Expr) bool { return !texts[pl.text(c)] })
		if len(shared) == 0 {
			return
		}
	}
	moved := map[string]bool{}
	where := slices.Clone(s.Where) // s.Where may be the context's own Filters
	for _, c := range shared {
		t := pl.text(c)
		moved[t] = true
		if !slices.ContainsFunc(where, func(w model.Expr) bool { return pl.text(w) == t }) {
			where = append(where, c)
		}
	}
	s.Where = where
	args := map[*Input]bool{}
	for _, l := range s.Leaves {
		args[l.Arg] = true
	}
	rest := map[*Input]*Input{}
	for _, l := range s.Leaves {
		in, done := rest[l.Filter]
		if !done {
			var e model.Expr
			for _, c := range model.Conjuncts(l.Filter.Expr) {
				if moved[pl.text(c)] {
					continue
				}
				if e == nil {
					e = c
				} else {
					e = &model.BinOp{Pos: c.Position(), Op: "and", L: e, R: c, T: model.TypeBoolean}
				}
			}
			if e != nil {
				in = pl.reuse(s, l.Filter, e, args[l.Filter])
			}
			rest[l.Filter] = in
		}
		l.Filter = in
	}
	used := map[*Input]bool{}
	for _, l := range s.Leaves {
		used[l.Arg], used[l.Filter] = true, true
	}
	s.Inputs = slices.DeleteFunc(s.Inputs, func(in *Input) bool { return !used[in] })
}

// reuse gives the input of s computing e, the rest of the filter old: one
// the scan has already, or else old itself, recomputed (keeping its name),
// unless a leaf reads old as its argument.
func (pl *planner) reuse(s *Scan, old *Input, e model.Expr, isArg bool) *Input {
	t := pl.text(e)
	if in, ok := pl.inputs[s][t]; ok {
		return in
	}
	if isArg {
		return pl.input(s, old.Name, e)
	}
	delete(pl.inputs[s], pl.text(old.Expr))
	old.Expr = e
	pl.inputs[s][t] = old
	return old
}
