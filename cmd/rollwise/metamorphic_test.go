package main

import (
	"encoding/json"
	"fmt"
	"slices"
	"strings"
	"testing"
	"time"

	"github.com/shopspring/decimal"
	"pgregory.net/rapid"

	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
	"github.com/rollwise/rollwise/planner/reference/casegen"
)

// Metamorphic checks of the SQL path that need no reference evaluator:
// queries whose results must relate to each other in a known way.

// sqlRows runs a query through the SQL path (as `rollwise run --format
// json` does). skip is true when the planner reports the query as not
// supported yet.
func (dc *diffOpened) sqlRows(q casegen.Query) (rows []map[string]any, pq *model.Query, skip bool, err error) {
	pq, diags := dc.m.NewQuery(model.Request{Measures: q.Measures, By: q.By, Where: q.Where,
		Totals: q.Totals, Order: q.Order, Limit: q.Limit})
	if diags.HasErrors() {
		return nil, nil, false, fmt.Errorf("the query does not resolve: %v", diags)
	}
	pl, pd := plan.NewPlan(pq)
	if pd.HasErrors() {
		for _, d := range pd.Errors() {
			if d.Code == "not-supported" {
				return nil, pq, true, nil
			}
		}
		return nil, pq, false, fmt.Errorf("the planner rejects the query: %v", pd)
	}
	tg := dc.duckdb()
	text, err := dialects.Render(pl, tg.d)
	if err != nil {
		return nil, pq, false, err
	}
	rows, err = dc.runSQL(tg, pq, pl, text)
	return rows, pq, false, err
}

// groupKey identifies a row by its values of the given groups. Time
// values are compared as instants, so that a date and a timestamp at its
// midnight (a date_trunc group in two queries) match.
func groupKey(r map[string]any, groups []string) string {
	var parts []string
	for _, g := range groups {
		parts = append(parts, fmt.Sprintf("%s=%v", g, instant(r[g])))
	}
	return strings.Join(parts, "|")
}

// instant writes a JSON date or time value as an RFC 3339 instant; other
// values are returned as they are.
func instant(v any) any {
	if s, ok := v.(string); ok {
		for _, layout := range []string{time.DateOnly, time.RFC3339Nano} {
			if t, err := time.Parse(layout, s); err == nil {
				return t.UTC().Format(time.RFC3339Nano)
			}
		}
	}
	return v
}

// metaKey identifies a result row: its group values and rolled-up list.
func metaKey(r map[string]any, groups []string) string {
	return groupKey(r, groups) + fmt.Sprintf("|%v", r["rolled_up"])
}

// TestMetamorphicPartition: for a filter P, additive measures over P, NOT
// P and P IS NULL recombine, cell by cell (totals included), to the
// unfiltered value: sum to sum, count to the sum of counts, min and max
// to themselves, avg to the sum of the sums over the sum of the counts.
func TestMetamorphicPartition(t *testing.T) {
	t.Parallel()
	checked := 0
	checkCases(t, 30, func(rt *rapid.T) {
		p := casegen.PartitionGenerator(casegen.DefaultOptions).Draw(rt, "case")
		dc := openCase(t, rt, p, p.Case)
		defer dc.close()
		var parts [][]map[string]any
		for _, q := range p.Queries {
			rows, _, skip, err := dc.sqlRows(q)
			if skip {
				return
			}
			if err != nil {
				if diffKnownBug(p.Case, q, err.Error()) != "" {
					return
				}
				rt.Fatalf("%s: %v\n%s", q.Command(casegen.ModelFile), err, p.Case)
			}
			parts = append(parts, rows)
		}
		if msg := checkPartition(p, parts[0], parts[1:]); msg != "" {
			if diffKnownBug(p.Case, p.Queries[0], msg) != "" {
				return
			}
			diffSave(t.Name(), p.Case, p.Queries[1])
			rt.Fatalf("%s\nfilters: %q\n\nthe case:\n%s", msg, p.Filters(), p.Case)
		}
		checked++
	})
	t.Logf("partitions checked: %d", checked)
}

