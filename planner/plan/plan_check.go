package plan

import (
	"fmt"
	"github.com/rollwise/rollwise/planner/model"
	"slices"
	"sort"
	"strings"
)

// measuresOf names the measures that read a scan.
func (pl *planner) measuresOf(s *Scan) string {
	var names []string
	var visit func(e model.Expr, name string)
	seen := map[*Computed]bool{}
	visit = func(e model.Expr, name string) {
		WalkOnce(e, seen, func(x model.Expr) bool {
			if v, ok := x.(*ValueRef); ok {
				if v.Rel.Scan == s && !slices.Contains(names, name) {
					names = append(names, name)
				}
				if v.Rel.Per != nil {
					for _, in := range v.Rel.Per.Sub.Values {
						visit(in.Expr, name)
					}
					for _, b := range v.Rel.Per.Sub.Bases {
						if b.Scan == s && !slices.Contains(names, name) {
							names = append(names, name)
						}
					}
				}
			}
			return true
		})
	}
	for _, o := range pl.p.Outputs {
		clear(seen)
		visit(o.Expr, o.Name)
	}
	if len(names) == 0 {
		// A scan that only supplies rows: name the measures iterating
		// over its table.
		for _, m := range pl.q.Measures {
			if slices.Contains(pl.iterationTables(m.Expr), s.Table) {
				names = append(names, m.Name)
			}
		}
	}
	return strings.Join(names, ", ")
}

// reach is model.Reach(t) and the copies of calendars `back` joins (see
// movedColumn): one is reached through its link from a table t reaches.
func (pl *planner) reach(t *model.Table) map[*model.Table][]*model.Link {
	reach := model.Reach(t)
	for l := range pl.p.Moves {
		if path, ok := reach[l.From]; ok {
			reach[l.To] = append(slices.Clone(path), l)
		}
	}
	return reach
}

// checkReach reports keys and filters the scan's table cannot reach.
func (pl *planner) checkReach(s *Scan) {
	reach := pl.reach(s.Table)
	for _, k := range s.Keys {
		if _, ok := reach[k.Col.Table]; !ok {
			what := "group by " + k.Name
			if strings.HasSuffix(k.Name, " per") {
				what = "form per-grain groups of " + k.Col.String()
			}
			d := pl.diags.Errorf(k.Pos, "unreachable", "cannot %s: measure %s iterates over %s, and no link leads from %s to %s",
				what, pl.measuresOf(s), s.Table.Name, s.Table.Name, k.Col.Table.Name)
			d.Suggestion = fmt.Sprintf("use a column %s can reach, or add a link from %s towards %s", s.Table.Name, s.Table.Name, k.Col.Table.Name)
			if l := linkTowards(k.Col.Table, s.Table); l != nil {
				d.Suggestion = fmt.Sprintf("%s reaches %s, not the other way: iterate over %s instead, for example count(distinct %s) to count the %s rows of each group, or per %s in a per-grain measure",
					k.Col.Table.Name, s.Table.Name, k.Col.Table.Name, l.FromCols[0], s.Table.Name, l.FromCols[0])
			}
		}
	}
	check := func(e model.Expr, what string) {
		for _, c := range model.Columns(e) {
			if _, ok := reach[c.Table]; !ok {
				d := pl.diags.Errorf(e.Position(), "unreachable", "cannot %s %s: measure %s iterates over %s, and no link leads from %s to %s",
					what, c, pl.measuresOf(s), s.Table.Name, s.Table.Name, c.Table.Name)
				if l := linkTowards(c.Table, s.Table); l != nil {
					d.Suggestion = fmt.Sprintf("%s reaches %s, not the other way: iterate over %s instead, for example count(distinct %s) to count the %s rows that pass, or per %s in a per-grain measure",
						c.Table.Name, s.Table.Name, c.Table.Name, l.FromCols[0], s.Table.Name, l.FromCols[0])
				}
				return
			}
		}
	}
	for _, f := range s.Where {
		check(f, "filter on")
	}
	for _, in := range s.Inputs {
		check(in.Expr, "read")
	}
}

// joins lists the links the scan follows, nearest first.
func (pl *planner) joins(s *Scan) {
	reach := pl.reach(s.Table)
	need := map[*model.Table]bool{}
	var exprs []model.Expr
	exprs = append(exprs, s.Where...)
	for _, in := range s.Inputs {
		exprs = append(exprs, in.Expr)
	}
	for _, k := range s.Keys {
		exprs = append(exprs, k.RowExpr())
	}
	if s.Range != nil {
		exprs = append(exprs, s.Range.D.Expr)
		for _, a := range s.Range.Also {
			exprs = append(exprs, a.D.Expr)
		}
	}
	for _, e := range exprs {
		for _, c := range model.Columns(e) {
			need[c.Table] = true
		}
	}
	for l := range pl.p.Moves {
		// the join of a calendar's copy reads the moved date
		if need[l.To] {
			need[l.From] = true
		}
	}
	var links []*model.Link
	for t := range need {
		for _, l := range reach[t] {
			if !slices.Contains(links, l) {
				links = append(links, l)
			}
		}
	}
	links = shortcut(links, need)
	// A shortcut joins a table from an earlier one on its path, so the
	// depth along the model's links still puts every join after the one
	// that reaches its own table.
	depth := func(l *model.Link) int { return len(reach[l.To]) }
	sort.Slice(links, func(i, j int) bool {
		if depth(links[i]) != depth(links[j]) {
			return depth(links[i]) < depth(links[j])
		}
		return links[i].To.Name < links[j].To.Name
	})
	s.Joins = links
	s.Inner = innerJoins(s)
}

// cautions notes results that could mislead.
func (pl *planner) cautions() {
	for _, s := range pl.p.Scans {
		for _, l := range s.Leaves {
			if l.Arg != nil && l.Arg.Expr.Type() == model.TypeFloat && (l.Func == "sum" || l.Func == "avg") {
				pl.p.Cautions = append(pl.p.Cautions, fmt.Sprintf(
					"%s adds float values: the last digits can change with the order the engine reads rows in; declare the column decimal for exact sums",
					l.Name))
			}
		}
	}
}

// linkTowards is a one-column link from table from to table to, or nil:
// the column whose distinct values are the rows of to that from's rows
// point at.
func linkTowards(from, to *model.Table) *model.Link {
	for _, l := range from.Links {
		if l.To == to && len(l.FromCols) == 1 {
			return l
		}
	}
	return nil
}
