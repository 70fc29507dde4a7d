package model_test

import (
	"strings"
	"testing"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
)

// TestDuplicateFloodIsCounted: the check of a model declaring one measure
// 20,000 times keeps grammar.MaxKept diagnostics and counts the rest
// (issue 17 item 5: 8 MiB of `measure m = 1` took 15 s and 520 MB when
// every error was kept).
func TestDuplicateFloodIsCounted(t *testing.T) {
	const n = 20_000
	f, d := grammar.Parse("m.roll", strings.Repeat("measure m = 1\n", n))
	if d.HasErrors() {
		t.Fatal(d)
	}
	_, diags := model.Load([]*grammar.File{f})
	// n-1 duplicates, and one error that m aggregates nothing.
	if len(diags) != grammar.MaxKept+1 || grammar.MaxKept+diags.NotKept() < n-1 {
		t.Fatalf("%d kept and %d counted, want %d and at least %d", len(diags), diags.NotKept(), grammar.MaxKept+1, n-1-grammar.MaxKept)
	}
	if !diags.HasErrors() || diags[0].Code != "duplicate-measure" || diags[0].Pos.String() != "m.roll:2:9" {
		t.Fatalf("first: %v", diags[0])
	}
}
