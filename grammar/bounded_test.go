package grammar

import (
	"fmt"
	"strings"
	"testing"
	"time"
)

// generous is a bound on work that takes about a second on an idle
// machine: it fails only when the work grows faster than its input (the
// cases below took 21.6 s to 303 s before they were bounded, issue 17),
// not when other work shares the machine. The structural checks (how many
// diagnostics are kept) are what the tests rest on.
const generous = 120 * time.Second

// within runs f and fails when it takes longer than generous.
func within(t *testing.T, what string, f func()) {
	t.Helper()
	start := time.Now()
	f()
	if d := time.Since(start); d > generous {
		t.Errorf("%s took %v; the bound is %v", what, d, generous)
	}
}

// TestHashLineIsBounded: one 256 KiB line of characters that start no token
// gives at most MaxPrinted errors and a count of the rest, and printing
// them does not rescan the line for each one.
func TestHashLineIsBounded(t *testing.T) {
	src := strings.Repeat("#", 1<<18)
	var d Diagnostics
	within(t, "parsing 256 KiB of #", func() { _, d = Parse("h.roll", src) })
	if len(d) != MaxPrinted {
		t.Fatalf("%d diagnostics, want %d and a count of the rest", len(d), MaxPrinted-1)
	}
	last := d[len(d)-1]
	if last.Code != "too-many" || !strings.Contains(last.Message, fmt.Sprint(1<<18-MaxPrinted+1)+" more") {
		t.Errorf("last diagnostic %v, want the count of the %d not listed", last, 1<<18-MaxPrinted+1)
	}
	var b strings.Builder
	within(t, "printing them", func() { d.Print(&b, Sources{"h.roll": src}, false) })
	if b.Len() > 64<<10 || strings.Contains(b.String(), "... and") {
		t.Errorf("printed %d bytes for %d diagnostics, or left the count out:\n%s", b.Len(), len(d), b.String()[b.Len()-300:])
	}
}

// TestPrintCapsDiagnostics: Print writes MaxPrinted diagnostics, then the
// number it left out.
func TestPrintCapsDiagnostics(t *testing.T) {
	var l Diagnostics
	for i := range 250 {
		l.Errorf(Pos{File: "m.roll", Line: i + 1, Col: 1}, "x", "error %d", i)
	}
	var b strings.Builder
	l.Print(&b, nil, false)
	out := b.String()
	if n := strings.Count(out, ": error: "); n != MaxPrinted {
		t.Errorf("printed %d errors, want %d", n, MaxPrinted)
	}
	if !strings.Contains(out, "... and 150 more") {
		t.Errorf("no count of the rest in:\n%s", out[len(out)-200:])
	}
}

// TestClosestIsBounded: two 100,000-character names are not compared
// (they were, in 22.7 s), and a near name among many candidates is
// still found.
func TestClosestIsBounded(t *testing.T) {
	a, b := strings.Repeat("a", 100_000), strings.Repeat("a", 99_999)+"b"
	within(t, "Closest of two 100,000-character names", func() {
		if got := Closest(a, []string{b}); got != "" {
			t.Errorf("Closest suggested a %d-character name", len(got))
		}
	})
	many := make([]string, 0, 20_001)
	for i := range 20_000 {
		many = append(many, fmt.Sprintf("measure_%05d_%s", i, strings.Repeat("x", 100)))
	}
	many = append(many, "revenue")
	within(t, "Closest among 20,001 long candidates", func() {
		if got := Closest("revnue", many); got != "revenue" {
			t.Errorf("Closest(revnue) = %q", got)
		}
	})
}

// TestBadBytesInQuotes: a NUL byte or invalid UTF-8 inside a string,
// a backquoted name or double-quoted text is refused at its own line and
// column, not passed on to the engine.
func TestBadBytesInQuotes(t *testing.T) {
	cases := []struct {
		src, pos, what string
	}{
		{"table t from \"t.csv\" { key id\n id integer }\nmeasure m = count(*) where t.id = 'ab\x00c'\n", "m.roll:3:38", "a NUL byte inside a string"},
		{"table t from \"t.csv\" { key id\n id integer }\nmeasure `bad\xffname` = count(t.id)\n", "m.roll:3:13", "invalid UTF-8 (byte 0xFF) inside a quoted name"},
		{"table t from \"t\x00.csv\" { key id\n id integer }\n", "m.roll:1:16", "a NUL byte inside a double-quoted text"},
		{"measure m = count(*) where t.x = 'é\n\xc3'\n", "m.roll:2:1", "invalid UTF-8 (byte 0xC3) inside a string"},
	}
	for _, c := range cases {
		_, d := Parse("m.roll", c.src)
		if len(d) != 1 || d[0].Pos.String() != c.pos || d[0].Message != c.what {
			t.Errorf("Parse(%q) = %v, want one error %s: %s", c.src, d, c.pos, c.what)
		}
	}
}

// TestByteOrderMark: a UTF-8 byte order mark at the start of a model is
// skipped (editors on Windows write one); anywhere else it is an error.
func TestByteOrderMark(t *testing.T) {
	src := "\uFEFFtable t from \"t.csv\" {\n key id\n id integer\n}\n"
	f, d := Parse("m.roll", src)
	if len(d) != 0 || len(f.Tables) != 1 || f.Tables[0].Name.Name != "t" {
		t.Errorf("with a byte order mark: %v, %d tables", d, len(f.Tables))
	}
	if _, d := Parse("m.roll", "table t \uFEFF"); len(d) == 0 {
		t.Error("a byte order mark after the start was accepted")
	}
}
