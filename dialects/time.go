package dialects

import (
	"slices"
	"strconv"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
)

// moveDate spells the planner's date_move(D, N).
func (r *renderer) moveDate(e *model.Func, arg string, t model.Type) string {
	lit, _ := e.Args[1].(*model.Lit)
	n := 0
	if lit != nil {
		n, _ = strconv.Atoi(lit.Text)
	}
	return r.moveBy(arg, n, e.Unit, t)
}

// moveBy moves a date by n units: days and weeks as days, quarters and
// years as months, which the dialect's moveDate moves.
func (r *renderer) moveBy(arg string, n int, unit string, t model.Type) string {
	switch unit {
	case "week":
		n, unit = 7*n, "day"
	case "quarter":
		n, unit = 3*n, "month"
	case "year":
		n, unit = 12*n, "month"
	}
	return r.d.moveDate(arg, n, unit, t)
}

// rangeScan renders a window edit's scan (plan.TimeRange): the E of
// every cell of ctx, then the aggregates of the rows that match each
// cell's kept keys and whose date lies in the cell's range.
func (r *renderer) rangeScan(ctx *plan.Context, rel *plan.Rel) error {
	s := rel.Scan
	tr := s.Range
	rowsName, col, err := r.scanRows(rel)
	if err != nil {
		return err
	}
	key := r.q(r.keyRel[ctx])
	ends := r.cteName(rel.Name + "_ends")
	cols := []string{key + "." + r.q(GroupingColumn)}
	for _, k := range ctx.Keys {
		cols = append(cols, key+"."+r.q(k.Name))
	}
	from := key
	joined := map[*plan.Rel]bool{}
	model.Walk(tr.E, func(x model.Expr) bool {
		if v, ok := x.(*plan.ValueRef); ok && !joined[v.Rel] && r.cte[v.Rel] != r.keyRel[ctx] {
			joined[v.Rel] = true
			from += "\n  LEFT JOIN " + r.q(r.cte[v.Rel]) + " ON " + r.joinOn(ctx, key, v.Rel)
		}
		return true
	})
	outer := r.ctx
	r.ctx = ctx // the context's rows are not joined yet: every value qualified
	e, err := r.expr(tr.E)
	r.ctx = outer
	if err != nil {
		return err
	}
	cols = append(cols, e+" AS "+r.q(rel.Name+"_end"))
	r.addCTE(ends, "  SELECT "+strings.Join(cols, ", ")+"\n  FROM "+from)

	a, x := r.q("a"), r.q("x")
	at := x + "." + r.q(col(tr.D.Name))
	end := a + "." + r.q(rel.Name+"_end")
	conds := []string{at + " <= " + end}
	switch tr.Kind {
	case model.EditToDate:
		conds = append(conds, at+" >= "+r.d.DateTrunc(tr.Unit, end, tr.E.Type()))
	case model.EditLast:
		conds = append(conds, at+" > "+r.moveBy(end, -tr.N, tr.Unit, tr.E.Type()))
	}
	n := len(ctx.Keys)
	for j, i := range tr.Match {
		k := ctx.Keys[i]
		eq := r.d.NullSafeEqual(x+"."+r.q(col(s.Keys[j].Name)), a+"."+r.q(k.Name))
		rolled := false
		for _, set := range ctx.Sets {
			rolled = rolled || set&(1<<(n-1-i)) != 0
		}
		if rolled {
			eq = "(" + r.d.BitAnd(a+"."+r.q(GroupingColumn), strconv.Itoa(1<<(n-1-i))) + " <> 0 OR " + eq + ")"
		}
		conds = append(conds, eq)
	}
	for _, l := range s.Leaves {
		if l.Func == "median" && r.windowMedians() {
			return r.rangeMedians(ctx, rel, ends, rowsName, col, conds)
		}
	}
	group := []string{a + "." + r.q(GroupingColumn)}
	for _, k := range ctx.Keys {
		group = append(group, a+"."+r.q(k.Name))
	}
	sel := append([]string{}, group...)
	for _, l := range s.Leaves {
		agg, err := r.leafAgg(l, x+".", col)
		if err != nil {
			return err
		}
		sel = append(sel, agg)
	}
	r.cte[rel] = r.cteName(rel.Name + "_cells")
	r.addCTE(r.cte[rel], "  SELECT "+strings.Join(sel, ", ")+"\n  FROM "+r.q(ends)+" AS "+a+
		"\n  JOIN "+r.q(rowsName)+" AS "+x+" ON "+strings.Join(conds, "\n    AND ")+
		"\n  GROUP BY "+strings.Join(group, ", "))
	return nil
}

