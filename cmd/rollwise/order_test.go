package main

import "testing"

// With subtotals, --order sorts level by level: regions by their subtotal
// (North 25, no region 20, South 15), items inside a region by their own
// revenue; each subtotal stays after its group. --limit 2 keeps the first
// two detail rows, the subtotal of the group they belong to, and the grand
// total.
func TestOrderAndLimitWithSubtotals(t *testing.T) {
	item := []string{"sales.item"}
	all := []string{"stores.region", "sales.item"}
	got := runJSON(t, "run", shopModel, "-m", "revenue", "-b", "stores.region,sales.item", "--order", "revenue desc", "--totals", "rollup")
	expectRows(t, got, []row{
		{"stores.region": "North", "sales.item": "rose", "revenue": "15"}, // 10+5
		{"stores.region": "North", "sales.item": "fern", "revenue": "10"},
		{"stores.region": "North", "sales.item": nil, "revenue": "25", "rolled_up": item},
		{"stores.region": nil, "sales.item": "fern", "revenue": "20", "rolled_up": none},
		{"stores.region": nil, "sales.item": nil, "revenue": "20", "rolled_up": item},
		{"stores.region": "South", "sales.item": "tulip", "revenue": "12"},
		{"stores.region": "South", "sales.item": "rose", "revenue": "3"},
		{"stores.region": "South", "sales.item": nil, "revenue": "15", "rolled_up": item},
		{"stores.region": nil, "sales.item": nil, "revenue": "60", "rolled_up": all},
	})
	got = runJSON(t, "run", shopModel, "-m", "revenue", "-b", "stores.region,sales.item", "--order", "revenue desc", "--limit", "2", "--totals", "rollup")
	expectRows(t, got, []row{
		{"stores.region": "North", "sales.item": "rose", "revenue": "15"},
		{"stores.region": "North", "sales.item": "fern", "revenue": "10"},
		{"stores.region": "North", "sales.item": nil, "revenue": "25", "rolled_up": item},
		{"stores.region": nil, "sales.item": nil, "revenue": "60", "rolled_up": all}, // over every row, not the two shown
	})
}
