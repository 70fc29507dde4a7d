package main

import (
	"os"
	"runtime"
	"testing"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
)

// liveHeap is the heap in use after a collection, in bytes.
func liveHeap() uint64 {
	runtime.GC()
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	return ms.HeapAlloc
}

// TestValidModelHeldIsBounded: a valid model of many measures (the
// synthetic model of the compile benchmarks, 1 MiB; just under the size
// cap with ROLLWISE_TEST_CAP=1) is checked without holding its syntax
// trees all at once: parsed lazily, what stays is each measure's name and
// place (Parse kept every tree, about 13 bytes a byte of source), and
// resolving it keeps the model and allocates a bounded number of bytes
// per byte (issue 17 item 5: `check` of any input up to the cap in 500
// MB). The bounds are about twice the figures measured; the time and the
// peak memory at the cap are measured by BenchmarkCheckHostile
// (docs/benchmarks.md, "Hostile input").
func TestValidModelHeldIsBounded(t *testing.T) {
	size := 1 << 20
	if os.Getenv("ROLLWISE_TEST_CAP") != "" {
		size = grammar.MaxSourceBytes
	}
	src := synthModelUnder(size)
	n := float64(len(src))
	var before, after runtime.MemStats
	base := liveHeap()
	runtime.ReadMemStats(&before)
	f, d := grammar.ParseLazy("m.roll", src)
	parsed := liveHeap() - base
	m, d2 := model.Load([]*grammar.File{f})
	resolved := liveHeap() - base
	runtime.ReadMemStats(&after)
	if len(d) > 0 || len(d2) > 0 || m == nil {
		t.Fatalf("the synthetic model does not check: %v %v", d, d2)
	}
	if f.Measures[0].Expr != nil {
		t.Fatalf("ParseLazy kept a measure's expression")
	}
	t.Logf("%.1f MB, %d measures: %.1f bytes a byte kept after parsing, %.1f after resolving, %.1f allocated",
		n/1e6, len(m.Measures), float64(parsed)/n, float64(resolved)/n, float64(after.TotalAlloc-before.TotalAlloc)/n)
	if b := float64(parsed) / n; b > 5 {
		t.Errorf("parsing lazily keeps %.1f bytes a byte of source; want at most 5", b)
	}
	if b := float64(resolved) / n; b > 24 {
		t.Errorf("the parsed and resolved model holds %.1f bytes a byte of source; want at most 24", b)
	}
	if b := float64(after.TotalAlloc-before.TotalAlloc) / n; b > 120 {
		t.Errorf("parsing and resolving allocated %.1f bytes a byte of source; want at most 120", b)
	}
	runtime.KeepAlive(f)
	runtime.KeepAlive(m)
}
