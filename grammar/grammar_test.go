package grammar

import (
	"flag"
	"os"
	"strings"
	"testing"
)

var update = flag.Bool("update", false, "rewrite golden files")

// The EBNF participle prints is committed, so every grammar change shows up
// in review.
func TestEBNFGolden(t *testing.T) {
	got := EBNF() + "\n"
	const path = "testdata/grammar.ebnf"
	if *update {
		if err := os.WriteFile(path, []byte(got), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run go test ./grammar -update)", err)
	}
	if got != string(want) {
		t.Errorf("the grammar changed; review and run go test ./grammar -update\ngot:\n%s", got)
	}
}

func TestParseExampleModel(t *testing.T) {
	b, err := os.ReadFile("../testdata/models/example.roll")
	if err != nil {
		t.Fatal(err)
	}
	f, d := Parse("example.roll", string(b))
	if len(d) != 0 {
		t.Fatalf("unexpected diagnostics: %v", d)
	}
	if len(f.Tables) != 3 || len(f.Measures) != 11 || len(f.Views) != 1 {
		t.Fatalf("got %d tables, %d measures, %d views; want 3, 11, 1", len(f.Tables), len(f.Measures), len(f.Views))
	}
	sales := f.Tables[0]
	if sales.At.Value != "retail.sales_lines" || sales.From.Value != "sales.csv" || sales.Key[0].Name != "line_id" {
		t.Errorf("sales header parsed as %+v", sales)
	}
	if c := sales.Columns[3]; c.Name.Name != "store_id" || c.Link.Table != "stores" || c.Link.Name != "store_id" {
		t.Errorf("link option parsed as %+v", c)
	}
	if c := sales.Columns[5]; c.Name.Name != "unit_price" || c.Additivity != NonAdditive {
		t.Errorf("nonadditive parsed as %+v", c)
	}
	// measure big_baskets = count(* per sales.receipt_id having revenue > 100)
	bb := f.Measures[6].Expr.(*Call)
	if !bb.Star || len(bb.Per) != 1 || bb.Per[0].Table != "sales" || bb.Having == nil {
		t.Errorf("per-grain parsed as %+v", bb)
	}
	if bb.Pos.Line != 37 || bb.Pos.Col != 25 {
		t.Errorf("big_baskets at %s, want line 37 col 25", bb.Pos)
	}
	// measure family_share = revenue / revenue[drop plants.family]
	share := f.Measures[8].Expr.(*Binary)
	ed := share.R.(*Edited)
	if ed.Edits[0].Kind != EditDrop || ed.Edits[0].Target.Name != "family" {
		t.Errorf("edit parsed as %+v", ed.Edits[0])
	}
	v := f.Views[0]
	if !v.HasTotals || v.TotalsMode != nil || len(v.By) != 2 || v.By[1].Name != "sold_month" {
		t.Errorf("view parsed as %+v", v)
	}
}

func TestParseForms(t *testing.T) {
	src := `
-- every normative form
table t at "s.t" {
  key a, b
  a integer
  b text
  ` + "`order`" + ` date
  c decimal semiadditive(t.` + "`order`" + `)
  d = case when a > 1 then 'x' else 'y' end
  link (a, b) -> u (x, y) required
  e integer -> v.k REQUIRED nonadditive
  f integer -> w.k
}
measure m1 = sum(t.c)[t.order = date '2026-01-31'; drop u.z; ungroup t.b; ungroup; drop]
measure m2 = avg(m1 per t.a, t.b having m1 > 0) format Percent "doc ""quoted"""
measure m3 = m1[t.b in ('a', 'b''c')] where t.a between 1 and 2 and not t.b is null
measure m4 = count(distinct t.b) + -round(m1, 2) * 1e-3 / coalesce(m1, 0)
measure m5 = (m1 where t.b <> 'x')[drop t]
view v = m1, m2 by t.a where t.b not in ('q') with totals all
`
	f, d := Parse("forms.roll", src)
	if len(d) != 0 {
		t.Fatalf("unexpected diagnostics: %v", d)
	}
	if got := f.Tables[0].Columns[2].Name.Name; got != "order" {
		t.Errorf("backquoted name = %q", got)
	}
	if l := f.Tables[0].Links[0]; !l.Required || l.Table.Name != "u" {
		t.Errorf("required link = %+v", l)
	}
	if e, g := f.Tables[0].Columns[5], f.Tables[0].Columns[6]; !e.LinkRequired || e.Link.Table != "v" || e.Additivity != NonAdditive || g.LinkRequired {
		t.Errorf("required link options = %+v, %+v", e, g)
	}
	m1 := f.Measures[0].Expr.(*Edited)
	if len(m1.Edits) != 5 || m1.Edits[3].Target != nil || m1.Edits[4].Kind != EditDrop {
		t.Errorf("edits = %+v", m1.Edits)
	}
	if f.Measures[1].Doc != `doc "quoted"` || f.Measures[1].Format.Name != "Percent" {
		t.Errorf("measure options = %q %q", f.Measures[1].Doc, f.Measures[1].Format.Name)
	}
	m3 := f.Measures[2].Expr.(*Narrow)
	pin := m3.X.(*Edited).Edits[0]
	if !pin.InList || len(pin.Values) != 2 || pin.Values[1].(*StringValue).Value != "b'c" {
		t.Errorf("pin = %+v", pin)
	}
	if f.Views[0].TotalsMode.Name != "all" {
		t.Errorf("totals mode = %v", f.Views[0].TotalsMode)
	}
}