// checkPartition compares the unfiltered rows with the recombined parts.
func checkPartition(p *casegen.Partition, all []map[string]any, parts [][]map[string]any) string {
	byKey := map[string][]map[string]any{}
	for _, rows := range parts {
		for _, r := range rows {
			k := metaKey(r, p.By)
			byKey[k] = append(byKey[k], r)
		}
	}
	keys := map[string]bool{}
	for _, r := range all {
		k := metaKey(r, p.By)
		keys[k] = true
		ps := byKey[k]
		if len(ps) == 0 {
			return fmt.Sprintf("row %s of the unfiltered query is in none of the parts", k)
		}
		sum, sumOK := decimal.Zero, false
		sumF := 0.0
		cnt := decimal.Zero
		var lo, hi *decimal.Decimal
		for _, x := range ps {
			if v, ok := metaNum(x[p.Sum]); ok {
				sum, sumOK, sumF = sum.Add(v), true, sumF+v.InexactFloat64()
			}
			if v, ok := metaNum(x[p.Count]); ok {
				cnt = cnt.Add(v)
			}
			if v, ok := metaNum(x[p.Min]); ok && (lo == nil || v.LessThan(*lo)) {
				lo = &v
			}
			if v, ok := metaNum(x[p.Max]); ok && (hi == nil || v.GreaterThan(*hi)) {
				hi = &v
			}
		}
		var wantSum, wantAvg any
		if sumOK {
			wantSum = json.Number(sum.String())
			if !cnt.IsZero() {
				wantAvg = json.Number(fmt.Sprint(sumF / cnt.InexactFloat64()))
			}
		}
		checks := []struct {
			name   string
			want   any
			approx bool
		}{
			{p.Sum, wantSum, !p.Exact},
			{p.Count, json.Number(cnt.String()), false},
			{p.Min, numOrNil(lo), !p.Exact},
			{p.Max, numOrNil(hi), !p.Exact},
			{p.Avg, wantAvg, true},
		}
		for _, c := range checks {
			if !diffSameJSON(r[c.name], c.want, c.approx) {
				return fmt.Sprintf("row %s: %s is %v unfiltered, but the parts recombine to %v (parts: %v)", k, c.name, r[c.name], c.want, ps)
			}
		}
	}
	for k := range byKey {
		if !keys[k] {
			return fmt.Sprintf("row %s of a part is not in the unfiltered query", k)
		}
	}
	return ""
}

func metaNum(v any) (decimal.Decimal, bool) {
	n, ok := v.(json.Number)
	if !ok {
		return decimal.Zero, false
	}
	d, err := decimal.NewFromString(n.String())
	return d, err == nil
}

func numOrNil(d *decimal.Decimal) any {
	if d == nil {
		return nil
	}
	return json.Number(d.String())
}

// TestMetamorphicTotals: a total row equals the same query with the
// rolled-up columns removed from --by (and no totals, order or limit):
// both are the measures evaluated in the same cell. Without --limit the
// total rows of each level are exactly the rows of that query; with it,
// some of them.
func TestMetamorphicTotals(t *testing.T) {
	t.Parallel()
	checked := 0
	checkCases(t, 30, func(rt *rapid.T) {
		c := casegen.Generator(casegen.DefaultOptions).Draw(rt, "case")
		dc := openCase(t, rt, c, c)
		defer dc.close()
		for _, q := range c.Queries {
			if len(q.By) == 0 || q.Totals == "none" {
				continue
			}
			msg, bugQuery := checkTotals(dc, q)
			if msg != "" {
				if diffKnownBug(c, bugQuery, msg) != "" || diffKnownBug(c, q, msg) != "" {
					continue
				}
				diffSave(t.Name(), c, q)
				rt.Fatalf("%s\nquery: %s\n\nthe case:\n%s", msg, q.Command(casegen.ModelFile), c)
			}
			checked++
		}
	})
	t.Logf("queries with totals checked: %d", checked)
}

// checkTotals compares each total row of q with the query that leaves
// its rolled-up columns out; it returns what differs and the query that
// showed it.
func checkTotals(dc *diffOpened, q casegen.Query) (string, casegen.Query) {
	rows, pq, skip, err := dc.sqlRows(q)
	if skip {
		return "", q
	}
	if err != nil {
		return err.Error(), q
	}
	sets := map[string][]map[string]any{}
	for _, r := range rows {
		rolled := fmt.Sprint(r["rolled_up"])
		if rolled != "[]" {
			sets[rolled] = append(sets[rolled], r)
		}
	}
	for rolled, totals := range sets {
		sub := casegen.Query{Measures: q.Measures, Where: q.Where, Totals: "none"}
		for _, g := range q.By {
			if !slices.Contains(totals[0]["rolled_up"].([]any), any(g)) {
				sub.By = append(sub.By, g)
			}
		}
		subRows, _, skip, err := dc.sqlRows(sub)
		if skip {
			continue
		}
		if err != nil {
			return err.Error(), sub
		}
		// --limit keeps only the totals of the kept detail rows' groups
		// (and the grand total): then the totals are a subset.
		if len(subRows) != len(totals) && (q.Limit == 0 || len(totals) > len(subRows)) {
			return fmt.Sprintf("%d total rows roll up %s, but the query by %v has %d rows", len(totals), rolled, sub.By, len(subRows)), sub
		}
		byKey := map[string]map[string]any{}
		for _, r := range subRows {
			byKey[groupKey(r, sub.By)] = r
		}
		for _, tr := range totals {
			k := groupKey(tr, sub.By)
			sr, ok := byKey[k]
			if !ok {
				return fmt.Sprintf("total row %s (rolled up %s) has no row in the query by %v", k, rolled, sub.By), sub
			}
			for _, m := range pq.Measures {
				got, want := tr[m.Name], sr[m.Name]
				if m.Type == model.TypeDate || m.Type == model.TypeTimestamp {
					// Compared as instants (see groupKey).
					got, want = instant(got), instant(want)
				}
				if !diffSameJSON(got, want, m.Type == model.TypeFloat) {
					return fmt.Sprintf("total row %s (rolled up %s): %s = %v, but the query by %v gives %v",
						k, rolled, m.Name, got, sub.By, want), sub
				}
			}
		}
	}
	return "", q
}
