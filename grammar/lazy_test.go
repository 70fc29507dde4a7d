package grammar_test

import (
	"strings"
	"testing"

	"github.com/rollwise/rollwise/grammar"
)

// TestParseLazyMatchesParse: a measure of ParseLazy, its expression
// parsed again by Expression, is the measure Parse gives, with the same
// positions, where positions are easiest to get wrong: after a byte order
// mark, multi-byte characters, tabs and CRLF line ends, at the end of a
// file without a newline, after a declaration refused for its nesting,
// and after syntax errors (FastPathDiff compares the two ways on every
// input of TestFastPathMatchesParticiple and FuzzFastPath too).
func TestParseLazyMatchesParse(t *testing.T) {
	tables := "table t {\n  x integer\n  `é name` text\n}\n"
	for _, src := range []string{
		"\uFEFFmeasure a = sum(t.x)\n" + tables,
		tables + "-- é ü 中\nmeasure `m é` = sum(t.x) where t.`é name` = 'é''ü'\n\tmeasure b = `m é` + 1 format percent \"doc é\"\n",
		tables + "measure a = sum(t.x)\r\nmeasure b = a[drop t.x; ungroup] / nullif(a, 0)\r\n",
		tables + "measure a = case when sum(t.x) > 1 then 1 else 0 end",
		"measure a = " + strings.Repeat("(", 70) + "\nmeasure b = sum(t.x) + 'é'\n" + tables,
		"measure a = = 1\nmeasure b = sum(t.x)\ntable\nmeasure c = avg(sum(t.x) per t.x)\n",
		"view v = a by t.x\nmeasure a = count(*) where t.x in (1, 2) and not t.x is null\n" + tables,
	} {
		if diff, _, _ := grammar.FastPathDiff(src); diff != "" {
			t.Errorf("%s\ninput:\n%s", diff, src)
		}
		f, _ := grammar.ParseLazy("m.roll", src)
		for _, m := range f.Measures {
			if m.Expr != nil || m.Expression() == nil {
				t.Errorf("measure %s: kept %v, parsed again %v", m.Name.Name, m.Expr, m.Expression())
			}
		}
	}
}
