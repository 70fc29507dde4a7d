package grammar_test

import (
	"bytes"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/grammar"
)

// TestDiagnosticsAreCappedWhereCollected: past MaxKept a list keeps one
// more diagnostic that counts the rest (issue 17 item 5: 8 MiB of
// duplicate measures took 520 MB), and Print, Error and the severity
// still account for every one.
func TestDiagnosticsAreCappedWhereCollected(t *testing.T) {
	const n = 5000
	var l grammar.Diagnostics
	for i := range n {
		l.Errorf(grammar.Pos{File: "m.roll", Line: i + 1, Col: 1}, "x", "error number %d", i)
	}
	if len(l) != grammar.MaxKept+1 || l[grammar.MaxKept].Code != "too-many" || l.NotKept() != n-grammar.MaxKept {
		t.Fatalf("%d kept, %d counted, want %d and %d", len(l), l.NotKept(), grammar.MaxKept+1, n-grammar.MaxKept)
	}
	if !l.HasErrors() || !strings.HasSuffix(l.Error(), "(and 4999 more errors)") {
		t.Fatalf("HasErrors %v, Error %q", l.HasErrors(), l.Error())
	}
	var out bytes.Buffer
	l.Print(&out, nil, false)
	lines := strings.Split(strings.TrimSpace(out.String()), "\n")
	if len(lines) != grammar.MaxPrinted+1 || lines[len(lines)-1] != "... and 4900 more (only the first 100 are shown; fix these and check again)" {
		t.Fatalf("%d lines, the last %q", len(lines), lines[len(lines)-1])
	}
	// Once full, a diagnostic costs a count: its message is not formatted.
	allocs := testing.AllocsPerRun(100, func() {
		l.Errorf(grammar.Pos{File: "m.roll", Line: 1, Col: 1}, "x", "error %s", "text")
	})
	if allocs > 1 || l.NotKept() != n-grammar.MaxKept+101 {
		t.Fatalf("%.0f allocations per diagnostic past the cap, %d counted", allocs, l.NotKept())
	}

	// Warnings past the cap do not make the list fail; one error does.
	var w grammar.Diagnostics
	for range grammar.MaxKept + 10 {
		w.Warnf(grammar.Pos{File: "m.roll", Line: 1, Col: 1}, "w", "a warning")
	}
	if w.HasErrors() || w.NotKept() != 10 {
		t.Fatalf("warnings only: HasErrors %v, %d counted", w.HasErrors(), w.NotKept())
	}
	var both grammar.Diagnostics
	both.Append(w)
	both.Errorf(grammar.Pos{}, "x", "an error")
	if !both.HasErrors() || len(both) != grammar.MaxKept+1 || both.NotKept() != 11 {
		t.Fatalf("appended: HasErrors %v, %d kept, %d counted", both.HasErrors(), len(both), both.NotKept())
	}
}
