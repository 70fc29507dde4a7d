package casegen

import (
	"regexp"
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
	if d := g.windowDate(chosen); d != nil && slices.Contains(cols, d) && g.chance(60) {
		// A time report: grouped by the month (or the day) of a window
		// edit's or a back's date, no total rows, now and then a second
		// group: the shape the SQL path computes over the report's cells
		// (a back also with total rows).
		q.By = []string{d.ref()}
		if m := d.t.col("month"); m != nil && g.chance(60) {
			q.By[0] = m.ref()
		}
		if len(cols) > 0 && g.chance(40) {
			if c := g.col(cols); !slices.Contains(q.By, c.ref()) {
				q.By = append(q.By, c.ref())
			}
		}
		if g.chance(70) {
			q.Totals = "none"
		}
	}
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

// windowDate is a date column that a window edit (running, to date) or
// a back of the chosen measures, or of the measures they read, moves;
// nil if none.
func (g *gen) windowDate(chosen []*measure) *column {
	var text strings.Builder
	seen := map[*measure]bool{}
	var read func(m *measure)
	read = func(m *measure) {
		if seen[m] {
			return
		}
		seen[m] = true
		text.WriteString(m.text + "\n")
		for _, o := range g.measures {
			if regexp.MustCompile(`\b` + o.name + `\b`).MatchString(m.text) {
				read(o)
			}
		}
	}
	for _, m := range chosen {
		read(m)
	}
	for _, t := range g.tables {
		for _, d := range g.dateCols(t.cols) {
			if strings.Contains(text.String(), d.ref()+" running") || strings.Contains(text.String(), d.ref()+" to date") ||
				strings.Contains(text.String(), d.ref()+" back ") {
				return d
			}
		}
	}
	return nil
}
