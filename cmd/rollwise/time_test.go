package main

import (
	"bytes"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/demo"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/pipeline"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/reference"
)

// timeModel holds orders over two years and a half, a calendar and a
// stock snapshot (see planner/reference/expect/time.go for the rows).
const timeModel = "../../testdata/exec/time.roll"

// Time edits the SQL path does not plan yet, and mistakes in writing
// them, are positioned errors that say what to write instead.
func TestTimeEditErrors(t *testing.T) {
	t.Parallel()
	for _, c := range []struct{ measure, want string }{
		{"revenue[orders.shop back 1 year]", "a time edit moves a date or timestamp column; orders.shop is text"},
		{"revenue[orders.day back 1 fortnight]", "unknown unit 'fortnight': this time edit is written D back N UNIT"},
		{"revenue[orders.day back year]", "a number of units is missing"},
		{"revenue[orders.day to month]", "'date' does not belong here"},
		{"revenue[orders.day sideways]", "unknown time edit 'sideways'"},
		{"revenue[orders.day last 0 days]", "last 0 units holds no rows"},
		{"sum(stock.qty)[stock.day back 1 day]", "sum of stock.qty, which is semiadditive"},
		// Two backs along a fact's date and the calendar's key it links
		// to: the reference evaluator refuses it too (no defined meaning).
		{"revenue[orders.day back 1 year; days.day back 1 month]", "days.day back after a back on orders.day moves one date along two columns"},
	} {
		extra := filepath.Join(t.TempDir(), "extra.roll")
		if err := os.WriteFile(extra, []byte("measure x = "+c.measure+"\n"), 0o644); err != nil {
			t.Fatal(err)
		}
		var out, errb bytes.Buffer
		code := Main([]string{"run", timeModel, extra, "-m", "x", "-b", "days.mon"}, strings.NewReader(""), &out, &errb)
		if code == 0 || !strings.Contains(errb.String(), c.want) || !strings.Contains(errb.String(), "extra.roll:1:") {
			t.Errorf("%s: want an error containing %q, got exit %d:\n%s", c.measure, c.want, code, errb.String())
		}
	}
}

// The demo's month report (last year's revenue, growth, the year to date
// and the closing stock over 2026, by the calendar's month) gives on
// DuckDB what the reference evaluator computes cell by cell on the same
// generated data.
func TestDemoMonthReportMatchesReference(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	if err := demo.WriteFiles(dir); err != nil {
		t.Fatal(err)
	}
	modelFile := filepath.Join(dir, demo.ModelFile)
	m, err := diffLoadModel(modelFile)
	if err != nil {
		t.Fatal(err)
	}
	spec := model.Request{Measures: []string{"revenue", "revenue_ly", "growth", "revenue_ytd", "closing_stock"},
		By: []string{"calendar.month_start"}, Where: "calendar.cal_year = 2026", Totals: "grand"}
	q, diags := m.NewQuery(spec)
	if diags.HasErrors() {
		t.Fatal(diags)
	}
	res, err := reference.Evaluate(m, q, "")
	if err != nil {
		t.Fatal(err)
	}
	want := res.JSON()
	got, stderr, code := diffRunJSON([]string{"run", modelFile, "--view", "month_report", "--format", "json"})
	if code != 0 {
		t.Fatalf("rollwise run --view month_report: exit %d\n%s", code, stderr)
	}
	if len(got) != 13 {
		t.Errorf("got %d rows, want the 12 months of 2026 and the total", len(got))
	}
	if diff := diffRows(q, got, want, true); diff != "" {
		t.Error(diff)
	}
}

// Per-grain aggregates under window edits (to date, running, last) are
// planned into SQL: each cell's groups are the per values among its rows
// in range (the kept constraints and start_of_UNIT(E) <= D <= E, ...), as
// the reference evaluator forms them, at detail rows, subtotals and the
// grand total, over a fact date and over a calendar, with and without a
// filter on the year.
func TestPerGrainUnderWindowEditsMatchReference(t *testing.T) {
	t.Parallel()
	measures := []string{
		"avg(revenue per orders.shop)[orders.day running]",
		"count(* per orders.shop)[orders.day to date year]",
		"sum(revenue per orders.shop having revenue > 5)[orders.day last 2 months]",
		"max(count(orders.id) per orders.shop)[days.day to date month]",
		"avg(avg(revenue per orders.id) per orders.shop)[orders.day running]",
		"median(revenue per orders.shop)[orders.day to date year]",
		"avg(revenue[drop orders.shop] per orders.shop)[orders.day running]",
		"sum(count(distinct orders.id) per orders.shop)[orders.day last 1 year]",
		"count(* per orders.shop)[orders.day running] + revenue[orders.day running]",
		"avg(revenue[orders.day = latest] per orders.shop)[orders.day to date year]",
		"avg(revenue[ungroup] per orders.shop)[orders.day running]",
		"avg(revenue per orders.shop)[orders.day running; drop orders.shop]",
		"avg(revenue where orders.amount > 3 per orders.shop)[orders.day last 2 months]",
		"avg(revenue[drop days.day] per orders.shop)[days.day running]",
		"avg(revenue[orders.shop = 'a'] per orders.shop)[orders.day running]",
		"avg(revenue per orders.shop)[days.day running]",
		"avg(revenue[orders.day back 1 year] per orders.shop)[orders.day running]",
		"avg(revenue[orders.day running] per orders.shop)[orders.day to date year]",
		"avg(rev_ly per orders.shop)[orders.day to date year]",
	}
	compareTimeMeasures(t, timeModel, measures, []model.Request{
		{By: []string{"days.mon"}, Totals: "grand"},
		{By: []string{"orders.shop", "days.mon"}, Totals: "rollup"},
		{By: []string{"days.yr", "orders.shop"}, Totals: "all", Where: "days.yr >= 2025"},
		{By: []string{"orders.month"}, Totals: "grand", Where: "orders.year = 2026"},
	})
	// Balances: each shop's closing stock in the cell's range, summed, and
	// the average daily balance of the year to date.
	compareTimeMeasures(t, timeModel, []string{
		"sum(sum(stock.qty)[stock.day = latest] per stock.shop)[stock.day last 2 months]",
		"avg(sum(stock.qty) per stock.day)[stock.day to date year]",
		"max(sum(stock.qty) per stock.day)[stock.day running]",
	}, []model.Request{
		{By: []string{"stock.shop"}, Totals: "grand"},
		{By: []string{"stock.day", "stock.shop"}, Totals: "rollup"},
		{By: []string{"stock.shop"}, Totals: "grand", Where: "stock.day < date '2026-01-01'"},
	})
}

