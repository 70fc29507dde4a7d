package main

import (
	"fmt"
	"strings"
	"testing"
)

// With subtotals, --order sorts level by level: regions by their subtotal
// (North 25, no region 20, South 15), items inside a region by their own
// revenue; each subtotal stays after its group. --limit 2 keeps the first
// two detail rows, the subtotal of the group they belong to, and the grand
// total.
func TestOrderAndLimitWithSubtotals(t *testing.T) {
	t.Parallel()
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

// With --totals all and three group columns, the rows that roll up the
// first column (stores.region) still sort their items by the item's own
// subtotal (issue 13, bug 3): tulip 12, rose 8 + 10 = 18, fern 10 + 20 =
// 30, ascending. The sort key once read only one grouping id, found no
// subtotal for them and sorted the items by name (fern, rose, tulip).
func TestOrderTotalsAllThreeColumns(t *testing.T) {
	t.Parallel()
	got := runJSON(t, "run", shopModel, "-m", "revenue", "-b", "stores.region,sales.item,districts.area", "--order", "revenue", "--totals", "all")
	var seq []string
	for _, r := range got {
		if fmt.Sprint(r["rolled_up"]) == "[stores.region]" {
			seq = append(seq, fmt.Sprintf("%v/%v=%v", r["sales.item"], r["districts.area"], r["revenue"]))
		}
	}
	want := []string{
		"tulip/Coast=12",                // tulip's subtotal 12 (store 3, Coast)
		"rose/Coast=8", "rose/Hills=10", // rose's 18: 5 (store 2) + 3 (store 3) in Coast, 10 in Hills
		"fern/Hills=10", "fern/<nil>=20", // fern's 30: 10 in Hills, 20 unmatched
	}
	if strings.Join(seq, " ") != strings.Join(want, " ") {
		t.Errorf("rows rolling up stores.region:\n got %v\nwant %v", seq, want)
	}
}

// --order takes several keys, measures and --by columns, each asc or desc
// (issue 16): regions descending with NULL last, then revenue ascending
// inside each region. Revenue per region and item (shop.roll): North rose
// 15 (10+5), fern 10; no region fern 20; South tulip 12, rose 3.
func TestOrderSeveralKeys(t *testing.T) {
	t.Parallel()
	got := runJSON(t, "run", shopModel, "-m", "revenue", "-b", "stores.region,sales.item", "--order", "stores.region desc, revenue")
	expectRows(t, got, []row{
		{"stores.region": "South", "sales.item": "rose", "revenue": "3"},
		{"stores.region": "South", "sales.item": "tulip", "revenue": "12"},
		{"stores.region": "North", "sales.item": "fern", "revenue": "10"},
		{"stores.region": "North", "sales.item": "rose", "revenue": "15"},
		{"stores.region": nil, "sales.item": "fern", "revenue": "20"},
	})
	// With subtotals, level by level: regions by revenue at their subtotal
	// (North 25, none 20, South 15; the item key means nothing there),
	// then items by name descending inside each region.
	item := []string{"sales.item"}
	got = runJSON(t, "run", shopModel, "-m", "revenue", "-b", "stores.region,sales.item", "--order", "sales.item desc, revenue desc", "--totals", "rollup")
	expectRows(t, got, []row{
		{"stores.region": "North", "sales.item": "rose", "revenue": "15"},
		{"stores.region": "North", "sales.item": "fern", "revenue": "10"},
		{"stores.region": "North", "sales.item": nil, "revenue": "25", "rolled_up": item},
		{"stores.region": nil, "sales.item": "fern", "revenue": "20"},
		{"stores.region": nil, "sales.item": nil, "revenue": "20", "rolled_up": item},
		{"stores.region": "South", "sales.item": "tulip", "revenue": "12"},
		{"stores.region": "South", "sales.item": "rose", "revenue": "3"},
		{"stores.region": "South", "sales.item": nil, "revenue": "15", "rolled_up": item},
		{"stores.region": nil, "sales.item": nil, "revenue": "60", "rolled_up": []string{"stores.region", "sales.item"}},
	})
}

// Each --order key is checked with its position in the option.
func TestOrderKeyErrors(t *testing.T) {
	t.Parallel()
	cases := []struct {
		order, want string
		exit        int
	}{
		{"revenue desc, districts.area", "--order:1:15: error: --order names districts.area, which is not a group column of the query", exitUsage},
		{"revenue, revnue", "--order:1:10: error: --order names 'revnue', which is not a measure; did you mean 'revenue'?", exitFindings},
		{"revenue, revenue desc", "--order:1:10: error: --order names revenue twice", exitUsage},
		{"revenue sideways", `--order:1:1: error: --order key "revenue sideways" is not a name and an optional asc or desc`, exitUsage},
		{"units", "--order:1:1: error: --order names units, which the query does not ask for", exitUsage},
	}
	for _, c := range cases {
		var out strings.Builder
		code := Main([]string{"sql", shopModel, "-m", "revenue", "-b", "stores.region", "--order", c.order}, nil, &out, &out)
		if code != c.exit || !strings.Contains(out.String(), c.want) {
			t.Errorf("--order %q: exit %d\n%s\nwant %q", c.order, code, out.String(), c.want)
		}
	}
}
