package main

import (
	"testing"

	"github.com/rollwise/rollwise/planner/model"
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

// TestTimeChainsMatchReference runs the chains by month, by shop, by day
// and by the calendar's month (detail rows, subtotals, the grand total),
// with and without a year filter, on DuckDB, and compares every value
// with the reference evaluator's.
func TestTimeChainsMatchReference(t *testing.T) {
	t.Parallel()
	calendar := []model.Request{
		{By: []string{"days.mon"}, Totals: "grand", Where: "days.yr = 2026"},
		{By: []string{"days.mon"}, Totals: "grand"},
		{By: []string{"days.yr", "days.mon"}, Totals: "rollup"},
	}
	compareTimeMeasures(t, timeModel, timeChains, append([]model.Request{
		{By: []string{"orders.month"}, Totals: "grand"},
		{By: []string{"orders.month", "orders.shop"}, Totals: "rollup"},
		{By: []string{"orders.shop"}, Totals: "grand", Where: "orders.year = 2025"},
		{By: []string{"orders.day"}, Totals: "none"},
		// the calendar's month beside the order's: a running total on
		// the calendar's day alone is a window over the report's cells
		// here; the chains must not be
		{By: []string{"days.cal_month", "orders.month"}, Totals: "none"},
	}, calendar...))
	compareTimeMeasures(t, timeModel, timeChainsTwoTables, calendar)
}
