package plan_test

import (
	"flag"
	"github.com/rollwise/rollwise/internal/modeltest"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/planner/model"
)

var update = flag.Bool("update", false, "rewrite the plan dumps in testdata/dump")

// The models of the execution tests, whose values are worked out by hand
// there (cmd/rollwise/exec_test.go, edits_test.go, time_test.go).
var (
	shopModels = []string{"../../testdata/exec/shop.roll", "../../testdata/exec/edits.roll"}
	timeModels = []string{"../../testdata/exec/time.roll"}
)

// TestPlanDumps prints the plan of a handful of representative queries
// and compares each with its file in testdata/dump. A change shows as a
// line diff; go test ./planner/plan -run TestPlanDumps -update rewrites
// the files (read the diff before committing).
func TestPlanDumps(t *testing.T) {
	for _, c := range []struct {
		name   string
		models []string
		req    model.Request
	}{
		// One scan, grouping sets of a rollup, a ratio of two measures.
		{"plain", shopModels, model.Request{Measures: []string{"revenue", "margin_rate"},
			By: []string{"stores.region", "sales.item"}, Totals: "rollup"}},
		// A narrowed measure beside its whole, under a row filter.
		{"narrowed", shopModels, model.Request{Measures: []string{"revenue", "roses", "rose_share"},
			By: []string{"stores.region"}, Where: "sales.qty >= 2", Order: "revenue desc", Limit: 5}},
		// Cell edits: drop, ungroup and pins, shared values.
		{"edits", shopModels, model.Request{Measures: []string{"revenue", "item_share", "shown_share", "rose_fern", "all_rev"},
			By: []string{"stores.region", "sales.item"}, Totals: "rollup"}},
		// Per-grain aggregates and their sub-contexts.
		{"per_grain", shopModels, model.Request{Measures: []string{"store_avg", "big_items", "chain_store_avg"},
			By: []string{"stores.region"}, Totals: "grand"}},
		// Time edits: a date moved back, a window to date, the latest day.
		{"time_edits", timeModels, model.Request{Measures: []string{"revenue", "rev_ly", "ytd", "closing"},
			By: []string{"orders.month"}, Where: "orders.year = 2025", Totals: "grand"}},
		// A per-grain aggregate under a window edit: its groups come from
		// the root's cells joined to the rows in each cell's range.
		{"per_grain_window", append(timeModels[:1:1], "testdata/dump/per_window.roll"), model.Request{
			Measures: []string{"ytd", "shop_avg_ytd"}, By: []string{"orders.month"}, Totals: "grand"}},
		// Values used by several expressions: computed once, read by
		// name; gross in two cells (as asked, and with the region dropped).
		{"layers", append(shopModels[:1:1], "testdata/dump/layers.roll"), model.Request{
			Measures: []string{"gross", "gross_rate", "gross_share", "takings"}, By: []string{"stores.region"}, Totals: "grand"}},
	} {
		t.Run(c.name, func(t *testing.T) {
			got := dumpOf(t, c.models, c.req)
			path := filepath.Join("testdata", "dump", c.name+".txt")
			if *update {
				if err := os.WriteFile(path, []byte(got), 0o644); err != nil {
					t.Fatal(err)
				}
				return
			}
			want, err := os.ReadFile(path)
			if err != nil {
				t.Fatalf("%v (write it with -update, then read it)", err)
			}
			if got != string(want) {
				t.Errorf("the plan dump changed (review, then go test ./planner/plan -run TestPlanDumps -update):\n%s", lineDiff(string(want), got))
			}
		})
	}
}

// dumpOf loads the model files, resolves the request and dumps its plan.
func dumpOf(t *testing.T, paths []string, req model.Request) string {
	t.Helper()
	return planOf(t, modeltest.Files(t, paths...), req).Dump()
}

// lineDiff is a line diff of two texts: the lines of a longest common
// subsequence kept ("  "), the others removed ("- ") or added ("+ "),
// with two lines of context around each change.
func lineDiff(want, got string) string {
	a, b := strings.Split(want, "\n"), strings.Split(got, "\n")
	// lcs[i][j] is the length of a longest common subsequence of a[i:]
	// and b[j:].
	lcs := make([][]int, len(a)+1)
	for i := range lcs {
		lcs[i] = make([]int, len(b)+1)
	}
	for i := len(a) - 1; i >= 0; i-- {
		for j := len(b) - 1; j >= 0; j-- {
			if a[i] == b[j] {
				lcs[i][j] = lcs[i+1][j+1] + 1
			} else {
				lcs[i][j] = max(lcs[i+1][j], lcs[i][j+1])
			}
		}
	}
	type line struct {
		mark, text string
	}
	var lines []line
	i, j := 0, 0
	for i < len(a) || j < len(b) {
		switch {
		case i < len(a) && j < len(b) && a[i] == b[j]:
			lines = append(lines, line{"  ", a[i]})
			i, j = i+1, j+1
		case i < len(a) && (j == len(b) || lcs[i+1][j] >= lcs[i][j+1]):
			lines = append(lines, line{"- ", a[i]})
			i++
		default:
			lines = append(lines, line{"+ ", b[j]})
			j++
		}
	}
	const context = 2
	var out strings.Builder
	last := -1
	for k, l := range lines {
		near := false
		for n := max(0, k-context); n <= min(len(lines)-1, k+context); n++ {
			near = near || lines[n].mark != "  "
		}
		if !near {
			continue
		}
		if last >= 0 && k > last+1 {
			out.WriteString("...\n")
		}
		out.WriteString(l.mark + l.text + "\n")
		last = k
	}
	return out.String()
}

// TestLineDiff checks the diff the golden test shows: a line inserted in
// the middle shows as one added line, not as every later line changed.
func TestLineDiff(t *testing.T) {
	want := "a\nb\nc\nd\ne\nf\ng\n"
	got := "a\nb\nc\nX\nd\ne\nf\ng\n"
	if d := lineDiff(want, got); d != "  b\n  c\n+ X\n  d\n  e\n" {
		t.Errorf("diff:\n%s", d)
	}
	if d := lineDiff("a\nb\nc", "a\nc"); d != "  a\n- b\n  c\n" {
		t.Errorf("diff:\n%s", d)
	}
	if d := lineDiff("a\nb\nc", "a\nB\nc"); d != "  a\n- b\n+ B\n  c\n" {
		t.Errorf("diff:\n%s", d)
	}
}
