package casegen

import (
	"fmt"
	"math"
	"slices"
	"strconv"

	"github.com/rollwise/rollwise/planner/reference/expect"
)

// Identity is a query over measures that must agree pairwise in every
// row: the identities of language.md, "Per-grain groups and NULL".
type Identity struct {
	Query Query
	// Pairs name two measures of Query that must be equal in each row,
	// and why.
	Pairs []IdentityPair
}

// IdentityPair is two measures that must be equal in every cell.
type IdentityPair struct {
	A, B, Rule string
}

// drawIdentity adds the measures of one identity to the model and
// returns it: for a column T.C (NULLs and unmatched links included) and a
// fresh sum m over a table that reaches it,
//
//	count(* per T.C) = count(distinct T.C)
//	sum(m per T.C having true) = sum(m per T.C) = m where T.C is not null
//
// in every cell of a query with random group columns, a filter and a
// totals mode.
func (g *gen) drawIdentity() (Identity, bool) {
	f := g.anyFact()
	cols := g.common([]*table{f}, func(c *column) bool { return c.groupable() })
	if len(cols) == 0 {
		return Identity{}, false
	}
	c := g.col(cols)
	arg, _, _ := g.rowNumber(f, false)
	m := "sum(" + arg + ")"
	per := " per " + c.ref()
	forms := []string{
		"count(*" + per + ")",
		"count(distinct " + c.ref() + ")",
		"sum(" + m + per + " having true)",
		"sum(" + m + per + ")",
		"(" + m + ") where " + c.ref() + " is not null",
	}
	names := make([]string, len(forms))
	for i, text := range forms {
		g.addMeasure(mx{text: text, kind: "num", exact: true, tables: []*table{f}, advanced: true})
		names[i] = g.measures[len(g.measures)-1].name
	}
	var q Query
	q.Measures = names
	if by := g.common([]*table{f, c.t}, func(c *column) bool { return c.groupable() }); len(by) > 0 {
		for i, n := 0, g.intn(0, 2); i < n; i++ {
			if ref := g.col(by).ref(); !slices.Contains(q.By, ref) {
				q.By = append(q.By, ref)
			}
		}
	}
	if g.chance(50) {
		q.Where = g.predicate([]*table{f, c.t})
	}
	q.Totals = []string{"none", "grand", "rollup", "all"}[g.pick(4)]
	rule := fmt.Sprintf("per-grain groups of %s skip NULL", c.ref())
	return Identity{Query: q, Pairs: []IdentityPair{
		{names[0], names[1], "count(* per T.C) = count(distinct T.C): " + rule},
		{names[2], names[3], "having true changes nothing: " + rule},
		{names[3], names[4], "sum(m per T.C) = m where T.C is not null: " + rule},
	}}, true
}

// CheckIdentity returns "" when every pair of id agrees in every row of
// rows (a query's JSON rows), or else the first row where one does not.
func CheckIdentity(id Identity, rows []map[string]any) string {
	for i, r := range rows {
		for _, p := range id.Pairs {
			if !expect.Same(r[p.A], r[p.B]) && !near(r[p.A], r[p.B]) {
				return fmt.Sprintf("row %d: %s = %v but %s = %v (%s)", i, p.A, r[p.A], p.B, r[p.B], p.Rule)
			}
		}
	}
	return ""
}

// near reports whether two numbers agree to a relative 1e-9: a sum of
// floats may add in another order on each side.
func near(a, b any) bool {
	x, errA := strconv.ParseFloat(fmt.Sprint(a), 64)
	y, errB := strconv.ParseFloat(fmt.Sprint(b), 64)
	return errA == nil && errB == nil && math.Abs(x-y) <= 1e-9*math.Max(1, math.Max(math.Abs(x), math.Abs(y)))
}