// rangeMedians finishes a range scan whose leaves include a median the
// dialect computes with windows (render_median.go): the cells' rows (each
// cell of ends joined to the rows in its date range, on conds) go to a CTE
// of their own, numbered within each cell, and the cells CTE aggregates
// them by cell.
func (r *renderer) rangeMedians(ctx *plan.Context, rel *plan.Rel, ends, rowsName string, col func(string) string, conds []string) error {
	s := rel.Scan
	a, x := r.q("a"), r.q("x")
	cols := []string{GroupingColumn}
	sel := []string{a + "." + r.q(GroupingColumn) + " AS " + r.q(GroupingColumn)}
	part := []string{r.q(GroupingColumn)}
	for _, k := range ctx.Keys {
		cols = append(cols, k.Name)
		sel = append(sel, a+"."+r.q(k.Name)+" AS "+r.q(k.Name))
		part = append(part, r.q(k.Name))
	}
	group := append([]string{}, part...)
	var vals []rankedValue
	var meds []*plan.Leaf
	for _, l := range s.Leaves {
		for _, in := range []*plan.Input{l.Arg, l.Filter} {
			if in != nil && !slices.Contains(cols, col(in.Name)) {
				cols = append(cols, col(in.Name))
				sel = append(sel, x+"."+r.q(col(in.Name))+" AS "+r.q(col(in.Name)))
			}
		}
		if l.Func == "median" {
			vals = append(vals, r.leafRanked(l, col))
			meds = append(meds, l)
		}
	}
	joined := r.cteName(rel.Name + "_range_rows")
	r.addCTE(joined, "  SELECT "+strings.Join(sel, ", ")+"\n  FROM "+r.q(ends)+" AS "+a+
		"\n  JOIN "+r.q(rowsName)+" AS "+x+" ON "+strings.Join(conds, "\n    AND "))
	ranked, median, err := r.ranks(rel.Name, r.q(joined), cols, vals, [][]string{part})
	if err != nil {
		return err
	}
	out := append([]string{}, group...)
	for _, l := range s.Leaves {
		i := slices.Index(meds, l)
		if i < 0 {
			agg, err := r.leafAgg(l, "", col)
			if err != nil {
				return err
			}
			out = append(out, agg)
			continue
		}
		m, err := median(i, 0)
		if err != nil {
			return err
		}
		out = append(out, m+" AS "+r.q(l.Name))
	}
	r.cte[rel] = r.cteName(rel.Name + "_cells")
	r.addCTE(r.cte[rel], "  SELECT "+strings.Join(out, ", ")+"\n  FROM "+r.q(ranked)+"\n  GROUP BY "+strings.Join(group, ", "))
	return nil
}

// later renders a relation that reads the context's cells or another
// relation's: a window edit's range scan, or a shift.
func (r *renderer) later(ctx *plan.Context, rel *plan.Rel) error {
	if rel.Shift == nil {
		return r.rangeScan(ctx, rel)
	}
	sh := rel.Shift
	k := ctx.Keys[sh.Key]
	moved := r.moveBy(r.q(k.Name), sh.N, sh.Unit, k.Col.Type)
	group := []string{r.q(GroupingColumn)}
	for _, i := range rel.Keys {
		if i == sh.Key {
			group = append(group, moved)
		} else {
			group = append(group, r.q(ctx.Keys[i].Name))
		}
	}
	sel := slices.Clone(group)
	for j, i := range rel.Keys {
		if i == sh.Key {
			sel[j+1] = moved + " AS " + r.q(k.Name)
		}
	}
	for _, p := range sh.Parts {
		sel = append(sel, p.Func+"("+r.q(p.Source)+") AS "+r.q(p.Name))
	}
	r.cte[rel] = r.cteName(rel.Name + "_moved")
	r.addCTE(r.cte[rel], "  SELECT "+strings.Join(sel, ", ")+"\n  FROM "+r.q(r.cte[sh.Source])+
		"\n  GROUP BY "+strings.Join(group, ", "))
	return nil
}