// compareTimeMeasures runs the measures, each written into a file read
// with modelFile, for each request on DuckDB and compares every row with
// the reference evaluator's.
func compareTimeMeasures(t *testing.T, modelFile string, measures []string, specs []model.Request) {
	t.Helper()
	extra := filepath.Join(t.TempDir(), "extra.roll")
	var src strings.Builder
	var names []string
	for i, m := range measures {
		fmt.Fprintf(&src, "measure pw%d = %s\n", i, m)
		names = append(names, fmt.Sprintf("pw%d", i))
	}
	if err := os.WriteFile(extra, []byte(src.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	m, diags, err := pipeline.Load([]string{modelFile, extra})
	if err != nil || diags.HasErrors() {
		t.Fatalf("%v %v", err, diags)
	}
	for _, spec := range specs {
		spec.Measures = names
		q, diags := m.Model.NewQuery(spec)
		if diags.HasErrors() {
			t.Fatal(diags)
		}
		res, err := reference.Evaluate(m.Model, q, "")
		if err != nil {
			t.Fatal(err)
		}
		args := []string{"run", modelFile, extra, "-m", strings.Join(names, ","), "-b", strings.Join(spec.By, ","), "--totals", spec.Totals, "--format", "json"}
		if spec.Where != "" {
			args = append(args, "-w", spec.Where)
		}
		got, stderr, code := diffRunJSON(args)
		if code != 0 {
			t.Fatalf("%v: exit %d\n%s", spec.By, code, stderr)
		}
		if diff := diffRows(q, got, res.JSON(), true); diff != "" {
			t.Errorf("by %v where %q:\n%s", spec.By, spec.Where, diff)
		}
	}
}

// Two fact tables whose dates reach one calendar, each moved by back in
// one query: each gets its own copy of the calendar, joined on its own
// date (they once shared the first one's copy, which the engine could
// not find from the other table).
func TestBackOnTwoDatesOfOneCalendar(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	files := map[string]string{
		"m.roll": `table orders from "orders.csv" {
  key id
  id integer
  day date -> days.day
  amount decimal
}
table returns from "returns.csv" {
  key id
  id integer
  day date -> days.day
  amount decimal
}
table days from "days.csv" {
  key day
  day date
  mon text
  yr integer
}
measure rev = sum(orders.amount)
measure ret = sum(returns.amount)
`,
		"orders.csv":  "id,day,amount\n1,2025-01-10,10\n2,2025-02-10,20\n3,2026-01-10,30\n4,2026-02-28,40\n5,2026-03-31,50\n",
		"returns.csv": "id,day,amount\n1,2025-01-11,1\n2,2025-02-11,2\n3,2026-01-11,3\n4,2026-03-01,4\n",
		"days.csv":    "day,mon,yr\n2025-01-10,jan,2025\n2025-01-11,jan,2025\n2025-02-10,feb,2025\n2025-02-11,feb,2025\n2026-01-10,jan,2026\n2026-01-11,jan,2026\n2026-02-28,feb,2026\n2026-03-01,mar,2026\n2026-03-31,mar,2026\n",
	}
	for name, text := range files {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	compareTimeMeasures(t, filepath.Join(dir, "m.roll"), []string{
		"rev[orders.day back 1 year]",
		"ret[returns.day back 1 year]",
		"(rev + ret)[days.day back 1 year]",
		"ret[returns.day back 1 month]",
		"rev[orders.day back 1 month]",
	}, []model.Request{
		{By: []string{"days.mon"}, Totals: "grand"},
		{By: []string{"days.mon"}, Totals: "grand", Where: "days.yr = 2026"},
	})
}
