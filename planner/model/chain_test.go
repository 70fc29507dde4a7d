package model_test

import (
	"fmt"
	"runtime"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
)

// TestLongLinkChainResolvesInLinearMemory: resolving aggregates over a
// chain of 5,000 linked tables (one over the first table, one reading the
// first and the last, one derived column of the first reading the last)
// allocates a bounded number of bytes per table. Each aggregate copied
// the link path to every table of the chain (5,000 tables: 100 MB an
// aggregate; 40,000 tables took 6.5 GB to check, issue 17 item 5).
func TestLongLinkChainResolvesInLinearMemory(t *testing.T) {
	const n = 5_000
	var b strings.Builder
	for i := range n {
		fmt.Fprintf(&b, "table t%d {\n  key id\n  id integer\n", i)
		if i+1 < n {
			fmt.Fprintf(&b, "  next_id integer -> t%d.id\n", i+1)
		}
		if i == 0 {
			fmt.Fprintf(&b, "  far = t%d.v\n", n-1)
		}
		b.WriteString("  v integer\n}\n")
	}
	fmt.Fprintf(&b, "measure a = sum(t0.v)\nmeasure b = sum(t0.v + t%d.v)\nmeasure c = sum(t0.far)\nmeasure d = sum(t1.v + t0.v)\n", n-1)
	_, per := loadPerTable(t, b.String(), n)
	if per > 4000 {
		t.Errorf("resolving allocated %.0f bytes a table; want at most 4,000", per)
	}
}

// TestManyTablesAreSmall: a model of 20,000 one-column tables resolves
// in a bounded number of bytes a table (issue 17 item 5: at the size cap
// such a model is 600,000 tables). A table of at most eight columns has
// no map of its columns by name (which cost some 250 bytes a table);
// lookups by name work the same with or without it.
func TestManyTablesAreSmall(t *testing.T) {
	const n = 20_000
	var b strings.Builder
	for i := range n {
		fmt.Fprintf(&b, "table t%d { x integer }\n", i)
	}
	b.WriteString("table wide {\n")
	for i := range 20 {
		fmt.Fprintf(&b, "  c%d integer\n", i)
	}
	b.WriteString("}\n")
	m, per := loadPerTable(t, b.String(), n)
	if per > 850 {
		t.Errorf("resolving allocated %.0f bytes a table; want at most 850 (1,003 with a map per table)", per)
	}
	for _, c := range []struct{ table, col string }{{"t0", "x"}, {"t19999", "x"}, {"wide", "c0"}, {"wide", "c8"}, {"wide", "c19"}} {
		if got := m.Table(c.table).Column(c.col); got == nil || got.Name != c.col {
			t.Errorf("%s.%s: %v", c.table, c.col, got)
		}
	}
	if m.Table("t0").Column("y") != nil || m.Table("wide").Column("c20") != nil {
		t.Errorf("a column that is not there was found")
	}
}

// loadPerTable parses and resolves src, which must check without a
// diagnostic, and returns the model and the bytes resolving allocated for
// each of its n tables.
func loadPerTable(t *testing.T, src string, n int) (*model.Model, float64) {
	t.Helper()
	f, d := grammar.Parse("m.roll", src)
	if d.HasErrors() {
		t.Fatal(d)
	}
	var before, after runtime.MemStats
	runtime.ReadMemStats(&before)
	m, diags := model.Load([]*grammar.File{f})
	runtime.ReadMemStats(&after)
	if len(diags) != 0 {
		t.Fatalf("diagnostics: %v", diags)
	}
	per := float64(after.TotalAlloc-before.TotalAlloc) / float64(n)
	t.Logf("%.0f bytes a table", per)
	return m, per
}

// TestManyLinkPathsAreBounded: 1,500 tables each linking to the next ten
// have millions of pairs of link paths between the same tables; the
// check keeps grammar.MaxPrinted of them, then says it stopped looking,
// and a path of thousands of tables is shown by its ends (issue 17 item
// 5: 5,000 such tables, 1.5 MB, ran for more than 15 minutes, each
// error's paths written out in full by repeated string concatenation).
func TestManyLinkPathsAreBounded(t *testing.T) {
	const n = 1_500
	var b strings.Builder
	for i := range n {
		fmt.Fprintf(&b, "table t%d {\n  key id\n  id integer\n", i)
		for j := 1; j <= 10 && i+j < n; j++ {
			fmt.Fprintf(&b, "  l%d integer -> t%d.id\n", j, i+j)
		}
		b.WriteString("}\n")
	}
	f, d := grammar.Parse("m.roll", b.String())
	if d.HasErrors() {
		t.Fatal(d)
	}
	_, diags := model.Load([]*grammar.File{f})
	paths, stopped := 0, false
	for _, x := range diags {
		if x.Code != "two-paths" {
			continue
		}
		paths++
		stopped = stopped || strings.Contains(x.Message, "the rest are not looked for")
		for _, note := range x.Notes {
			if len(note) > 1000 {
				t.Fatalf("a note of %d bytes: %.200s...", len(note), note)
			}
		}
	}
	if !stopped || paths > grammar.MaxPrinted+1 {
		t.Errorf("%d two-paths errors, stopped %v; want at most %d and the last saying the rest are not looked for", paths, stopped, grammar.MaxPrinted+1)
	}
}