func TestSyntaxErrors(t *testing.T) {
	cases := []struct {
		src  string
		want []string
	}{
		{"measure a = sum(x.y\nmeasure b = 1 +\nmeasure c = sum(t.c)",
			[]string{"bad.roll:1:20: error: syntax error: unexpected end of declaration (expected \")\")",
				"bad.roll:2:16: error: syntax error: unexpected end of declaration (expected a value)"}},
		{"measure a = sum(t.c) where t.s = 'open", []string{"bad.roll:1:34: error: unterminated string"}},
		{"measure a = sum(t.c) # 2", []string{"bad.roll:1:22: error: unexpected character \"#\""}},
		// A keyword cannot be a column name; the table ends there, and the
		// stray measure is reported on its own.
		{"table t { key k\n k integer\n measure text }", []string{
			"bad.roll:2:11: error: syntax error: unexpected end of declaration (expected \"}\")",
			`bad.roll:3:15: error: syntax error: unexpected token "}" (expected "=")`}},
	}
	for _, c := range cases {
		_, d := Parse("bad.roll", c.src)
		if len(d) != len(c.want) {
			t.Errorf("%q: got %d diagnostics %v, want %d", c.src, len(d), d, len(c.want))
			continue
		}
		for i, w := range c.want {
			if got := d[i].Error(); !strings.HasPrefix(got, w) {
				t.Errorf("%q: got %q, want prefix %q", c.src, got, w)
			}
		}
	}
}

func TestHostileInputIsRefused(t *testing.T) {
	deep := "measure a = " + strings.Repeat("(", 10000) + "1" + strings.Repeat(")", 10000)
	_, d := Parse("deep.roll", deep)
	if len(d) != 1 || d[0].Code != "too-deep" || d[0].Pos.Col != 12+MaxNesting+1 {
		t.Fatalf("deep nesting: %v", d)
	}
	big := strings.Repeat("-", MaxSourceBytes+1)
	_, d = Parse("big.roll", big)
	if len(d) != 1 || d[0].Code != "too-large" {
		t.Fatalf("big file: %v", d)
	}
}

func TestDiagnosticsPrintCaret(t *testing.T) {
	src := "measure a = sum(t.c)\nmeasure b = revnue\n"
	var l Diagnostics
	d := l.Errorf(Pos{File: "m.roll", Offset: 33, Line: 2, Col: 13}, "unknown-measure", "unknown measure 'revnue'; did you mean 'revenue'?")
	d.Suggestion = "check the spelling"
	var b strings.Builder
	l.Print(&b, Sources{"m.roll": src}, false)
	want := "m.roll:2:13: error: unknown measure 'revnue'; did you mean 'revenue'?\n" +
		"    2 | measure b = revnue\n" +
		"      |             ^\n" +
		"  hint: check the spelling\n"
	if b.String() != want {
		t.Errorf("got:\n%s\nwant:\n%s", b.String(), want)
	}
}

func TestClosest(t *testing.T) {
	names := []string{"revenue", "receipts", "margin_rate"}
	for in, want := range map[string]string{"revnue": "revenue", "Revenue": "revenue", "margin": "", "xyz": "", "recipts": "receipts"} {
		if got := Closest(in, names); got != want {
			t.Errorf("Closest(%q) = %q, want %q", in, got, want)
		}
	}
}
