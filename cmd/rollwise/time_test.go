package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/demo"
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
		{"avg(revenue per orders.shop)[orders.day running]", "a per-grain aggregate under orders.day running is not planned into SQL yet"},
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
