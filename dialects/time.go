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
	ranges := append([]*plan.TimeRange{tr}, tr.Also...)
	endName := func(i int) string {
		if i == 0 {
			return rel.Name + "_end"
		}
		return rel.Name + "_end" + strconv.Itoa(i+1)
	}
	for i, g := range ranges {
		model.Walk(g.E, func(x model.Expr) bool {
			if v, ok := x.(*plan.ValueRef); ok && !joined[v.Rel] && r.cte[v.Rel] != r.keyRel[ctx] {
				joined[v.Rel] = true
				from += "\n  LEFT JOIN " + r.q(r.cte[v.Rel]) + " ON " + r.joinOn(ctx, key, v.Rel)
			}
			return true
		})
		outer := r.ctx
		r.ctx = ctx // the context's rows are not joined yet: every value qualified
		e, err := r.expr(g.E)
		r.ctx = outer
		if err != nil {
			return err
		}
		cols = append(cols, e+" AS "+r.q(endName(i)))
	}
	r.addCTE(ends, "  SELECT "+strings.Join(cols, ", ")+"\n  FROM "+from)

	a, x := r.q("a"), r.q("x")
	var conds []string
	for i, g := range ranges {
		conds = append(conds, r.inRange(g, x+"."+r.q(col(g.D.Name)), a+"."+r.q(endName(i)))...)
	}
	n := len(ctx.Keys)
	var extra []int
	for j, i := range tr.Match {
		if i >= n {
			// a key of a per-grain sub-context: read on the rows
			extra = append(extra, j)
			continue
		}
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
	cells := r.rangeCells(ctx, rel, extra, col)
	for _, l := range s.Leaves {
		if l.Func == "median" && r.windowMedians() {
			return r.rangeMedians(cells, rel, ends, rowsName, col, conds)
		}
	}
	var group, sel []string
	for _, c := range cells {
		group = append(group, c.expr)
		sel = append(sel, c.sel(r))
	}
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

// inRange is the conditions that the date at lies in range g, whose E
// is end.
func (r *renderer) inRange(g *plan.TimeRange, at, end string) []string {
	switch g.Kind {
	case model.EditToDate:
		return []string{at + " <= " + end, at + " >= " + r.d.DateTrunc(g.Unit, end, g.E.Type())}
	case model.EditLast:
		return []string{at + " <= " + end, at + " > " + r.moveBy(end, -g.N, g.Unit, g.E.Type())}
	case model.EditLatest, model.EditEarliest:
		return []string{at + " = " + end}
	}
	return []string{at + " <= " + end}
}

// rangeCell is a column that names a range scan's cells: its value on the
// joined cell (a) and row (x), and its name.
type rangeCell struct {
	expr, name string
}

// sel is the cell column in a select list, named where the value is not
// already the column of that name.
func (c rangeCell) sel(r *renderer) string {
	if c.expr == r.q("a")+"."+r.q(c.name) {
		return c.expr
	}
	return c.expr + " AS " + r.q(c.name)
}

// rangeCells lists the columns of a range scan's cells: the grouping id
// and keys of ctx's cells, then the scan's keys read on the rows (extra:
// their indexes in the scan's Keys), which a per-grain sub-context under a
// window edit adds. The grouping id is then the sub-context's: ctx's,
// shifted past the added keys (which are never rolled up).
func (r *renderer) rangeCells(ctx *plan.Context, rel *plan.Rel, extra []int, col func(string) string) []rangeCell {
	a, x := r.q("a"), r.q("x")
	gid := a + "." + r.q(GroupingColumn)
	if len(extra) > 0 {
		gid += " * " + strconv.Itoa(1<<len(extra))
	}
	cells := []rangeCell{{gid, GroupingColumn}}
	for _, k := range ctx.Keys {
		cells = append(cells, rangeCell{a + "." + r.q(k.Name), k.Name})
	}
	for _, j := range extra {
		name := rel.Scan.Keys[j].Name
		cells = append(cells, rangeCell{x + "." + r.q(col(name)), name})
	}
	return cells
}

// rangeMedians finishes a range scan whose leaves include a median the
// dialect computes with windows (render_median.go): the cells' rows (each
// cell of ends joined to the rows in its date range, on conds) go to a CTE
// of their own, numbered within each cell, and the cells CTE aggregates
// them by cell.
func (r *renderer) rangeMedians(cells []rangeCell, rel *plan.Rel, ends, rowsName string, col func(string) string, conds []string) error {
	s := rel.Scan
	a, x := r.q("a"), r.q("x")
	var cols, sel, part []string
	for _, c := range cells {
		cols = append(cols, c.name)
		sel = append(sel, c.expr+" AS "+r.q(c.name))
		part = append(part, r.q(c.name))
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
	switch {
	case rel.Per != nil:
		return r.per(ctx, rel)
	case rel.Shift == nil:
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
