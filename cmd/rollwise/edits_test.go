package main

import "testing"

// Cell edits and per-grain measures (testdata/exec/edits.roll) on the shop
// rows listed in exec_test.go. Per store, revenue is: store 1 (North,
// Hills) 20 = rose 10 + fern 10; store 2 (North, Coast) 5 = rose; store 3
// (South, Coast) 15 = tulip 12 + rose 3; store 9 (no store row) 20 = fern.
// By item over all rows: fern 30, rose 18, tulip 12; total 60.

const editsModel = "../../testdata/exec/edits.roll"

func runEdits(t *testing.T, args ...string) []map[string]any {
	t.Helper()
	return runJSON(t, append([]string{"run", shopModel, editsModel}, args...)...)
}

// Every edit form at the detail rows and each rollup level, with a filter
// on the edited column (sales.item <> 'tulip' keeps rows 1, 2, 3, 5, 6).
func TestEditsRollupFilterOnEditedColumn(t *testing.T) {
	t.Parallel()
	got := runEdits(t, "-m", "revenue,item_share,shown_share,rose_rev,all_rev,shown_rev,store_avg,big_stores",
		"-b", "stores.region,sales.item", "--totals", "rollup", "-w", "sales.item <> 'tulip'")
	item := []string{"sales.item"}
	expectRows(t, got, []row{
		// item_share drops the item filter too: North has no tulip, so 10/25.
		{"stores.region": "North", "sales.item": "fern", "revenue": "10", "item_share": 0.4, "shown_share": 0.4,
			"rose_rev": "15", "all_rev": "60", "shown_rev": "48", "store_avg": 10.0, "big_stores": 0, "rolled_up": none},
		// store_avg: store 1 rose 10, store 2 rose 5: (10+5)/2.
		{"stores.region": "North", "sales.item": "rose", "revenue": "15", "item_share": 0.6, "shown_share": 0.6,
			"rose_rev": "15", "all_rev": "60", "shown_rev": "48", "store_avg": 7.5, "big_stores": 0},
		// subtotal re-evaluated: stores 1 (20) and 2 (5): avg 12.5; one store over 12.
		{"stores.region": "North", "sales.item": nil, "revenue": "25", "item_share": 1.0, "shown_share": 1.0,
			"rose_rev": "15", "all_rev": "60", "shown_rev": "48", "store_avg": 12.5, "big_stores": 1, "rolled_up": item},
		// item_share: South over all its items, tulip included: 3/15; shown_share: 3/3.
		{"stores.region": "South", "sales.item": "rose", "revenue": "3", "item_share": 0.2, "shown_share": 1.0,
			"rose_rev": "3", "all_rev": "60", "shown_rev": "48", "store_avg": 3.0, "big_stores": 0},
		{"stores.region": "South", "sales.item": nil, "revenue": "3", "item_share": 0.2, "shown_share": 1.0,
			"rose_rev": "3", "all_rev": "60", "shown_rev": "48", "store_avg": 3.0, "big_stores": 0, "rolled_up": item},
		// the unmatched line: no rose there, so rose_rev is null.
		{"stores.region": nil, "sales.item": "fern", "revenue": "20", "item_share": 1.0, "shown_share": 1.0,
			"rose_rev": nil, "all_rev": "60", "shown_rev": "48", "store_avg": 20.0, "big_stores": 1, "rolled_up": none},
		{"stores.region": nil, "sales.item": nil, "revenue": "20", "item_share": 1.0, "shown_share": 1.0,
			"rose_rev": nil, "all_rev": "60", "shown_rev": "48", "store_avg": 20.0, "big_stores": 1, "rolled_up": item},
		// grand total: 48 of 60; stores 1 (20), 2 (5), 3 (3), 9 (20): avg 12, two over 12.
		{"stores.region": nil, "sales.item": nil, "revenue": "48", "item_share": 0.8, "shown_share": 1.0,
			"rose_rev": "18", "all_rev": "60", "shown_rev": "48", "store_avg": 12.0, "big_stores": 2,
			"rolled_up": []string{"stores.region", "sales.item"}},
	})
}

