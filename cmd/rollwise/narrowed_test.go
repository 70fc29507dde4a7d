package main

import "testing"

// Narrowed measures (testdata/exec/narrowed.roll) on the shop rows listed
// in exec_test.go. A narrowing shared by every aggregate of a scan goes
// into the scan's WHERE where that cannot change a value: these check the
// values around that rewrite, worked out by hand. The rose lines are rows
// 1 (store 1, qty 4), 3 (store 2, qty 2) and 5 (store 3, qty 1).

const narrowedModel = "../../testdata/exec/narrowed.roll"

func runNarrowed(t *testing.T, args ...string) []map[string]any {
	t.Helper()
	return runJSON(t, append([]string{"run", shopModel, narrowedModel}, args...)...)
}

// Without groups the one row exists whatever the narrowing keeps: a sum
// of no rows is null, a count 0. big_rose_lines shares only its rose
// conjunct with the others and keeps its own (qty >= 2).
func TestNarrowingWithoutGroups(t *testing.T) {
	t.Parallel()
	got := runNarrowed(t, "-m", "rose_units,rose_lines,big_rose_lines,rose_store_lines")
	expectRows(t, got, []row{{
		"rose_units":       7, // 4+2+1
		"rose_lines":       3, // rows 1, 3, 5
		"big_rose_lines":   2, // rows 1 and 3
		"rose_store_lines": 4, // stores 1, 2, 3 one rose line each, store 9 none: 0, counted
		"rolled_up":        none,
	}})
	// The filter keeps row 4 only (a tulip): no row passes the narrowing.
	got = runNarrowed(t, "-m", "rose_units,rose_lines,big_rose_lines,rose_store_lines", "-w", "sales.item = 'tulip'")
	expectRows(t, got, []row{{
		"rose_units":       nil, // sum of nothing
		"rose_lines":       0,   // count of nothing
		"big_rose_lines":   0,
		"rose_store_lines": 1, // store 3's group (0 rose lines) is still a group
		"rolled_up":        none,
	}})
	got = runNarrowed(t, "-m", "rose_lines", "-w", "sales.item = 'tulip'", "--totals", "grand")
	expectRows(t, got, []row{{"rose_lines": 0, "rolled_up": none}})
}

// With groups, the rows of the report come from the scan that also
// computes the narrowed aggregates: items with no rose keep their row.
func TestNarrowingKeepsGroups(t *testing.T) {
	t.Parallel()
	got := runNarrowed(t, "-m", "rose_units,rose_lines", "-b", "sales.item", "--totals", "grand")
	expectRows(t, got, []row{
		{"sales.item": "fern", "rose_units": nil, "rose_lines": 0, "rolled_up": none},
		{"sales.item": "rose", "rose_units": 7, "rose_lines": 3, "rolled_up": none},
		{"sales.item": "tulip", "rose_units": nil, "rose_lines": 0, "rolled_up": none},
		{"sales.item": nil, "rose_units": 7, "rose_lines": 3, "rolled_up": []string{"sales.item"}},
	})
}

// An edited narrowed count in its own scan (count(distinct) is not a
// window over the report's cells): only North's cells are left in that
// scan, and the other rows read 0, not null.
func TestNarrowingInEditedScan(t *testing.T) {
	t.Parallel()
	got := runNarrowed(t, "-m", "revenue,north_items", "-b", "stores.region,sales.item", "--totals", "rollup")
	item := []string{"sales.item"}
	expectRows(t, got, []row{
		{"stores.region": "North", "sales.item": "fern", "revenue": "10", "north_items": 2, "rolled_up": none}, // rose, fern
		{"stores.region": "North", "sales.item": "rose", "revenue": "15", "north_items": 2},
		{"stores.region": "North", "sales.item": nil, "revenue": "25", "north_items": 2, "rolled_up": item},
		{"stores.region": "South", "sales.item": "rose", "revenue": "3", "north_items": 0},
		{"stores.region": "South", "sales.item": "tulip", "revenue": "12", "north_items": 0},
		{"stores.region": "South", "sales.item": nil, "revenue": "15", "north_items": 0, "rolled_up": item},
		{"stores.region": nil, "sales.item": "fern", "revenue": "20", "north_items": 0, "rolled_up": none}, // the unmatched line
		{"stores.region": nil, "sales.item": nil, "revenue": "20", "north_items": 0, "rolled_up": item},
		{"stores.region": nil, "sales.item": nil, "revenue": "60", "north_items": 2, "rolled_up": []string{"stores.region", "sales.item"}},
	})
}
