package grammar

import (
	"fmt"
	"math/rand/v2"
	"os"
	"runtime"
	"strings"
	"testing"
)

// hostileCase is an input made to grow the parser's work faster than its
// size (issue 17 item 5), what Parse must answer, and how many bytes it
// may allocate for each byte of input.
type hostileCase struct {
	name string
	src  func(size int) string
	// codes are the diagnostics' codes, in order; "" ends a prefix
	// (random bytes give any number up to MaxPrinted).
	codes []string
	// perByte bounds the bytes allocated per input byte: nearly none for
	// what is refused, one copy of the string literal when its quotes are
	// taken off, and for valid declarations what the fast path and the
	// syntax tree allocate (about 45 bytes a byte; participle's parser
	// allocated 600, see docs/benchmarks.md).
	perByte float64
}

// repeatTo repeats unit to size bytes (cut at a whole unit), after head.
func repeatTo(head, unit, tail string, size int) string {
	n := (size - len(head) - len(tail)) / len(unit)
	return head + strings.Repeat(unit, n) + tail
}

var hostileCases = []hostileCase{
	{"hash", func(n int) string { return strings.Repeat("#", n) },
		append(repeatCodes("syntax", MaxPrinted-1), "too-many"), 0.1},
	{"random-bytes", func(n int) string { return randomText(n) }, []string{"syntax", ""}, 0.1},
	{"one-long-line", func(n int) string { return repeatTo("measure m = 1", " + t.x", "\n", n) },
		[]string{"too-long"}, 0.1},
	{"names", func(n int) string { return repeatTo("", "a ", "", n) }, []string{"too-long"}, 0.1},
	{"nested-parens", func(n int) string { return repeatTo("measure m = ", "(", "", n) }, []string{"too-deep"}, 0.1},
	{"string-literal", func(n int) string {
		return repeatTo("measure m = count(*) where t.x = '", "ab''", "'\n", n)
	}, nil, 1.5},
	{"comments", func(n int) string { return repeatTo("", "-- a comment line\n", "", n) }, nil, 0.1},
	{"declaration-keywords", func(n int) string { return repeatTo("", "table ", "", n) },
		append(repeatCodes("syntax", MaxPrinted-1), "too-many"), 0.1},
	{"many-small-tables", func(n int) string { return repeatTo("", "table t { x integer }\n", "", n) }, nil, 60},
}

func repeatCodes(code string, n int) []string {
	out := make([]string, n)
	for i := range out {
		out[i] = code
	}
	return out
}

// randomText is n bytes of a fixed pseudo-random sequence.
func randomText(n int) string {
	r := rand.New(rand.NewPCG(17, 5))
	b := make([]byte, n)
	for i := range b {
		b[i] = byte(r.Uint32())
	}
	return string(b)
}

// hostileSize is the size of the hostile inputs: 4 MiB, 1 MiB with
// -short, the size cap (MaxSourceBytes) with ROLLWISE_TEST_CAP=1.
func hostileSize() int {
	switch {
	case os.Getenv("ROLLWISE_TEST_CAP") != "":
		return MaxSourceBytes
	case testing.Short():
		return 1 << 20
	}
	return 4 << 20
}

