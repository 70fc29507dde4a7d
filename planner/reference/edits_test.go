package reference_test

import "testing"

// Cell edits and per-grain aggregates on the shop data (see shop_test.go
// for the rows), worked out by hand. These constructs are not planned
// into SQL yet; the reference evaluator defines what they must give.

const editsModel = "testdata/shop_edits.roll"

// drop removes the filter on the edited column, ungroup keeps it: the two
// shares differ under a filter on sales.item. A pin replaces the filter.
func TestDropUngroupPinUnderFilter(t *testing.T) {
	m := loadModel(t, shopModel, editsModel)
	s := spec("revenue,item_share,shown_share,rose_rev,all_rev,shown_rev", "sales.item", "grand")
	s.Where = "sales.item <> 'tulip'" // lines 1,2,3,5,6: fern 10+20, rose 10+5+3
	expectRows(t, evaluateOn(t, m, s), []row{
		// 30/60 (drop: all lines); 30/48 (ungroup: the filter stays); pin: rose lines 1,3,5
		{"sales.item": "fern", "revenue": "30.00", "item_share": 0.5, "shown_share": 0.625, "rose_rev": "18.00", "all_rev": "60.00", "shown_rev": "48.00"},
		{"sales.item": "rose", "revenue": "18.00", "item_share": 0.3, "shown_share": 0.375, "rose_rev": "18.00", "all_rev": "60.00", "shown_rev": "48.00"},
		// 48/60; 48/48
		{"sales.item": nil, "revenue": "48.00", "item_share": 0.8, "shown_share": 1.0, "rose_rev": "18.00", "all_rev": "60.00", "shown_rev": "48.00", "rolled_up": []string{"sales.item"}},
	})
}

// drop T removes every grouping on T's columns; a pin on a list keeps
// the rows of those values whatever the row's own group value.
func TestDropTableAndPinList(t *testing.T) {
	m := loadModel(t, shopModel, editsModel)
	got := evaluateOn(t, m, spec("revenue,no_store_rev,region_pin,north_share", "stores.region", "grand"))
	expectRows(t, got, []row{
		// North 10+10+5; everything; North and South 25+15; (25 where North)/60
		{"stores.region": "North", "revenue": "25.00", "no_store_rev": "60.00", "region_pin": "40.00", "north_share": 25.0 / 60},
		{"stores.region": "South", "revenue": "15.00", "no_store_rev": "60.00", "region_pin": "40.00", "north_share": nil}, // South and North: no row
		{"stores.region": nil, "revenue": "20.00", "no_store_rev": "60.00", "region_pin": "40.00", "north_share": nil},
		{"stores.region": nil, "revenue": "60.00", "no_store_rev": "60.00", "region_pin": "40.00", "north_share": 25.0 / 60, "rolled_up": []string{"stores.region"}},
	})
}

// Per-grain: one value per group of the cell, then aggregated; a total
// re-evaluates its groups over the whole total cell.
func TestPerGrain(t *testing.T) {
	m := loadModel(t, shopModel, editsModel)
	got := evaluateOn(t, m, spec("basket,big,item_max,ungrouped_per", "stores.region", "grand"))
	expectRows(t, got, []row{
		// stores 1 (10+10) and 2 (5): avg 12.5; only store 1 is over 12; rose 4+2 vs fern 1;
		// revenue[ungroup] drops the store grouping too: 2 groups * 60
		{"stores.region": "North", "basket": 12.5, "big": 1, "item_max": "6", "ungrouped_per": "120.00"},
		{"stores.region": "South", "basket": 15.0, "big": 1, "item_max": "10", "ungrouped_per": "60.00"}, // store 3: 12+3
		{"stores.region": nil, "basket": 20.0, "big": 1, "item_max": "2", "ungrouped_per": "60.00"},      // store 9, unmatched
		// stores 1:20 2:5 3:15 9:20, avg 60/4; over 12: 1, 3, 9; rose 4+2+1=7, fern 3, tulip 10; 4 * 60
		{"stores.region": nil, "basket": 15.0, "big": 3, "item_max": "10", "ungrouped_per": "240.00", "rolled_up": []string{"stores.region"}},
	})
}

// A per-grain group whose value is NULL (the unmatched line's region) is
// skipped, with or without a having clause: NULL is not a group
// (language.md, "Per-grain groups and NULL").
func TestPerGrainNullGroup(t *testing.T) {
	m := loadModel(t, shopModel, editsModel)
	got := evaluateOn(t, m, spec("region_avg,regions,regions_sold", "", ""))
	expectRows(t, got, []row{
		// North 25, South 15 (NULL 20 skipped): 40/2; 2 regions; with having too
		// (before, the NULL region counted there: 3)
		{"region_avg": 20.0, "regions": 2, "regions_sold": 2, "rolled_up": none},
	})
}
