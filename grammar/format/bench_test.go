package format_test

import (
	"os"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/grammar/format"
)

// BenchmarkFormat formats the TPC-H model (testdata/tpch/tpch.roll, 178
// lines), and parses it alone for comparison: the formatter parses the
// file, then lexes it again with its comments, and lays it out.
// Reported: lines per second, and format's time over parse's.
func BenchmarkFormat(b *testing.B) {
	src, err := os.ReadFile("../../testdata/tpch/tpch.roll")
	if err != nil {
		b.Fatal(err)
	}
	lines := float64(strings.Count(string(src), "\n"))
	var parse, formatted float64
	b.Run("parse", func(b *testing.B) {
		for b.Loop() {
			grammar.Parse("tpch.roll", string(src))
		}
		parse = float64(b.Elapsed().Nanoseconds()) / float64(b.N)
	})
	b.Run("format", func(b *testing.B) {
		for b.Loop() {
			if _, d := format.Source("tpch.roll", string(src)); d != nil {
				b.Fatal(d)
			}
		}
		formatted = float64(b.Elapsed().Nanoseconds()) / float64(b.N)
		b.ReportMetric(lines/(formatted/1e9), "lines/s")
		if parse > 0 {
			b.ReportMetric(formatted/parse, "format/parse")
		}
	})
}