// --totals all with a filter on another column (stores.region = 'North',
// rows 1, 2, 3). region_share and no_store drop that filter; item_share
// and rose_rev keep it.
func TestEditsAllTotalsFilterOnOtherColumn(t *testing.T) {
	t.Parallel()
	got := runEdits(t, "-m", "revenue,item_share,region_share,rose_rev,no_store,store_avg,best_region",
		"-b", "stores.region,sales.item", "--totals", "all", "-w", "stores.region = 'North'")
	expectRows(t, got, []row{
		// region_share: fern everywhere is 10+20: 10/30. no_store: 30.
		{"stores.region": "North", "sales.item": "fern", "revenue": "10", "item_share": 0.4, "region_share": 10.0 / 30,
			"rose_rev": "15", "no_store": "30", "store_avg": 10.0, "best_region": "10"},
		// rose everywhere 10+5+3 = 18.
		{"stores.region": "North", "sales.item": "rose", "revenue": "15", "item_share": 0.6, "region_share": 15.0 / 18,
			"rose_rev": "15", "no_store": "18", "store_avg": 7.5, "best_region": "15"},
		{"stores.region": "North", "sales.item": nil, "revenue": "25", "item_share": 1.0, "region_share": 25.0 / 60,
			"rose_rev": "15", "no_store": "60", "store_avg": 12.5, "best_region": "25"},
		{"stores.region": nil, "sales.item": "fern", "revenue": "10", "item_share": 0.4, "region_share": 10.0 / 30,
			"rose_rev": "15", "no_store": "30", "store_avg": 10.0, "best_region": "10", "rolled_up": []string{"stores.region"}},
		{"stores.region": nil, "sales.item": "rose", "revenue": "15", "item_share": 0.6, "region_share": 15.0 / 18,
			"rose_rev": "15", "no_store": "18", "store_avg": 7.5, "best_region": "15"},
		{"stores.region": nil, "sales.item": nil, "revenue": "25", "item_share": 1.0, "region_share": 25.0 / 60,
			"rose_rev": "15", "no_store": "60", "store_avg": 12.5, "best_region": "25"},
	})
}

// A pinned measure grouped by its own column shows the pinned value on
// every row and at the total.
func TestPinGroupedByItsOwnColumn(t *testing.T) {
	t.Parallel()
	got := runEdits(t, "-m", "rose_rev,rose_fern,store_total_avg", "-b", "sales.item", "--totals", "grand")
	expectRows(t, got, []row{
		// store_total_avg: stores selling fern (1, 9) at their all-item revenue: (20+20)/2.
		{"sales.item": "fern", "rose_rev": "18", "rose_fern": "48", "store_total_avg": 20.0},                                   // roses 10+5+3; 18+30
		{"sales.item": "rose", "rose_rev": "18", "rose_fern": "48", "store_total_avg": 40.0 / 3},                               // stores 1, 2, 3: 20+5+15
		{"sales.item": "tulip", "rose_rev": "18", "rose_fern": "48", "store_total_avg": 15.0},                                  // store 3
		{"sales.item": nil, "rose_rev": "18", "rose_fern": "48", "store_total_avg": 15.0, "rolled_up": []string{"sales.item"}}, // 60/4
	})
}

// Under a filter on the edited column the two shares differ, and both are
// right: of everything (drop) and of what the query keeps (ungroup).
func TestShareOfEverythingAndOfWhatIsShown(t *testing.T) {
	t.Parallel()
	got := runEdits(t, "-m", "revenue,item_share,shown_share", "-b", "sales.item", "-w", "sales.item in ('rose', 'fern')", "--totals", "grand")
	expectRows(t, got, []row{
		{"sales.item": "fern", "revenue": "30", "item_share": 0.5, "shown_share": 0.625}, // 30/60; 30/48
		{"sales.item": "rose", "revenue": "18", "item_share": 0.3, "shown_share": 0.375}, // 18/60; 18/48
		{"sales.item": nil, "revenue": "48", "item_share": 0.8, "shown_share": 1.0},      // 48/60; 48/48
	})
}

// Per-grain totals are re-evaluated over the whole total cell, never
// averaged or added from the rows; edits and narrowings nest both ways.
func TestPerGrainAndNestingAtTotals(t *testing.T) {
	t.Parallel()
	got := runEdits(t, "-m", "store_avg,big_stores,store_items,item_avg,big_items,fee_share,north_share,north_everywhere,dropped_north,chain_store_avg",
		"-b", "stores.region", "--totals", "grand")
	expectRows(t, got, []row{
		// items per store: store 1 {rose, fern} 2, store 2 {rose} 1. item_avg: fern 10, rose 15.
		// big_items (> 16): none in North. fee_share 30/105.5. north_share 25/60.
		{"stores.region": "North", "store_avg": 12.5, "big_stores": 1, "store_items": 3, "item_avg": 12.5, "big_items": 0,
			"fee_share": 30 / 105.5, "north_share": 25.0 / 60, "north_everywhere": "25", "dropped_north": "60", "chain_store_avg": 15.0},
		// store 3: 15, items {tulip, rose}. item_avg: tulip 12, rose 3. North revenue in a South cell: none.
		{"stores.region": "South", "store_avg": 15.0, "big_stores": 1, "store_items": 2, "item_avg": 7.5, "big_items": 0,
			"fee_share": 75.5 / 105.5, "north_share": nil, "north_everywhere": "25", "dropped_north": "60", "chain_store_avg": 15.0},
		// store 9: fern 20 > 16. No repairs there.
		{"stores.region": nil, "store_avg": 20.0, "big_stores": 1, "store_items": 1, "item_avg": 20.0, "big_items": 1,
			"fee_share": nil, "north_share": nil, "north_everywhere": "25", "dropped_north": "60", "chain_store_avg": 15.0, "rolled_up": none},
		// total: stores 20, 5, 15, 20: avg 15 (the rows' avgs average 15.83); over 12: stores 1, 3, 9;
		// items 2+1+2+1; item_avg: fern 30, rose 18, tulip 12: 20; over 16: fern and rose (the rows add to 1).
		{"stores.region": nil, "store_avg": 15.0, "big_stores": 3, "store_items": 6, "item_avg": 20.0, "big_items": 2,
			"fee_share": 1.0, "north_share": 25.0 / 60, "north_everywhere": "25", "dropped_north": "60", "chain_store_avg": 15.0,
			"rolled_up": []string{"stores.region"}},
	})
}

