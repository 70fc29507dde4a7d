package casegen

import (
	"slices"
	"strings"
)

// drawQuery draws a query over the model's measures: one to three
// measures, group columns every measure's iteration tables reach (none
// now and then), up to two filter conjuncts, a totals mode, and now and
// then an order on an exact measure and a limit. ok is false when the
// measures share no reachable column to group or filter by and no query
// can be made.
func (g *gen) drawQuery() (Query, bool) {
	var q Query
	var chosen []*measure
	var advanced []*measure
	for _, m := range g.measures {
		if m.advanced {
			advanced = append(advanced, m)
		}
	}
	for n := g.intn(1, 3); len(chosen) < n; {
		m := g.measures[g.pick(len(g.measures))]
		if len(advanced) > 0 && len(chosen) == 0 && g.chance(60) {
			m = advanced[g.pick(len(advanced))]
		}
		if slices.Contains(chosen, m) {
			if len(chosen) >= len(g.measures) {
				break
			}
			continue
		}
		chosen = append(chosen, m)
	}
	var tables []*table
	for _, m := range chosen {
		q.Measures = append(q.Measures, m.name)
		tables = union(tables, m.tables)
	}
	cols := g.common(tables, func(c *column) bool { return c.groupable() })
	n := g.intn(0, 3)
	if n == 0 && g.chance(50) {
		n = 1
	}
	for i := 0; i < n && len(cols) > 0; i++ {
		c := g.col(cols)
		ref := c.ref()
		if !slices.Contains(q.By, ref) {
			q.By = append(q.By, ref)
		}
	}
	var where []string
	for i, nf := 0, g.intn(0, 2); i < nf; i++ {
		where = append(where, g.predicate(tables))
	}
	switch {
	case len(where) == 1:
		q.Where = where[0]
	case len(where) > 1:
		// Each conjunct is its own -w: the command line must combine them
		// (it once kept only the last).
		q.Filters = where
		q.Where = "(" + strings.Join(where, ") and (") + ")"
	}
	q.Totals = []string{"none", "grand", "rollup", "all"}[g.pick(4)]
	if g.chance(30) {
		// One to three keys among the exact measures and the groups.
		var cands []string
		for _, m := range chosen {
			if m.exact && m.kind == "num" && !slices.Contains(cands, m.name) {
				cands = append(cands, m.name)
			}
		}
		cands = append(cands, q.By...)
		var keys []string
		for i, nk := 0, g.intn(1, 3); i < nk && len(cands) > 0; i++ {
			j := g.pick(len(cands))
			key := cands[j]
			cands = slices.Delete(cands, j, j+1)
			if g.chance(50) {
				key += " desc"
			}
			keys = append(keys, key)
		}
		q.Order = strings.Join(keys, ", ")
	}
	if g.chance(20) {
		q.Limit = g.intn(1, 4)
	}
	return q, true
}