// TestHostileInputIsBounded: each hostile input gets its bounded answer
// (at most MaxPrinted diagnostics; a declaration too long or too deep is
// refused before the parser sees it) and allocates a bounded number of
// bytes per byte of input, which a parser whose work grew faster than
// its input would not. The time is measured by BenchmarkParseHostile.
func TestHostileInputIsBounded(t *testing.T) {
	size := hostileSize()
	for _, c := range hostileCases {
		t.Run(c.name, func(t *testing.T) {
			src := c.src(size)
			var before, after runtime.MemStats
			runtime.ReadMemStats(&before)
			_, d := Parse("h.roll", src)
			runtime.ReadMemStats(&after)
			if len(d) > MaxPrinted {
				t.Fatalf("%d diagnostics, want at most %d", len(d), MaxPrinted)
			}
			for i, code := range c.codes {
				if code == "" {
					break
				}
				if i >= len(d) || d[i].Code != code {
					t.Fatalf("diagnostics %v, want codes %v", d, c.codes)
				}
			}
			if len(c.codes) == 0 || c.codes[len(c.codes)-1] != "" {
				if len(d) != len(c.codes) {
					t.Fatalf("%d diagnostics %v, want codes %v", len(d), d, c.codes)
				}
			}
			alloc := float64(after.TotalAlloc - before.TotalAlloc)
			// Besides perByte, one declaration's tokens (at most
			// MaxDeclTokens of 64 bytes, grown by doubling).
			if limit := c.perByte*float64(len(src)) + 32<<20; alloc > limit {
				t.Errorf("allocated %.1f MB for %.1f MB of input, more than %.1f bytes a byte", alloc/1e6, float64(len(src))/1e6, c.perByte)
			}
		})
	}
}

// TestDeclarationTokenLimit: a declaration of MaxDeclTokens tokens is
// parsed; one more is refused at the declaration's start, and the
// declarations after it are still parsed.
func TestDeclarationTokenLimit(t *testing.T) {
	// "measure m = 1" is 4 tokens and each " + 1" 2 more. A declaration
	// of MaxDeclTokens tokens reaches the parser, which stops at its
	// first error (parsing a valid one takes participle a second).
	fits := "measure m = 1" + strings.Repeat(" + 1", (MaxDeclTokens-4)/2)
	f, d := Parse("m.roll", "measure m = ="+fits[len("measure m = 1"):]+"\nmeasure n = 2\n")
	if len(d) != 1 || d[0].Code != "syntax" || d[0].Pos.String() != "m.roll:1:13" || len(f.Measures) != 1 {
		t.Fatalf("%d tokens: %v, %d measures", MaxDeclTokens, d, len(f.Measures))
	}
	f, d = Parse("m.roll", "measure k = 0\n"+fits+" + 1\nmeasure n = 2\n")
	if len(d) != 1 || d[0].Code != "too-long" || d[0].Pos.String() != "m.roll:2:1" || len(f.Measures) != 2 {
		t.Fatalf("%d tokens: %v, %d measures", MaxDeclTokens+2, d, len(f.Measures))
	}
	// After a skipped declaration, positions are still right.
	_, d = Parse("m.roll", "measure a = "+strings.Repeat("(", 70)+"\n-- é\nmeasure b = 'é' )\n")
	if len(d) != 2 || d[0].Code != "too-deep" || d[0].Pos.String() != "m.roll:1:77" || d[1].Pos.String() != "m.roll:3:17" {
		t.Fatalf("after a skipped declaration: %v", d)
	}
	_, d = Parse("m.roll", fits+" + 1 'é'\nmeasure b = )\n")
	if len(d) != 2 || d[0].Code != "too-long" || d[1].Pos.String() != "m.roll:2:13" {
		t.Fatalf("after a skipped declaration: %v", d)
	}
	if _, d := ParseExpr("--where", strings.Repeat("1 + ", MaxDeclTokens)+"1"); len(d) != 1 || d[0].Code != "too-long" {
		t.Fatalf("a long expression: %v", d)
	}
}

// BenchmarkParseHostile parses each hostile input at the size cap (at
// 8 MiB with -short), reporting MB/s and the bytes allocated:
//
//	go test ./grammar -run '^$' -bench ParseHostile -benchtime 1x
func BenchmarkParseHostile(b *testing.B) {
	size := MaxSourceBytes
	if testing.Short() {
		size = 8 << 20
	}
	for _, c := range hostileCases {
		src := c.src(size)
		b.Run(fmt.Sprintf("%s-%.0fMiB", c.name, float64(len(src))/(1<<20)), func(b *testing.B) {
			b.SetBytes(int64(len(src)))
			b.ReportAllocs()
			for b.Loop() {
				Parse("h.roll", src)
			}
		})
	}
}
