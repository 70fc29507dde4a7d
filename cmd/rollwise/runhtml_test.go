package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/demo"
)

// htmlPageOf runs `rollwise run ... --format html` and returns the page.
func htmlPageOf(t *testing.T, args ...string) string {
	t.Helper()
	code, out, stderr := mainRun(append(append([]string{"run"}, args...), "--format", "html")...)
	if code != exitOK {
		t.Fatalf("run --format html: exit %d\n%s", code, stderr)
	}
	return out
}

// The shop's margin by region, worked out by hand in exec_test.go
// (TestRatioTotalIsReevaluated): North 52%, South 60%, no region 40%,
// all 50%; items: 2, 2, 1, 3.
var shopRegionArgs = []string{shopModel, "-m", "revenue,margin_rate,items", "-b", "stores.region", "--totals", "grand"}

func TestRunHTMLPage(t *testing.T) {
	t.Parallel()
	page := htmlPageOf(t, shopRegionArgs...)
	for _, want := range []string{
		"<title>revenue, margin_rate, items by stores.region</title>",
		`<tr><td>North</td><td class="num">25</td><td class="num">52.0%</td><td class="num">2</td></tr>`,
		`<tr><td>(null)</td><td class="num">20</td><td class="num">40.0%</td><td class="num">1</td></tr>`,
		`<tr class="total grand"><td>All</td><td class="num">60</td><td class="num">50.0%</td><td class="num">3</td></tr>`,
		"<title>South: 60.0%</title>",
	} {
		if !strings.Contains(page, want) {
			t.Errorf("the page lacks %q", want)
		}
	}
	// A bar per region (three) for each of the three measures; the grand
	// total is not a bar.
	if n := strings.Count(page, `class="bar"`); n != 9 {
		t.Errorf("%d bars, want 9", n)
	}
	if strings.Contains(page, "<script") || strings.Contains(page, "<link") || strings.Contains(page, "src=") {
		t.Error("the page runs a script or fetches something")
	}
}

func TestRunHTMLShowsCautions(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	os.WriteFile(filepath.Join(dir, "f.csv"), []byte("id,w,g\n1,0.1,a\n2,0.2,a\n3,0.3,b\n"), 0o644)
	model := filepath.Join(dir, "float.roll")
	os.WriteFile(model, []byte("table t from \"f.csv\" {\n  key id\n  id integer\n  w float\n  g text\n}\nmeasure weight = sum(t.w)\n"), 0o644)
	code, out, stderr := mainRun("run", model, "-m", "weight", "-b", "t.g", "--format", "html")
	if code != exitOK {
		t.Fatalf("exit %d\n%s", code, stderr)
	}
	if !strings.Contains(out, `<p class="caution"><strong>caution:</strong> weight adds float values`) {
		t.Error("the page does not show the float caution")
	}
	if !strings.Contains(stderr, "caution: weight adds float values") {
		t.Error("stderr lost the caution")
	}
}

// gardenMonths writes the garden demo and returns its model and the
// number of months its sales span (from the JSON output of the same query).
func gardenMonths(t *testing.T) (string, int) {
	t.Helper()
	dir := t.TempDir()
	if err := demo.WriteFiles(dir); err != nil {
		t.Fatal(err)
	}
	model := filepath.Join(dir, "garden.roll")
	return model, len(runJSON(t, "run", model, "-m", "revenue", "-b", "sales.sold_month"))
}

func TestRunHTMLDrawsALineByMonth(t *testing.T) {
	t.Parallel()
	model, months := gardenMonths(t)
	page := htmlPageOf(t, model, "-m", "revenue,margin_rate", "-b", "sales.sold_month", "--totals", "grand")
	if months < 12 {
		t.Fatalf("the demo spans %d months", months)
	}
	if n := strings.Count(page, `<polyline class="series"`); n != 2 {
		t.Errorf("%d lines, want 2 (one per measure)", n)
	}
	if n := strings.Count(page, `<circle class="point"`); n != 2*months {
		t.Errorf("%d points, want %d (two measures, %d months)", n, 2*months, months)
	}
}

func TestBrowserShowsRunPages(t *testing.T) {
	t.Parallel()
	browserPath(t)
	dir := t.TempDir()
	bars := filepath.Join(dir, "bars.html")
	os.WriteFile(bars, []byte(htmlPageOf(t, shopRegionArgs...)), 0o644)
	dom := loadPage(t, bars)
	if n := strings.Count(dom, `class="bar"`); n != 9 {
		t.Errorf("the browser shows %d bars, want 9 (3 regions, 3 measures)", n)
	}
	model, months := gardenMonths(t)
	line := filepath.Join(dir, "line.html")
	os.WriteFile(line, []byte(htmlPageOf(t, model, "-m", "revenue", "-b", "sales.sold_month")), 0o644)
	dom = loadPage(t, line)
	if n := strings.Count(dom, `<circle class="point"`); n != months {
		t.Errorf("the browser shows %d points, want %d months", n, months)
	}
	screenshotVaried(t, bars)
}
