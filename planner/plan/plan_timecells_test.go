package plan_test

import (
	"slices"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
)

const timed = `table orders {
  key id
  id      integer
  day     date
  shop    text
  amount  decimal
  month   = date_trunc(month, day)
  quarter = date_trunc(quarter, day)
  year    = extract(year from day)
  mon     = extract(month from day)
  week    = date_trunc(week, day)
}
measure revenue = sum(orders.amount)
measure running = revenue[orders.day running]
measure ytd     = revenue[orders.day to date year]
measure qtd     = revenue[orders.day to date quarter]
measure mtd     = revenue[orders.day to date month]
measure wtd     = revenue[orders.day to date week]
measure last3   = revenue[orders.day last 3 months]
measure avg_run = avg(orders.amount)[orders.day running]
measure run_all = revenue[drop orders.shop; orders.day running]
measure run_then_drop = revenue[orders.day running; drop orders.shop]
measure ly      = revenue[orders.day back 1 year]
measure lq      = revenue[orders.day back 1 quarter]
measure lm      = revenue[orders.day back 1 month]
measure lw      = revenue[orders.day back 1 week]
measure ld      = revenue[orders.day back 3 days]
measure ly_all  = revenue[orders.day back 1 year; drop orders.shop]
measure ly_max  = max(orders.amount)[orders.day back 1 year]
measure ly_avg  = avg(orders.amount)[orders.day back 1 year]
`

// Window time edits are computed over the report's cells exactly where
// planner/plan/plan_timecells.go says it is exact, and by a second read of
// the rows (a range scan) elsewhere; the numbers of both plans are held
// to the reference evaluator by cmd/rollwise's TestTimeEdits and the
// differential tests.
func TestWindowEditsOverCells(t *testing.T) {
	for _, c := range []struct {
		measure, by, where, totals string
		cells                      bool
	}{
		{"running", "orders.month", "", "none", true},
		{"ytd", "orders.month", "", "none", true},
		{"ytd", "orders.quarter", "", "none", true},
		{"qtd", "orders.month,orders.shop", "", "none", true},
		{"wtd", "orders.day", "", "none", true},
		{"wtd", "orders.week", "", "none", true},
		{"running", "orders.day,orders.shop", "", "none", true},
		// the drop before the edit: a window across the shops' cells
		{"run_all", "orders.month,orders.shop", "", "none", true},
		// a year filter keeps whole years: the year to date is exact
		{"ytd", "orders.month", "orders.year = 2025", "none", true},
		{"mtd", "orders.month", "orders.mon = 3", "none", true},
		// ... a running total reads years the filter drops
		{"running", "orders.month", "orders.year = 2025", "none", false},
		// ... a quarter to date reads months a month filter drops
		{"qtd", "orders.month", "orders.mon = 3", "none", false},
		{"ytd", "orders.month", "orders.day >= date '2025-03-15'", "none", false},
		// a filter that is not time-bound stays in the base's rows
		{"running", "orders.month", "orders.shop = 'a'", "none", true},
		// the total rows roll the month up: E is not a month's
		{"running", "orders.month", "", "grand", false},
		{"ytd", "orders.month,orders.shop", "", "rollup", false},
		// a unit finer than the key, or across it
		{"mtd", "orders.quarter", "", "none", false},
		{"wtd", "orders.month", "", "none", false},
		// not a month of D itself, or not grouped by time at all
		{"ytd", "orders.mon", "", "none", false},
		{"running", "orders.shop", "", "none", false},
		// two time keys
		{"running", "orders.month,orders.quarter", "", "none", false},
		// last N: the range is not a union of cells
		{"last3", "orders.month", "", "none", false},
		// an average does not combine over cells
		{"avg_run", "orders.month", "", "none", false},
		// a drop after the edit: E is the shop's, the rows every shop's
		{"run_then_drop", "orders.month,orders.shop", "", "none", false},
	} {
		p := planTotals(t, timed, c.measure, c.by, c.where, c.totals)
		cells, ranges := 0, 0
		for _, r := range p.Root.Rels {
			if r.Window != nil && r.Window.Time != nil {
				cells++
			}
			if r.Scan != nil && r.Scan.Range != nil {
				ranges++
			}
		}
		name := c.measure + " by " + c.by + " where " + c.where + " totals " + c.totals
		switch {
		case c.cells && (cells != 1 || ranges != 0):
			t.Errorf("%s: want a window over the cells, got %d windows and %d range scans", name, cells, ranges)
		case !c.cells && (cells != 0 || ranges != 1):
			t.Errorf("%s: want the range scan, got %d windows and %d range scans", name, cells, ranges)
		}
	}
}

// planTotals plans a query on the model src with a totals mode.
func planTotals(t *testing.T, src, measures, by, where, totals string) *plan.Plan {
	t.Helper()
	f, d := grammar.Parse("m.roll", src)
	if d.HasErrors() {
		t.Fatal(d)
	}
	return planOf(t, []*grammar.File{f}, model.Request{Measures: strings.Split(measures, ","), By: strings.Split(by, ","), Where: where, Totals: totals})
}

// `back` is a shift of the report's cells exactly where
// planner/plan/plan_timecells.go says it is exact, and a scan of the rows
// grouped by the moved key elsewhere.
func TestBackOverCells(t *testing.T) {
	for _, c := range []struct {
		measure, by, where, totals string
		shift                      bool
	}{
		{"ly", "orders.month", "", "none", true},
		{"lm", "orders.month", "", "none", true},
		{"lq", "orders.quarter", "", "none", true},
		{"ly", "orders.quarter", "", "none", true},
		{"lw", "orders.week", "", "none", true},
		{"ld", "orders.day", "", "none", true},
		{"lm", "orders.day", "", "none", true},
		{"ly_max", "orders.month", "", "none", true},
		// total rows without a time-bound filter: nothing moves there
		{"ly", "orders.month", "", "grand", true},
		{"ly", "orders.month,orders.shop", "", "rollup", true},
		{"ly_all", "orders.month,orders.shop", "", "rollup", true},
		// a filter that keeps whole months: the cells moved into a month
		// that passes it pass it (read from a scan without it)
		{"ly", "orders.month", "orders.year = 2025", "none", true},
		{"ly", "orders.month", "orders.shop = 'a'", "grand", true},
		// ... but a total row under it moves the filter, not a key
		{"ly", "orders.month", "orders.year = 2025", "grand", false},
		{"ly", "orders.month", "orders.day >= date '2025-03-15'", "none", false},
		// moves that do not commute with the key's grain
		{"lm", "orders.quarter", "", "none", false},
		{"lm", "orders.week", "", "none", false},
		{"lw", "orders.month", "", "none", false},
		// not a grain of D itself
		{"ly", "orders.mon", "", "none", false},
		{"ly_avg", "orders.month", "", "none", false},
	} {
		p := planTotals(t, timed, c.measure, c.by, c.where, c.totals)
		shifts, moved := 0, 0
		for _, r := range p.Root.Rels {
			if r.Shift != nil {
				shifts++
			}
			if r.Scan != nil && slices.ContainsFunc(r.Scan.Keys, func(k plan.Key) bool { return k.Expr != nil }) {
				moved++
			}
		}
		name := c.measure + " by " + c.by + " where " + c.where + " totals " + c.totals
		switch {
		case c.shift && (shifts != 1 || moved != 0):
			t.Errorf("%s: want a shift of the cells, got %d shifts and %d moved scans", name, shifts, moved)
		case !c.shift && (shifts != 0 || moved != 1):
			t.Errorf("%s: want the moved scan, got %d shifts and %d moved scans", name, shifts, moved)
		}
	}
}
