package expect

// editsModel adds cell edits and per-grain measures (testdata/exec/edits.roll)
// to the shop (see shopModel for its rows). Per store, revenue is: store 1
// (North, Hills) 20 = rose 10 + fern 10; store 2 (North, Coast) 5 = rose;
// store 3 (South, Coast) 15 = tulip 12 + rose 3; store 9 (no store row)
// 20 = fern. By item over all rows: fern 30, rose 18, tulip 12; total 60.
var editsModel = []string{"testdata/exec/shop.roll", "testdata/exec/edits.roll"}

// shopEditsModel adds the measures of testdata/exec/shop_edits.roll to
// the shop: drop, ungroup and pin under a filter, per-grain groups and
// NULL groups.
var shopEditsModel = []string{"testdata/exec/shop.roll", "testdata/exec/shop_edits.roll"}

// editCases are the hand-worked cases of cell edits and per-grain measures.
var editCases = []Case{
	// Every edit form at the detail rows and each rollup level, with a filter
	// on the edited column (sales.item <> 'tulip' keeps rows 1, 2, 3, 5, 6).
	{Name: "edits, rollup, filter on the edited column", Models: editsModel,
		Measures: "revenue,item_share,shown_share,rose_rev,all_rev,shown_rev,store_avg,big_stores",
		By:       "stores.region,sales.item", Totals: "rollup", Where: "sales.item <> 'tulip'",
		Rows: []Row{
			// item_share drops the item filter too: North has no tulip, so 10/25.
			{"stores.region": "North", "sales.item": "fern", "revenue": "10", "item_share": 0.4, "shown_share": 0.4,
				"rose_rev": "15", "all_rev": "60", "shown_rev": "48", "store_avg": 10.0, "big_stores": 0, "rolled_up": None},
			// store_avg: store 1 rose 10, store 2 rose 5: (10+5)/2.
			{"stores.region": "North", "sales.item": "rose", "revenue": "15", "item_share": 0.6, "shown_share": 0.6,
				"rose_rev": "15", "all_rev": "60", "shown_rev": "48", "store_avg": 7.5, "big_stores": 0},
			// subtotal re-evaluated: stores 1 (20) and 2 (5): avg 12.5; one store over 12.
			{"stores.region": "North", "sales.item": nil, "revenue": "25", "item_share": 1.0, "shown_share": 1.0,
				"rose_rev": "15", "all_rev": "60", "shown_rev": "48", "store_avg": 12.5, "big_stores": 1, "rolled_up": total("sales.item")},
			// item_share: South over all its items, tulip included: 3/15; shown_share: 3/3.
			{"stores.region": "South", "sales.item": "rose", "revenue": "3", "item_share": 0.2, "shown_share": 1.0,
				"rose_rev": "3", "all_rev": "60", "shown_rev": "48", "store_avg": 3.0, "big_stores": 0},
			{"stores.region": "South", "sales.item": nil, "revenue": "3", "item_share": 0.2, "shown_share": 1.0,
				"rose_rev": "3", "all_rev": "60", "shown_rev": "48", "store_avg": 3.0, "big_stores": 0, "rolled_up": total("sales.item")},
			// the unmatched line: no rose there, so rose_rev is null.
			{"stores.region": nil, "sales.item": "fern", "revenue": "20", "item_share": 1.0, "shown_share": 1.0,
				"rose_rev": nil, "all_rev": "60", "shown_rev": "48", "store_avg": 20.0, "big_stores": 1, "rolled_up": None},
			{"stores.region": nil, "sales.item": nil, "revenue": "20", "item_share": 1.0, "shown_share": 1.0,
				"rose_rev": nil, "all_rev": "60", "shown_rev": "48", "store_avg": 20.0, "big_stores": 1, "rolled_up": total("sales.item")},
			// grand total: 48 of 60; stores 1 (20), 2 (5), 3 (3), 9 (20): avg 12, two over 12.
			{"stores.region": nil, "sales.item": nil, "revenue": "48", "item_share": 0.8, "shown_share": 1.0,
				"rose_rev": "18", "all_rev": "60", "shown_rev": "48", "store_avg": 12.0, "big_stores": 2,
				"rolled_up": total("stores.region", "sales.item")},
		}},
	// --totals all with a filter on another column (stores.region = 'North',
	// rows 1, 2, 3). region_share and no_store drop that filter; item_share
	// and rose_rev keep it.
	{Name: "edits, all totals, filter on another column", Models: editsModel,
		Measures: "revenue,item_share,region_share,rose_rev,no_store,store_avg,best_region",
		By:       "stores.region,sales.item", Totals: "all", Where: "stores.region = 'North'",
		Rows: []Row{
			// region_share: fern everywhere is 10+20: 10/30. no_store: 30.
			{"stores.region": "North", "sales.item": "fern", "revenue": "10", "item_share": 0.4, "region_share": 10.0 / 30,
				"rose_rev": "15", "no_store": "30", "store_avg": 10.0, "best_region": "10"},
			// rose everywhere 10+5+3 = 18.
			{"stores.region": "North", "sales.item": "rose", "revenue": "15", "item_share": 0.6, "region_share": 15.0 / 18,
				"rose_rev": "15", "no_store": "18", "store_avg": 7.5, "best_region": "15"},
			{"stores.region": "North", "sales.item": nil, "revenue": "25", "item_share": 1.0, "region_share": 25.0 / 60,
				"rose_rev": "15", "no_store": "60", "store_avg": 12.5, "best_region": "25"},
			{"stores.region": nil, "sales.item": "fern", "revenue": "10", "item_share": 0.4, "region_share": 10.0 / 30,
				"rose_rev": "15", "no_store": "30", "store_avg": 10.0, "best_region": "10", "rolled_up": total("stores.region")},
			{"stores.region": nil, "sales.item": "rose", "revenue": "15", "item_share": 0.6, "region_share": 15.0 / 18,
				"rose_rev": "15", "no_store": "18", "store_avg": 7.5, "best_region": "15"},
			{"stores.region": nil, "sales.item": nil, "revenue": "25", "item_share": 1.0, "region_share": 25.0 / 60,
				"rose_rev": "15", "no_store": "60", "store_avg": 12.5, "best_region": "25"},
		}},
	// A pinned measure grouped by its own column shows the pinned value on
	// every row and at the total.
	{Name: "pin grouped by its own column", Models: editsModel, Measures: "rose_rev,rose_fern,store_total_avg", By: "sales.item", Totals: "grand",
		Rows: []Row{
			// store_total_avg: stores selling fern (1, 9) at their all-item revenue: (20+20)/2.
			{"sales.item": "fern", "rose_rev": "18", "rose_fern": "48", "store_total_avg": 20.0},                                // roses 10+5+3; 18+30
			{"sales.item": "rose", "rose_rev": "18", "rose_fern": "48", "store_total_avg": 40.0 / 3},                            // stores 1, 2, 3: 20+5+15
			{"sales.item": "tulip", "rose_rev": "18", "rose_fern": "48", "store_total_avg": 15.0},                               // store 3
			{"sales.item": nil, "rose_rev": "18", "rose_fern": "48", "store_total_avg": 15.0, "rolled_up": total("sales.item")}, // 60/4
		}},
	// Under a filter on the edited column the two shares differ, and both are
	// right: of everything (drop) and of what the query keeps (ungroup).
	{Name: "share of everything and of what is shown", Models: editsModel, Measures: "revenue,item_share,shown_share",
		By: "sales.item", Where: "sales.item in ('rose', 'fern')", Totals: "grand",
		Rows: []Row{
			{"sales.item": "fern", "revenue": "30", "item_share": 0.5, "shown_share": 0.625}, // 30/60; 30/48
			{"sales.item": "rose", "revenue": "18", "item_share": 0.3, "shown_share": 0.375}, // 18/60; 18/48
			{"sales.item": nil, "revenue": "48", "item_share": 0.8, "shown_share": 1.0},      // 48/60; 48/48
		}},
	// Per-grain totals are re-evaluated over the whole total cell, never
	// averaged or added from the rows; edits and narrowings nest both ways.
	{Name: "per-grain and nesting at totals", Models: editsModel,
		Measures: "store_avg,big_stores,store_items,item_avg,big_items,fee_share,north_share,north_everywhere,dropped_north,chain_store_avg",
		By:       "stores.region", Totals: "grand",
		Rows: []Row{
			// items per store: store 1 {rose, fern} 2, store 2 {rose} 1. item_avg: fern 10, rose 15.
			// big_items (> 16): none in North. fee_share 30/105.5. north_share 25/60.
			{"stores.region": "North", "store_avg": 12.5, "big_stores": 1, "store_items": 3, "item_avg": 12.5, "big_items": 0,
				"fee_share": 30 / 105.5, "north_share": 25.0 / 60, "north_everywhere": "25", "dropped_north": "60", "chain_store_avg": 15.0},
			// store 3: 15, items {tulip, rose}. item_avg: tulip 12, rose 3. North revenue in a South cell: none.
			{"stores.region": "South", "store_avg": 15.0, "big_stores": 1, "store_items": 2, "item_avg": 7.5, "big_items": 0,
				"fee_share": 75.5 / 105.5, "north_share": nil, "north_everywhere": "25", "dropped_north": "60", "chain_store_avg": 15.0},
			// store 9: fern 20 > 16. No repairs there.
			{"stores.region": nil, "store_avg": 20.0, "big_stores": 1, "store_items": 1, "item_avg": 20.0, "big_items": 1,
				"fee_share": nil, "north_share": nil, "north_everywhere": "25", "dropped_north": "60", "chain_store_avg": 15.0, "rolled_up": None},
			// total: stores 20, 5, 15, 20: avg 15 (the rows' avgs average 15.83); over 12: stores 1, 3, 9;
			// items 2+1+2+1; item_avg: fern 30, rose 18, tulip 12: 20; over 16: fern and rose (the rows add to 1).
			{"stores.region": nil, "store_avg": 15.0, "big_stores": 3, "store_items": 6, "item_avg": 20.0, "big_items": 2,
				"fee_share": 1.0, "north_share": 25.0 / 60, "north_everywhere": "25", "dropped_north": "60", "chain_store_avg": 15.0,
				"rolled_up": total("stores.region")},
		}},
	// An edit on a column reached through two links (sales -> stores -> districts).
	{Name: "edit through two links", Models: editsModel, Measures: "revenue,area_share", By: "districts.area", Totals: "grand",
		Rows: []Row{
			{"districts.area": "Coast", "revenue": "20", "area_share": 20.0 / 60}, // rows 3, 4, 5: 5+12+3
			{"districts.area": "Hills", "revenue": "20", "area_share": 20.0 / 60}, // rows 1, 2
			{"districts.area": nil, "revenue": "20", "area_share": 20.0 / 60},     // the unmatched line
			{"districts.area": nil, "revenue": "60", "area_share": 1.0, "rolled_up": total("districts.area")},
		}},
	// Without a filter, drop, ungroup and pin of a group column are computed
	// as windows over the report's own cells (no second read of the table):
	// the same hand-worked values must come out.
	{Name: "edits as windows", Models: editsModel, Measures: "revenue,item_share,shown_share,rose_rev,region_share",
		By: "stores.region,sales.item", Totals: "rollup",
		Rows: []Row{
			{"stores.region": "North", "sales.item": "fern", "revenue": "10", "item_share": 0.4, "shown_share": 0.4, "rose_rev": "15", "region_share": 10.0 / 30}, // fern: 10+20
			{"stores.region": "North", "sales.item": "rose", "revenue": "15", "item_share": 0.6, "shown_share": 0.6, "rose_rev": "15", "region_share": 15.0 / 18}, // rose: 10+5+3
			{"stores.region": "North", "sales.item": nil, "revenue": "25", "item_share": 1.0, "shown_share": 1.0, "rose_rev": "15", "region_share": 25.0 / 60},
			{"stores.region": "South", "sales.item": "rose", "revenue": "3", "item_share": 0.2, "shown_share": 0.2, "rose_rev": "3", "region_share": 3.0 / 18}, // 3/15
			{"stores.region": "South", "sales.item": "tulip", "revenue": "12", "item_share": 0.8, "shown_share": 0.8, "rose_rev": "3", "region_share": 1.0},    // 12/15; 12/12
			{"stores.region": "South", "sales.item": nil, "revenue": "15", "item_share": 1.0, "shown_share": 1.0, "rose_rev": "3", "region_share": 0.25},       // 15/60
			{"stores.region": nil, "sales.item": "fern", "revenue": "20", "item_share": 1.0, "shown_share": 1.0, "rose_rev": nil, "region_share": 20.0 / 30},
			{"stores.region": nil, "sales.item": nil, "revenue": "20", "item_share": 1.0, "shown_share": 1.0, "rose_rev": nil, "region_share": 20.0 / 60},
			{"stores.region": nil, "sales.item": nil, "revenue": "60", "item_share": 1.0, "shown_share": 1.0, "rose_rev": "18", "region_share": 1.0},
		}},
	// Negations are pushed inward before a filter is split into conjuncts
	// (issue 13, rule 7), so that two equivalent filters give one value. The
	// kept lines: North roses, 10 + 5 = 15. item_share divides by revenue
	// with sales.item dropped: only the conjunct not (item = fern) goes, and
	// region <> South keeps the North lines, 10 + 10 + 5 = 25: 15 / 25 = 0.6.
	// Before, not (a or b) was one conjunct that the drop removed whole:
	// 15 / 60 = 0.25.
	{Name: "negated filter, not (a or b)", Models: editsModel, Measures: "revenue,item_share",
		Where: "not (sales.item = 'fern' or stores.region = 'South')",
		Rows:  []Row{{"revenue": "15.00", "item_share": 0.6}}},
	{Name: "negated filter, not a and not b", Models: editsModel, Measures: "revenue,item_share",
		Where: "not sales.item = 'fern' and not stores.region = 'South'",
		Rows:  []Row{{"revenue": "15.00", "item_share": 0.6}}},
	// drop removes the filter on the edited column, ungroup keeps it: the two
	// shares differ under a filter on sales.item. A pin replaces the filter.
	{Name: "drop, ungroup and pin under a filter", Models: shopEditsModel,
		Measures: "revenue,item_share,shown_share,rose_rev,all_rev,shown_rev", By: "sales.item", Totals: "grand",
		Where: "sales.item <> 'tulip'", // lines 1,2,3,5,6: fern 10+20, rose 10+5+3
		Rows: []Row{
			// 30/60 (drop: all lines); 30/48 (ungroup: the filter stays); pin: rose lines 1,3,5
			{"sales.item": "fern", "revenue": "30.00", "item_share": 0.5, "shown_share": 0.625, "rose_rev": "18.00", "all_rev": "60.00", "shown_rev": "48.00"},
			{"sales.item": "rose", "revenue": "18.00", "item_share": 0.3, "shown_share": 0.375, "rose_rev": "18.00", "all_rev": "60.00", "shown_rev": "48.00"},
			// 48/60; 48/48
			{"sales.item": nil, "revenue": "48.00", "item_share": 0.8, "shown_share": 1.0, "rose_rev": "18.00", "all_rev": "60.00", "shown_rev": "48.00", "rolled_up": total("sales.item")},
		}},
	// drop T removes every grouping on T's columns; a pin on a list keeps
	// the rows of those values whatever the row's own group value.
	{Name: "drop a table and pin a list", Models: shopEditsModel, Measures: "revenue,no_store_rev,region_pin,north_share", By: "stores.region", Totals: "grand",
		Rows: []Row{
			// North 10+10+5; everything; North and South 25+15; (25 where North)/60
			{"stores.region": "North", "revenue": "25.00", "no_store_rev": "60.00", "region_pin": "40.00", "north_share": 25.0 / 60},
			{"stores.region": "South", "revenue": "15.00", "no_store_rev": "60.00", "region_pin": "40.00", "north_share": nil}, // South and North: no row
			{"stores.region": nil, "revenue": "20.00", "no_store_rev": "60.00", "region_pin": "40.00", "north_share": nil},
			{"stores.region": nil, "revenue": "60.00", "no_store_rev": "60.00", "region_pin": "40.00", "north_share": 25.0 / 60, "rolled_up": total("stores.region")},
		}},
	// Per-grain: one value per group of the cell, then aggregated; a total
	// re-evaluates its groups over the whole total cell.
	{Name: "per-grain", Models: shopEditsModel, Measures: "basket,big,item_max,ungrouped_per", By: "stores.region", Totals: "grand",
		Rows: []Row{
			// stores 1 (10+10) and 2 (5): avg 12.5; only store 1 is over 12; rose 4+2 vs fern 1;
			// revenue[ungroup] drops the store grouping too: 2 groups * 60
			{"stores.region": "North", "basket": 12.5, "big": 1, "item_max": "6", "ungrouped_per": "120.00"},
			{"stores.region": "South", "basket": 15.0, "big": 1, "item_max": "10", "ungrouped_per": "60.00"}, // store 3: 12+3
			{"stores.region": nil, "basket": 20.0, "big": 1, "item_max": "2", "ungrouped_per": "60.00"},      // store 9, unmatched
			// stores 1:20 2:5 3:15 9:20, avg 60/4; over 12: 1, 3, 9; rose 4+2+1=7, fern 3, tulip 10; 4 * 60
			{"stores.region": nil, "basket": 15.0, "big": 3, "item_max": "10", "ungrouped_per": "240.00", "rolled_up": total("stores.region")},
		}},
	// A per-grain group whose value is NULL (the unmatched line's region) is
	// skipped, with or without a having clause: NULL is not a group
	// (language.md, "Per-grain groups and NULL").
	{Name: "per-grain NULL group", Models: shopEditsModel, Measures: "region_avg,regions,regions_sold",
		Rows: []Row{
			// North 25, South 15 (NULL 20 skipped): 40/2; 2 regions; with having too
			// (before, the NULL region counted there: 3)
			{"region_avg": 20.0, "regions": 2, "regions_sold": 2, "rolled_up": None},
		}},
}
