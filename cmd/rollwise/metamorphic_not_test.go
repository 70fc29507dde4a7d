package main

import (
	"strings"
	"testing"

	"pgregory.net/rapid"

	"github.com/rollwise/rollwise/planner/reference/casegen"
)

// TestMetamorphicNegatedFilters: a filter of conjuncts A and B and its
// negated spelling not ((not A) or (not B)) give the same report, with
// every edit of the measures: an edit that drops A's column removes A
// from both, never B with it (issue 13, rule 7: negations are pushed
// inward before a filter is split into conjuncts). The SQL path and the
// reference evaluator share that splitting, so the differential tests
// cannot see it; this property compares the SQL path with itself.
func TestMetamorphicNegatedFilters(t *testing.T) {
	t.Parallel()
	checked := 0
	checkCases(t, 20, func(rt *rapid.T) {
		c := casegen.Generator(casegen.DefaultOptions).Draw(rt, "case")
		dc := openCase(t, rt, c, c)
		defer dc.close()
		for _, q := range c.Queries {
			if len(q.Filters) < 2 {
				continue
			}
			neg := q
			var nots []string
			for _, f := range q.Filters {
				nots = append(nots, "(not ("+f+"))")
			}
			neg.Filters, neg.Where = nil, "not ("+strings.Join(nots, " or ")+")"
			want, pq, skip, err := dc.sqlRows(q)
			if skip {
				continue
			}
			if err != nil {
				rt.Fatalf("%v\nquery: %s\n\nthe case:\n%s", err, q.Command(casegen.ModelFile), c)
			}
			got, _, skip, err := dc.sqlRows(neg)
			if err != nil || skip {
				rt.Fatalf("the negated spelling: %v (not supported: %v)\nquery: %s\n\nthe case:\n%s", err, skip, neg.Command(casegen.ModelFile), c)
			}
			if msg := diffRows(pq, got, want, true); msg != "" {
				diffSave(t.Name(), c, neg)
				rt.Fatalf("%s\nquery: %s\nits negated spelling: %s\n\nthe case:\n%s", msg, q.Command(casegen.ModelFile), neg.Command(casegen.ModelFile), c)
			}
			checked++
		}
	})
	t.Logf("queries with two filters checked: %d", checked)
}
