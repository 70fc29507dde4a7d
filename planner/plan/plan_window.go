package plan

import (
	"github.com/rollwise/rollwise/planner/model"
	"slices"
	"sort"
	"strings"
)

// windowFunc is the window aggregate that combines finer cells' values of
// an aggregate, or "" when the aggregate does not decompose.
func windowFunc(l *Leaf) string {
	if l.Distinct {
		return ""
	}
	switch l.Func {
	case "sum", "count":
		return "sum"
	case "min", "max":
		return l.Func
	}
	return ""
}

// useWindows turns edited scans into windows over the base scan's cells
// where that is exact: the context's rows come from that one base scan,
// the edit only removes groupings (the scan reads the same rows), and every
// aggregate decomposes. It saves reading the table again.
func (pl *planner) useWindows(ctx *Context) {
	for _, r := range ctx.Rels {
		if r.Per != nil {
			pl.useWindows(r.Per.Sub)
		}
	}
	if len(ctx.Bases) != 1 || ctx.Bases[0].Scan.Range != nil {
		// (the cells of a range scan, in a per-grain sub-context under a
		// window edit, overlap: running ranges share rows)
		return
	}
	base := ctx.Bases[0]
	want := pl.whereKey(ctx.Filters)
	for _, r := range ctx.Rels {
		s := r.Scan
		if r == base || s == nil || s.Table != base.Scan.Table || pl.whereKey(s.Where) != want || len(s.Leaves) == 0 ||
			slices.ContainsFunc(s.Keys, func(k Key) bool { return k.Expr != nil }) || pl.timeEnds[r] || s.Range != nil {
			continue
		}
		ok := true
		for _, l := range s.Leaves {
			ok = ok && windowFunc(l) != ""
		}
		if !ok {
			continue
		}
		pl.windowOver(r, &WindowRel{Base: base, Partition: r.Keys})
	}
}

// windowOver makes r, a scan relation, the window w over the cells of
// w.Base: each of the scan's leaves a window part over the base's same
// aggregate (added to the base scan where it lacks it).
func (pl *planner) windowOver(r *Rel, w *WindowRel) {
	s, base := r.Scan, w.Base
	for _, l := range s.Leaves {
		src := pl.baseLeaf(base.Scan, s, l)
		w.Parts = append(w.Parts, &WindowPart{Name: l.Name, Func: windowFunc(l), Source: src.Name, T: l.T})
	}
	r.Scan, r.Window = nil, w
	r.Keys, r.Sets, r.GidOf = base.Keys, base.Sets, base.GidOf
	pl.p.Scans = slices.DeleteFunc(pl.p.Scans, func(x *Scan) bool { return x == s })
}

// baseLeaf finds or adds in the base scan the aggregate l of scan s.
func (pl *planner) baseLeaf(base, s *Scan, l *Leaf) *Leaf {
	text := func(in *Input) string {
		if in == nil {
			return ""
		}
		return pl.text(in.Expr)
	}
	for _, b := range base.Leaves {
		if b.Func == l.Func && b.Distinct == l.Distinct && text(b.Arg) == text(l.Arg) && text(b.Filter) == text(l.Filter) {
			return b
		}
	}
	nl := &Leaf{Name: pl.name(l.Name + "_cell"), Func: l.Func, Distinct: l.Distinct, T: l.T}
	if l.Arg != nil {
		nl.Arg = pl.input(base, l.Arg.Name, l.Arg.Expr)
	}
	if l.Filter != nil {
		nl.Filter = pl.input(base, l.Filter.Name, l.Filter.Expr)
	}
	base.Leaves = append(base.Leaves, nl)
	return nl
}

// whereKey identifies a set of row filters, whatever their order.
func (pl *planner) whereKey(ws []model.Expr) string {
	var t []string
	for _, w := range ws {
		t = append(t, pl.text(w))
	}
	sort.Strings(t)
	return strings.Join(t, " and ")
}
