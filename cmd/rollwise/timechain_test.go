package main

import (
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/pipeline"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/reference"
)

// timeChains are window edits (to date, running, last) combined with
// another time edit: in the same brackets, or one inside the measure the
// other edits (the inner edit applies in the cell the outer one made).
var timeChains = []string{
	"(revenue[orders.day to date year])[orders.day last 3 months]",
	"(revenue[orders.day last 3 months])[orders.day to date year]",
	"(revenue[orders.day running])[orders.day to date month]",
	"(revenue[orders.day to date month])[orders.day running]",
	"revenue[orders.day to date year; orders.day back 1 year]",
	"revenue[orders.day running; orders.day last 2 months]",
	"revenue[orders.day to date month; orders.day = latest]",
	"revenue[orders.day last 2 months; orders.day = earliest]",
	// back inside a running total once lost the range (back rebuilt
	// the cell without it): revenue under no time constraint at all.
	"(revenue[orders.day back 1 year])[orders.day running]",
	"(revenue[orders.day back 1 month])[orders.day to date year]",
	"revenue[days.day back 1 year; orders.day to date year]",
	"revenue[orders.day back 1 year; days.day running]",
	"revenue[orders.day running; days.day back 1 month]",
	"revenue[days.day to date year; orders.day back 1 year]",
	"revenue[orders.day running; orders.day back 1 month; orders.day to date year]",
	"revenue[orders.day last 1 year; orders.day back 2 months; orders.day = latest]",
	"count(distinct orders.shop)[orders.day running; orders.day last 1 month]",
	"count(orders.id)[orders.day to date month; orders.day running]",
	"revenue[orders.day running; drop orders.shop; orders.day = latest]",
	"(revenue[orders.day = latest])[orders.day last 1 year; orders.day back 1 month]",
	// A range on the order's day does not bind the calendar's day:
	// both ranges hold.
	"revenue[orders.day running; days.day last 1 month]",
	"revenue[orders.day last 2 months; days.day to date year; days.day back 1 month]",
	"(revenue[days.day to date month])[orders.day last 1 year]",
	"revenue[orders.day to date year; days.day = latest]",
	"revenue[orders.day running; days.day last 1 month; drop days.day]",
	"(revenue[orders.day back 1 month])[days.day running]",
	// in a per-grain sub-context under a window edit
	"avg(revenue[orders.day = latest] per orders.shop)[orders.day running]",
	"sum(revenue[orders.day last 1 month] per orders.shop)[orders.day to date year]",
	"max(revenue[orders.day back 1 month] per orders.shop)[orders.day running]",
}

// timeChainsTwoTables read the orders and the calendar's days: grouped
// by a column of the calendar only (the days reach no order).
var timeChainsTwoTables = []string{
	"(revenue + count(days.day))[days.day to date year; days.day back 1 year]",
	"(revenue + count(days.day))[days.day running; days.day last 1 month]",
	"(revenue + count(days.day))[days.day last 2 months; days.day = latest]",
}

// TestTimeChainsMatchReference runs each chain by month, by shop and by
// the calendar's month (detail rows, subtotals, the grand total), with and
// without a year filter, on DuckDB, and compares every value with the
// reference evaluator's.
func TestTimeChainsMatchReference(t *testing.T) {
	t.Parallel()
	extra := filepath.Join(t.TempDir(), "chains.roll")
	text := ""
	var names []string
	chains := append(slices.Clone(timeChains), timeChainsTwoTables...)
	for i, m := range chains {
		name := fmt.Sprintf("chain%d", i)
		names = append(names, name)
		text += "measure " + name + " = " + m + "\n"
	}
	if err := os.WriteFile(extra, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	pm, ld, err := pipeline.Load([]string{timeModel, extra})
	if err != nil || ld.HasErrors() {
		t.Fatal(err, ld)
	}
	m := pm.Model
	for _, g := range []struct{ by, where, totals string }{
		{"orders.month", "", "grand"},
		{"orders.month,orders.shop", "", "rollup"},
		{"orders.shop", "orders.year = 2025", "grand"},
		{"days.mon", "days.yr = 2026", "grand"},
		{"orders.day", "", "none"},
		{"days.mon", "", "grand"},
		// the calendar's month beside the order's: a running total on
		// the calendar's day alone is a window over the report's cells
		// here; the chains must not be
		{"days.cal_month,orders.month", "", "none"},
		{"days.yr,days.mon", "", "rollup"},
	} {
		for i, name := range names {
			if i >= len(timeChains) && strings.Contains(g.by, "orders.") {
				continue
			}
			spec := model.Request{Measures: []string{name}, By: strings.Split(g.by, ","), Where: g.where, Totals: g.totals}
			q, diags := m.NewQuery(spec)
			if diags.HasErrors() {
				t.Fatal(diags)
			}
			res, err := reference.Evaluate(m, q, "")
			if err != nil {
				t.Fatalf("%s: %v", chains[i], err)
			}
			args := []string{"run", timeModel, extra, "-m", name, "-b", g.by, "--totals", g.totals, "--format", "json"}
			if g.where != "" {
				args = append(args, "-w", g.where)
			}
			got, stderr, code := diffRunJSON(args)
			if code != 0 {
				t.Errorf("%s by %s: exit %d\n%s", chains[i], g.by, code, stderr)
				continue
			}
			if diff := diffRows(q, got, res.JSON(), true); diff != "" {
				t.Errorf("%s by %s where %q:\n%s", chains[i], g.by, g.where, diff)
			}
		}
	}
}
