package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestPeriodStartsShowAsPeriods: a group column derived with date_trunc
// shows its values as the periods they start in the table and markdown
// formats (2026-01, 2026-Q1, 2026), while JSON and CSV keep ISO dates
// (issue 16). Sales on 2026-01-15, 2026-02-03 and 2026-04-20: one month,
// quarter or year each, as below.
func TestPeriodStartsShowAsPeriods(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	write := func(name, text string) {
		t.Helper()
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	write("sales.csv", "id,day,qty\n1,2026-01-15,1\n2,2026-02-03,2\n3,2026-04-20,4\n")
	write("m.roll", "table sales from \"sales.csv\" {\n  key id\n  id integer\n  day date\n  qty integer\n"+
		"  month = date_trunc(month, day)\n  quarter = date_trunc(quarter, day)\n  year = date_trunc(year, day)\n}\n"+
		"measure units = sum(sales.qty)\n")
	model := filepath.Join(dir, "m.roll")
	run := func(by, format string) string {
		t.Helper()
		var out, errb bytes.Buffer
		if code := Main([]string{"run", model, "-m", "units", "-b", by, "--format", format}, nil, &out, &errb); code != 0 {
			t.Fatalf("exit %d: %s", code, errb.String())
		}
		return out.String()
	}
	for _, c := range []struct{ by, format, want string }{
		{"sales.month", "table", "2026-01 │ 1\n2026-02 │ 2\n2026-04 │ 4"},
		{"sales.quarter", "markdown", "| 2026-Q1 | 3 |\n| 2026-Q2 | 4 |"},
		{"sales.year", "table", "2026 │ 7"},
		{"sales.month", "csv", "2026-01-01,1,\n2026-02-01,2,\n2026-04-01,4,"},
		{"sales.quarter", "json", `"sales.quarter": "2026-04-01"`},
		{"sales.day", "table", "2026-01-15 │ 1"}, // a plain date stays a date
	} {
		// Compared with the columns' padding squeezed out.
		var lines []string
		for _, l := range strings.Split(run(c.by, c.format), "\n") {
			lines = append(lines, strings.Join(strings.Fields(l), " "))
		}
		if got := strings.Join(lines, "\n"); !strings.Contains(got, c.want) {
			t.Errorf("-b %s --format %s:\n%s\nwant it to hold:\n%s", c.by, c.format, got, c.want)
		}
	}
}
