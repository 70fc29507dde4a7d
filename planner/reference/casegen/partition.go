package casegen

import "pgregory.net/rapid"

// Partition is a case for the partition check, which needs no reference:
// additive measures over one row expression X of an iteration table,
// and a row predicate P. For every cell, the measures under P, under
// NOT P and under P IS NULL recombine to the unfiltered value: sums add
// up, counts add up, min and max are the min and max of the parts, avg
// is the sum of the sums over the sum of the counts.
type Partition struct {
	*Case
	// Sum, Count, Min, Max and Avg name the measures sum(X), count(X),
	// min(X), max(X) and avg(X).
	Sum, Count, Min, Max, Avg string
	// Exact is false when X is a float (sums are then compared within a
	// tolerance).
	Exact bool
	// Pred is P; By and Totals shape the queries.
	Pred   string
	By     []string
	Totals string
}

// Filters are the four --where texts of the check: none, P, NOT P and
// P IS NULL.
func (p *Partition) Filters() []string {
	return []string{"", p.Pred, "not (" + p.Pred + ")", "(" + p.Pred + ") is null"}
}

// Query is the check's query under one filter.
func (p *Partition) Query(where string) Query {
	return Query{Measures: []string{p.Sum, p.Count, p.Min, p.Max, p.Avg}, By: p.By, Where: where, Totals: p.Totals}
}

// PartitionGenerator draws partition cases.
func PartitionGenerator(o Options) *rapid.Generator[*Partition] {
	return rapid.Custom(func(t *rapid.T) *Partition {
		g := &gen{t: t, o: o}
		g.drawSchema()
		g.drawData()
		f := g.anyFact()
		x, exact, _ := g.rowNumber(f, false)
		p := &Partition{Exact: exact, Pred: g.predicate([]*table{f})}
		for _, fn := range []string{"sum", "count", "min", "max", "avg"} {
			g.addMeasure(mx{text: fn + "(" + x + ")", kind: "num", tables: []*table{f}})
		}
		ms := g.measures
		p.Sum, p.Count, p.Min, p.Max, p.Avg = ms[0].name, ms[1].name, ms[2].name, ms[3].name, ms[4].name
		cols := g.common([]*table{f}, func(c *column) bool { return c.groupable() })
		for n := g.intn(0, 2); len(p.By) < n && len(cols) > 0; {
			ref := cols[g.pick(len(cols))].ref()
			if len(p.By) > 0 && p.By[0] == ref {
				break
			}
			p.By = append(p.By, ref)
		}
		p.Totals = []string{"none", "grand", "rollup", "all"}[g.pick(4)]
		p.Case = &Case{Model: g.modelText(), Data: map[string]string{}, Advanced: map[string]bool{}}
		for _, t := range g.tables {
			p.Case.Data[t.name] = t.csv()
		}
		for _, w := range p.Filters() {
			p.Case.Queries = append(p.Case.Queries, p.Query(w))
		}
		return p
	})
}
