package main

import (
	"fmt"
	"io"
	"math/rand/v2"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/grammar"
)

// BenchmarkCheckHostile runs `rollwise check` on inputs made to grow the
// work faster than their size (issue 17 item 5; target: any input up to
// the size cap, grammar.MaxSourceBytes, in under 5 s and 500 MB). Each reports wall and CPU
// milliseconds, the input's size and the peak heap in MB (sampled after
// each run, so a lower bound of the process's peak). ROLLWISE_BENCH_CAP=1
// adds the inputs at the cap itself.
func BenchmarkCheckHostile(b *testing.B) {
	long := strings.Repeat("a", 100_000)
	cases := []struct {
		name string
		src  func() string
	}{
		{"hash-1MiB", func() string { return strings.Repeat("#", 1<<20) }},
		{"random-1MiB", func() string { return randomBytes(1 << 20) }},
		{"longnames-2x100k", func() string {
			return "table t from \"t.csv\" {\n  key " + long + "\n  " + long + " integer\n}\nmeasure m = sum(t." + long[1:] + "b)\n"
		}},
		{"chain-10000", func() string { return chainModel(10_000) }},
		{"model-10MB", func() string { return synthModelOfSize(10 << 20) }},
	}
	if os.Getenv("ROLLWISE_BENCH_CAP") != "" {
		cases = append(cases,
			struct {
				name string
				src  func() string
			}{"hash-cap", func() string { return strings.Repeat("#", grammar.MaxSourceBytes) }},
			struct {
				name string
				src  func() string
			}{"random-cap", func() string { return randomBytes(grammar.MaxSourceBytes) }},
			struct {
				name string
				src  func() string
			}{"model-near-cap", func() string { return synthModelUnder(grammar.MaxSourceBytes) }},
			struct {
				name string
				src  func() string
			}{"limits-near-cap", func() string { return limitModel(grammar.MaxSourceBytes, false) }},
			struct {
				name string
				src  func() string
			}{"limits-chain-near-cap", func() string { return limitModel(grammar.MaxSourceBytes, true) }},
			struct {
				name string
				src  func() string
			}{"derived-near-cap", func() string { return derivedModel(grammar.MaxSourceBytes) }})
	}
	for _, c := range cases {
		b.Run(c.name, func(b *testing.B) {
			src := c.src()
			path := filepath.Join(b.TempDir(), "m.roll")
			if err := os.WriteFile(path, []byte(src), 0o644); err != nil {
				b.Fatal(err)
			}
			b.SetBytes(int64(len(src)))
			b.ReportAllocs()
			var peak uint64
			cpu := processCPU()
			for b.Loop() {
				Main([]string{"check", path}, nil, io.Discard, io.Discard)
				var ms runtime.MemStats
				runtime.ReadMemStats(&ms)
				peak = max(peak, ms.HeapSys)
			}
			reportMS(b, processCPU()-cpu)
			b.ReportMetric(float64(peak)/1e6, "heap-MB")
		})
	}
}

// randomBytes is n bytes of a fixed pseudo-random sequence.
func randomBytes(n int) string {
	r := rand.New(rand.NewPCG(17, 5))
	b := make([]byte, n)
	for i := range b {
		b[i] = byte(r.Uint32())
	}
	return string(b)
}

// limitModel is a model at the limits on what a model declares, up to
// at most size bytes: grammar.MaxTables tables (one-column ones or, with
// chain, each linking to the next), grammar.MaxViews views of a measure
// by a column three links away, and as many of the synthetic model's
// measures as keep it within grammar.MaxNames names and size bytes.
func limitModel(size int, chain bool) string {
	var b strings.Builder
	b.WriteString(synthModel(0))
	n := grammar.MaxTables - strings.Count(synthTables, "\ntable ")
	for i := range n {
		switch {
		case !chain:
			fmt.Fprintf(&b, "table t%d { x integer }\n", i)
		case i+1 < n:
			fmt.Fprintf(&b, "table t%d {\n  key id\n  id integer\n  next_id integer -> t%d.id\n  v integer\n}\n", i, i+1)
		default:
			fmt.Fprintf(&b, "table t%d {\n  key id\n  id integer\n  v integer\n}\n", i)
		}
	}
	for i := range grammar.MaxViews {
		fmt.Fprintf(&b, "view v%d = m0 by regions.name\n", i)
	}
	return withMeasures(&b, size)
}

// derivedModel is a model whose derived columns hold nearly
// grammar.MaxDerivedTokens tokens (tables of 19 derived columns of 26
// tokens each), filled up to at most size bytes with the synthetic
// model's measures.
func derivedModel(size int) string {
	var b strings.Builder
	b.WriteString(synthModel(0))
	for i := range grammar.MaxDerivedTokens/(19*26) - 1 {
		fmt.Fprintf(&b, "table d%d {\n  a integer\n  b integer\n", i)
		for j := range 19 {
			fmt.Fprintf(&b, "  d%d = case when a > %d then a * 2 - a / 3 else coalesce(b, 0) + %d end\n", j, j, j)
		}
		b.WriteString("}\n")
	}
	return withMeasures(&b, size)
}

// withMeasures adds to the model in b as many of the synthetic model's
// measures as keep it within grammar.MaxNames names and size bytes.
func withMeasures(b *strings.Builder, size int) string {
	var declared grammar.Declared
	if _, d := grammar.ParseLazyIn("m.roll", b.String(), &declared); d.HasErrors() {
		panic(d)
	}
	for i := 0; declared.Names+i < grammar.MaxNames; i++ {
		m := fmt.Sprintf("measure m%d = %s\n", i, synthMeasure(i))
		if b.Len()+len(m) > size {
			break
		}
		b.WriteString(m)
	}
	return b.String()
}

// synthModelOfSize is the synthetic model with as many measures as make
// it at least size bytes.
func synthModelOfSize(size int) string {
	n := 5000 * size / len(synthModel(5000))
	src := synthModel(n)
	for len(src) < size {
		n += 1000
		src = synthModel(n)
	}
	return src
}

// synthModelUnder is the synthetic model with the most measures (a
// multiple of 1,000) that keeps it at most size bytes.
func synthModelUnder(size int) string {
	n := 5000 * size / len(synthModel(5000)) / 1000 * 1000
	src := synthModel(n)
	for len(src) > size {
		n -= 1000
		src = synthModel(n)
	}
	for {
		next := synthModel(n + 1000)
		if len(next) > size {
			return src
		}
		n, src = n+1000, next
	}
}
