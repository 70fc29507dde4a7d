package grammar

import (
	"fmt"
	"strings"
	"testing"
)

// TestDeclarationLimits: the declaration that takes a model past
// MaxTables, MaxViews or MaxNames is refused at its own position, in the
// file where it is, counting the files before it; the file is parsed no
// further, and a model at every limit is accepted (issue 17 item 5).
func TestDeclarationLimits(t *testing.T) {
	t.Parallel()
	// lines is n lines of format, each with its number, and the line of
	// the one after the last (the number of lines plus one).
	lines := func(format string, from, n int) string {
		var b strings.Builder
		for i := from; i < from+n; i++ {
			fmt.Fprintf(&b, format, i)
		}
		return b.String()
	}
	// derived is a table of n derived columns of 3 tokens each.
	derived := func(name string, n int) string {
		return "table " + name + " {\n  a integer\n" + lines("  d%d = a\n", 0, n) + "  z integer\n}\n"
	}
	const tables = "table t%d { x integer }\n"
	const views = "view v%d = m by t.x\n"
	const measures = "measure m%d = 1\n"
	cases := []struct {
		name  string
		files []string // the model's files; the last one is over a limit
		code  string
		line  int // of the declaration over the limit, in the last file
		col   int
	}{
		{"tables", []string{lines(tables, 0, MaxTables+1)}, "too-many-tables", MaxTables + 1, 1},
		{"tables-over-files", []string{lines(tables, 0, MaxTables-2), "-- b\n" + lines(tables, MaxTables, 5)}, "too-many-tables", 4, 1},
		{"views", []string{lines(views, 0, MaxViews+1)}, "too-many-views", MaxViews + 1, 1},
		{"names", []string{lines(measures, 0, MaxNames), "\n  " + lines(measures, MaxNames, 1)}, "too-many-names", 2, 3},
		// A table's columns count: the first one past the limit is where
		// the error is.
		{"columns", []string{lines(measures, 0, MaxNames-3), "table t {\n  a integer\n  b integer\n  c integer\n}\n"}, "too-many-names", 4, 3},
		{"table-itself", []string{lines(measures, 0, MaxNames), "table t { a integer }\n"}, "too-many-names", 1, 1},
		// Tokens in derived columns: 80,000 columns of 3 tokens, then the
		// 3,334th in the next file is past 250,000.
		{"derived", []string{derived("a", 40_000) + derived("b", 40_000), derived("c", 4_000)}, "too-many-derived", 2 + MaxDerivedTokens/3 - 80_000 + 1, 3},
	}
	for _, c := range cases {
		var n Declared
		var last Diagnostics
		for i, src := range c.files {
			f, d := ParseLazyIn(fmt.Sprintf("f%d.roll", i), src, &n)
			if i < len(c.files)-1 && (len(d) > 0 || n.Over) {
				t.Fatalf("%s: file %d is refused: %v", c.name, i, d)
			}
			last = d
			if i == len(c.files)-1 && f != nil && len(f.Tables)+len(f.Views)+len(f.Measures) > MaxNames {
				t.Errorf("%s: %d declarations kept past the limit", c.name, len(f.Tables)+len(f.Views)+len(f.Measures))
			}
		}
		if !n.Over || len(last) != 1 {
			t.Errorf("%s: over %v, diagnostics %v; want one error", c.name, n.Over, last)
			continue
		}
		d := last[0]
		want := Pos{File: fmt.Sprintf("f%d.roll", len(c.files)-1), Line: c.line, Col: c.col}
		if d.Code != c.code || d.Pos.File != want.File || d.Pos.Line != want.Line || d.Pos.Col != want.Col ||
			!strings.Contains(d.Suggestion, "split the model into smaller models") {
			t.Errorf("%s: got %s %s:%d:%d %q (hint %q); want %s at %s:%d:%d", c.name, d.Code, d.Pos.File, d.Pos.Line, d.Pos.Col, d.Message, d.Suggestion,
				c.code, want.File, want.Line, want.Col)
		}
	}
	// At every limit: accepted.
	src := lines(tables, 0, MaxTables) + lines(views, 0, MaxViews) + lines(measures, 0, MaxNames-2*MaxTables-MaxViews)
	var n Declared
	if _, d := ParseLazyIn("m.roll", src, &n); len(d) > 0 || n.Over || n.Names != MaxNames {
		t.Errorf("a model at the limits: %v, %+v", d, n)
	}
	// Parse and ParseLazy have no limits of their own.
	if f, d := ParseLazy("m.roll", lines(views, 0, MaxViews+1)); len(d) > 0 || len(f.Views) != MaxViews+1 {
		t.Errorf("ParseLazy: %d views, %v", len(f.Views), d)
	}
}
