package main

import (
	"testing"

	"pgregory.net/rapid"

	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
	"github.com/rollwise/rollwise/planner/reference/casegen"
)

// Per-grain groups and NULL (language.md, "Per-grain groups and NULL";
// issue 13, bug 2 and rule 5) on testdata/exec/pergrain.roll:
//
//	customers: 1 East, 2 East, 3 West, 4 West (3 and 4 have no orders)
//	orders:    id customer amount  region (through the link)
//	           1  1        10      East
//	           2  1        20      East
//	           3  2         5      East
//	           4  NULL      7      (null: no customer id)
//	           5  9         3      (null: no customer 9)
const pergrainModel = "../../testdata/exec/pergrain.roll"

// A having that reads no table once planned an empty CTE that the engine
// refused; and a having once let the NULL customer id count as a group.
func TestPerGrainHavingTrueChangesNothing(t *testing.T) {
	t.Parallel()
	got := runJSON(t, "run", pergrainModel, "-m", "buyers,buyers_any,buyer_ids", "-b", "customers.region", "--totals", "grand")
	expectRows(t, got, []row{
		{"customers.region": "East", "buyers": 2, "buyers_any": 2, "buyer_ids": 2},                                         // customers 1, 2
		{"customers.region": nil, "buyers": 1, "buyers_any": 1, "buyer_ids": 1},                                            // 9 (the NULL id is no group)
		{"customers.region": nil, "buyers": 3, "buyers_any": 3, "buyer_ids": 3, "rolled_up": []string{"customers.region"}}, // 1, 2, 9
	})
}

// sum(m per T.C) = m where T.C is not null, with or without having: the
// order without a customer id (7) is in no group. Before, known_any
// counted it: 45 in all and 10 (7 + 3) in the NULL region.
func TestPerGrainSkipsNullGroups(t *testing.T) {
	t.Parallel()
	got := runJSON(t, "run", pergrainModel, "-m", "known_amount,known_any,known_where,amount", "-b", "customers.region", "--totals", "grand")
	expectRows(t, got, []row{
		{"customers.region": "East", "known_amount": 35, "known_any": 35, "known_where": 35, "amount": 35}, // 10 + 20 + 5
		{"customers.region": nil, "known_amount": 3, "known_any": 3, "known_where": 3, "amount": 10},       // customer 9: 3; 7 has no customer id
		{"customers.region": nil, "known_amount": 38, "known_any": 38, "known_where": 38, "amount": 45, "rolled_up": []string{"customers.region"}},
	})
}

// The groups of a having do not depend on the tables it reads: every
// customer of the cell counts, those without orders too (n_orders = 0).
// Before, the groups came from the orders (the having's table): the West
// customers were missed and the NULL customer id was counted (3 in all,
// not 4). big_buyers counted the NULL id's 7 > 4 as a group (3, not 2).
func TestPerGrainHavingGroupsFromPerColumns(t *testing.T) {
	t.Parallel()
	got := runJSON(t, "run", pergrainModel, "-m", "every_customer,big_buyers", "-b", "customers.region", "--totals", "grand")
	expectRows(t, got, []row{
		{"customers.region": "East", "every_customer": 2, "big_buyers": 2}, // 1 (30), 2 (5)
		{"customers.region": "West", "every_customer": 2, "big_buyers": 0}, // 3, 4; no orders
		{"customers.region": nil, "every_customer": 0, "big_buyers": 0},    // no customer in no region; 9 has 3
		{"customers.region": nil, "every_customer": 4, "big_buyers": 2, "rolled_up": []string{"customers.region"}},
	})
}

// The identities of per-grain groups and NULL hold in every cell of the
// SQL path's result, on random models (casegen.Identity): count(* per
// T.C) = count(distinct T.C), having true changes nothing, and sum(m per
// T.C) = m where T.C is not null. The default budget is small (20 cases);
// -rapid.checks raises it.
func TestPerGrainIdentities(t *testing.T) {
	t.Parallel()
	o := casegen.DefaultOptions
	o.Identities, o.Queries = true, 0
	checkCases(t, 20, func(rt *rapid.T) {
		c := casegen.Generator(o).Draw(rt, "case")
		dir := t.TempDir()
		if err := c.Write(dir); err != nil {
			rt.Fatal(err)
		}
		dc, err := diffOpen(dir)
		if err != nil {
			rt.Fatalf("%v\n\nthe case:\n%s", err, c)
		}
		defer dc.close()
		for _, id := range c.Identities {
			q := id.Query
			pq, diags := dc.m.NewQuery(model.Request{Measures: q.Measures, By: q.By, Where: q.Where, Totals: q.Totals})
			if diags.HasErrors() {
				rt.Fatalf("%v\n\nthe case:\n%s", diags, c)
			}
			plan, pd := plan.NewPlan(pq)
			if pd.HasErrors() {
				rt.Fatalf("%v\n\nthe case:\n%s", pd, c)
			}
			text, err := dialects.Render(plan, dc.duckdb().d)
			if err != nil {
				rt.Fatal(err)
			}
			rows, err := dc.runSQL(dc.duckdb(), pq, plan, text)
			if err != nil {
				rt.Fatalf("%v\n\nthe case:\n%s", err, c)
			}
			if msg := casegen.CheckIdentity(id, rows); msg != "" {
				rt.Fatalf("%s\nquery: %s\n\nthe case:\n%s", msg, q.Command(casegen.ModelFile), c)
			}
		}
	})
}

// Filters are keyed by their text, which once printed a.`b.c` and
// `a.b`.c alike (a.b.c): both measures got the number of the first -m
// (issue 13, bug 4). testdata/exec/lookalike.roll:
//
//	a: id b.c ref x      a.b: id c
//	   1  1   1   10         1  2
//	   2  2   2   20         2  1
//	   3  1   2   40
//
// m1 = x where a.`b.c` = 1: rows 1, 3: 10 + 40 = 50; m2 = x where
// `a.b`.c = 1: rows whose ref is 2: 20 + 40 = 60; in either order.
func TestLookalikeNamesKeepTheirFilters(t *testing.T) {
	t.Parallel()
	const model = "../../testdata/exec/lookalike.roll"
	for _, ms := range []string{"m1,m2", "m2,m1"} {
		got := runJSON(t, "run", model, "-m", ms)
		expectRows(t, got, []row{{"m1": 50, "m2": 60}})
	}
}