// An edit on a column reached through two links (sales -> stores -> districts).
func TestEditThroughTwoLinks(t *testing.T) {
	t.Parallel()
	got := runEdits(t, "-m", "revenue,area_share", "-b", "districts.area", "--totals", "grand")
	expectRows(t, got, []row{
		{"districts.area": "Coast", "revenue": "20", "area_share": 20.0 / 60}, // rows 3, 4, 5: 5+12+3
		{"districts.area": "Hills", "revenue": "20", "area_share": 20.0 / 60}, // rows 1, 2
		{"districts.area": nil, "revenue": "20", "area_share": 20.0 / 60},     // the unmatched line
		{"districts.area": nil, "revenue": "60", "area_share": 1.0, "rolled_up": []string{"districts.area"}},
	})
}

// Without a filter, drop, ungroup and pin of a group column are computed
// as windows over the report's own cells (no second read of the table):
// the same hand-worked values must come out.
func TestEditsAsWindows(t *testing.T) {
	t.Parallel()
	got := runEdits(t, "-m", "revenue,item_share,shown_share,rose_rev,region_share", "-b", "stores.region,sales.item", "--totals", "rollup")
	expectRows(t, got, []row{
		{"stores.region": "North", "sales.item": "fern", "revenue": "10", "item_share": 0.4, "shown_share": 0.4, "rose_rev": "15", "region_share": 10.0 / 30}, // fern: 10+20
		{"stores.region": "North", "sales.item": "rose", "revenue": "15", "item_share": 0.6, "shown_share": 0.6, "rose_rev": "15", "region_share": 15.0 / 18}, // rose: 10+5+3
		{"stores.region": "North", "sales.item": nil, "revenue": "25", "item_share": 1.0, "shown_share": 1.0, "rose_rev": "15", "region_share": 25.0 / 60},
		{"stores.region": "South", "sales.item": "rose", "revenue": "3", "item_share": 0.2, "shown_share": 0.2, "rose_rev": "3", "region_share": 3.0 / 18}, // 3/15
		{"stores.region": "South", "sales.item": "tulip", "revenue": "12", "item_share": 0.8, "shown_share": 0.8, "rose_rev": "3", "region_share": 1.0},    // 12/15; 12/12
		{"stores.region": "South", "sales.item": nil, "revenue": "15", "item_share": 1.0, "shown_share": 1.0, "rose_rev": "3", "region_share": 0.25},       // 15/60
		{"stores.region": nil, "sales.item": "fern", "revenue": "20", "item_share": 1.0, "shown_share": 1.0, "rose_rev": nil, "region_share": 20.0 / 30},
		{"stores.region": nil, "sales.item": nil, "revenue": "20", "item_share": 1.0, "shown_share": 1.0, "rose_rev": nil, "region_share": 20.0 / 60},
		{"stores.region": nil, "sales.item": nil, "revenue": "60", "item_share": 1.0, "shown_share": 1.0, "rose_rev": "18", "region_share": 1.0},
	})
}

// Negations are pushed inward before a filter is split into conjuncts
// (issue 13, rule 7), so that two equivalent filters give one value. The
// kept lines: North roses, 10 + 5 = 15. item_share divides by revenue
// with sales.item dropped: only the conjunct not (item = fern) goes, and
// region <> South keeps the North lines, 10 + 10 + 5 = 25: 15 / 25 = 0.6.
// Before, not (a or b) was one conjunct that the drop removed whole:
// 15 / 60 = 0.25.
func TestNegatedFilterSplitsLikeItsEquivalent(t *testing.T) {
	t.Parallel()
	for _, w := range []string{
		"not (sales.item = 'fern' or stores.region = 'South')",
		"not sales.item = 'fern' and not stores.region = 'South'",
	} {
		got := runEdits(t, "-m", "revenue,item_share", "-w", w)
		expectRows(t, got, []row{{"revenue": "15.00", "item_share": 0.6}})
	}
}
