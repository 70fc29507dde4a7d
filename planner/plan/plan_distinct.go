package plan

import (
	"github.com/rollwise/rollwise/planner/model"
	"slices"
)

// Distinct counts as per-grain counts. count(distinct T.C) equals the
// per-grain count(* per T.C): the per-grain groups of a cell are the
// distinct values of T.C among the cell's rows of T (its narrowings and
// pins included), and count(* per ...) without having counts those whose
// value is not NULL, as count(distinct ...) skips NULL. Planned that way,
// the count shares the grouping of other per-grain measures per T.C in the
// same cell (one GROUP BY for both), and on DuckDB grouping by the column
// is faster than a DISTINCT aggregate over grouping sets or with a FILTER
// (docs/benchmarks.md, R5). It is slower only where the scan of T in the
// context computes nothing else, so that the per-grain grouping would be a
// second pass over the rows: distinctLeaves then puts the DISTINCT
// aggregate back into that scan.

// distinctOrigin is the aggregate a per-grain count stands for, and the
// cell it was planned in.
type distinctOrigin struct {
	agg  *model.Agg
	cell cell
}

// distinctAsPer is count(distinct T.C) as count(* per T.C), or nil for
// other aggregates (a distinct count of an expression stays a DISTINCT
// aggregate).
func distinctAsPer(a *model.Agg) *model.PerAgg {
	col, ok := a.Arg.(*model.ColRef)
	if a.Func != "count" || !a.Distinct || !ok || col.Col.Table != a.Table {
		return nil
	}
	return &model.PerAgg{Pos: a.Pos, Func: "count", Per: []*model.Column{col.Col}, T: a.T}
}

// distinctPer plans a, a count(distinct T.C), as pa, its count(* per
// T.C), and remembers where it came from.
func (pl *planner) distinctPer(ctx *Context, a *model.Agg, pa *model.PerAgg, c cell) model.Expr {
	v := pl.per(ctx, pa, c, pl.aggName(ctx, c))
	if ref, ok := v.(*ValueRef); ok {
		for _, l := range ref.Rel.Per.Leaves {
			if l.Name == ref.Column {
				if _, seen := pl.distinct[l]; !seen {
					pl.distinct[l] = distinctOrigin{agg: a, cell: c}
				}
			}
		}
	}
	return v
}

// distinctLeaves turns per-grain counts that stand for distinct counts
// back into DISTINCT aggregates of a base scan that computes nothing else:
// there they cost one aggregate in a pass over the rows the context reads
// anyway. It moves a per-grain relation only when every one of its leaves
// stands for a distinct count that the scan would have computed (the same
// table, no key removed, the same row filters); each leaf's narrowing
// becomes the aggregate's filter.
func (pl *planner) distinctLeaves(ctx *Context) {
	for _, r := range ctx.Rels {
		if r.Per != nil {
			pl.distinctLeaves(r.Per.Sub)
		}
	}
	for _, b := range ctx.Bases {
		if b.Scan == nil || len(b.Scan.Leaves) > 0 {
			continue
		}
		var moved []*Rel
		for _, r := range ctx.Rels {
			if pl.onlyDistinct(ctx, r, b) {
				moved = append(moved, r)
			}
		}
		for _, r := range moved {
			pl.moveDistinct(ctx, r, b)
		}
	}
}

// onlyDistinct reports whether every leaf of r stands for a distinct
// count that base b's scan would have computed: not one whose cell moves
// a key (the pinned day of = latest moved by a later back reads other
// rows than the base's cell: regression case distinct_under_moved_pin).
func (pl *planner) onlyDistinct(ctx *Context, r, b *Rel) bool {
	if r.Per == nil || len(r.Per.Sub.Values) > 0 {
		return false
	}
	for _, l := range r.Per.Leaves {
		o, ok := pl.distinct[l]
		if !ok || o.cell.removed != 0 || len(o.cell.moved) > 0 || pl.rels[pl.scanKey(ctx, o.agg.Table, 0, rowFilters(o.cell.filters))] != b {
			return false
		}
	}
	return true
}

// moveDistinct replaces per-grain relation r by DISTINCT aggregates of
// base b's scan, each named as the leaf it replaces.
func (pl *planner) moveDistinct(ctx *Context, r, b *Rel) {
	s := b.Scan
	for _, pleaf := range r.Per.Leaves {
		o := pl.distinct[pleaf]
		l := &Leaf{Name: pleaf.Name, Func: "count", Distinct: true, T: pleaf.T}
		l.Arg = pl.input(s, l.Name+"_arg", o.agg.Arg)
		if extra := conj(o.cell.filters, false); extra != nil {
			l.Filter = pl.input(s, l.Name+"_if", extra)
		}
		s.Leaves = append(s.Leaves, l)
	}
	pl.repoint(r, b)
	ctx.Rels = slices.DeleteFunc(ctx.Rels, func(x *Rel) bool { return x == r })
	for _, sr := range r.Per.Sub.Rels {
		pl.p.Scans = slices.DeleteFunc(pl.p.Scans, func(x *Scan) bool { return x == sr.Scan })
	}
}

// repoint makes every value read from relation from read the same column
// of relation to.
func (pl *planner) repoint(from, to *Rel) {
	seen := map[*Computed]bool{}
	fix := func(e model.Expr) {
		WalkOnce(e, seen, func(x model.Expr) bool {
			if v, ok := x.(*ValueRef); ok && v.Rel == from {
				v.Rel = to
			}
			return true
		})
	}
	for _, o := range pl.p.Outputs {
		fix(o.Expr)
	}
	var visit func(ctx *Context)
	visit = func(ctx *Context) {
		for _, in := range ctx.Values {
			fix(in.Expr)
		}
		for _, r := range ctx.Rels {
			if r.Per != nil {
				visit(r.Per.Sub)
			}
		}
	}
	visit(pl.p.Root)
}
