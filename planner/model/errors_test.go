package model_test

import (
	"strings"
	"testing"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
)

const shop = `table sales {
  key id
  id integer
  store_id integer -> stores.id
  price decimal nonadditive
  qty integer
  note text
  day date
  balance decimal semiadditive(sales.day)
}
table stores {
  key id
  id integer
  region text
}
table repairs {
  key id
  id integer
  fee decimal
}
`

// load parses and resolves src (after the shop tables) and returns every
// diagnostic as "line:col: severity: message". t may be nil (inside a
// property).
func load(t *testing.T, src string) (*model.Model, []string) {
	if t != nil {
		t.Helper()
	}
	f, d := grammar.Parse("m.roll", shop+src)
	var m *model.Model
	if !d.HasErrors() {
		var d2 grammar.Diagnostics
		m, d2 = model.Load([]*grammar.File{f})
		d = append(d, d2...)
	}
	var out []string
	for _, x := range d {
		out = append(out, strings.TrimPrefix(x.Error(), "m.roll:")+suggestion(x))
	}
	return m, out
}

func suggestion(d *grammar.Diagnostic) string {
	s := ""
	for _, n := range d.Notes {
		s += " | note: " + n
	}
	if d.Suggestion != "" {
		s += " | hint: " + d.Suggestion
	}
	return s
}

// line is the line number of the first line after the shop tables.
var line = strings.Count(shop, "\n") + 1

func at(l, col int) string {
	return strings.TrimPrefix(grammar.Pos{Line: line + l, Col: col}.String(), "")
}

func expectErrors(t *testing.T, src string, want ...string) {
	t.Helper()
	_, got := load(t, src)
	if len(got) != len(want) {
		t.Fatalf("got %d diagnostics, want %d:\n%s", len(got), len(want), strings.Join(got, "\n"))
	}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("diagnostic %d:\n got: %s\nwant: %s", i, got[i], want[i])
		}
	}
}

func TestUnknownColumnHasHint(t *testing.T) {
	expectErrors(t, "measure m = sum(sales.qtty)\n",
		at(0, 23)+": error: unknown column 'qtty' in table sales; did you mean 'qty'?")
}

func TestUnknownMeasureHasHint(t *testing.T) {
	expectErrors(t, "measure units = sum(sales.qty)\nmeasure m = unit * 2\n",
		at(1, 13)+": error: unknown measure 'unit'; did you mean 'units'?")
}

func TestMeasureCycleIsPrinted(t *testing.T) {
	expectErrors(t, "measure a = b + sum(sales.qty)\nmeasure b = c\nmeasure c = a * 2\n",
		at(0, 9)+": error: measure a depends on itself | note: the cycle: a -> b -> c -> a")
}

func TestNonadditiveSum(t *testing.T) {
	expectErrors(t, "measure p = sum(sales.price)\n",
		at(0, 13)+": error: sum of sales.price, which is declared nonadditive: adding it across rows gives a meaningless number"+
			" | hint: write avg(sales.price), a weighted ratio such as sum(sales.price * t.qty) / sum(t.qty), or a per-grain measure such as avg(m per t.c)")
}

func TestSemiadditiveSumNeedsPin(t *testing.T) {
	expectErrors(t, "measure b = sum(sales.balance)\nmeasure ok = sum(sales.balance)[sales.day = date '2026-01-31']\n",
		at(0, 13)+": error: sum of sales.balance, which is semiadditive: it adds up across everything but sales.day"+
			" | hint: pin the date to one value, for example sum(sales.balance)[sales.day = date '2026-01-31']")
}

func TestTypeErrors(t *testing.T) {
	expectErrors(t, "measure a = sum(sales.note)\nmeasure b = max(sales.day / 2)\n",
		at(0, 17)+": error: cannot sum a text value | hint: count(distinct ...) counts values; min and max work on any type",
		at(1, 27)+": error: cannot divide a date value | hint: date arithmetic is not part of the language; use extract(year from d) or date_trunc(month, d)")
}

func TestNoIterationTable(t *testing.T) {
	expectErrors(t, "measure a = sum(sales.qty * repairs.fee)\n",
		at(0, 13)+": error: the aggregate reads tables sales, repairs, and none of them reaches all the others along links"+
			" | hint: declare a link (-> TABLE.KEY) from the fact table to the others, or split the aggregate into two measures")
}

func TestProductOfSumsWarns(t *testing.T) {
	m, got := load(t, "measure a = sum(sales.qty) * sum(sales.price * sales.qty)\n")
	if m == nil || len(got) != 1 || !strings.HasPrefix(got[0], at(0, 28)+": warning: this multiplies two totals") {
		t.Fatalf("got %v", got)
	}
}

func TestLinkErrors(t *testing.T) {
	_, got := load(t, "table a {\n  key id\n  id integer\n  r text -> stores.region\n}\n")
	if len(got) != 1 || !strings.Contains(got[0], "does not point at the key of stores") {
		t.Fatalf("link to a non-key: %v", got)
	}
	_, got = load(t, `table hq at "stores" {
  key id
  id integer
  region_id integer -> stores.id
}
table x {
  key id
  id integer
  s integer -> stores.id
  h integer -> hq.id
}
`)
	if len(got) != 1 || !strings.Contains(got[0], "two different link paths lead from x to stores") ||
		!strings.Contains(got[0], "first path: x -> stores") || !strings.Contains(got[0], "second path: x -> hq -> stores") {
		t.Fatalf("two paths: %v", got)
	}
}

// A request's parts are named in positions and messages as the caller
// names them (a command line's options), or in the request's own words.
func TestQueryErrorsHavePositions(t *testing.T) {
	m, d := load(t, "measure units = sum(sales.qty)\n")
	if m == nil {
		t.Fatal(d)
	}
	req := model.Request{Measures: []string{"units", "unts"}, By: []string{"stores.region", "sales.qtty"},
		Where: "stores.region = 'North' and sales.qty >", Order: "units, units"}
	for _, c := range []struct {
		names model.PartNames
		want  []string
	}{
		{model.PartNames{Measures: "--measures", By: "--by", Where: "--where", Order: "--order"}, []string{
			"--measures:1:7: error: unknown measure 'unts'; did you mean 'units'?",
			"--by:1:21: error: unknown column 'qtty' in table sales; did you mean 'qty'?",
			"--where:1:40: error: syntax error: unexpected end of declaration (expected a value)",
			"--order:1:8: error: --order names units twice",
		}},
		{model.PartNames{}, []string{
			"the measure list:1:7: error: unknown measure 'unts'; did you mean 'units'?",
			"the group list:1:21: error: unknown column 'qtty' in table sales; did you mean 'qty'?",
			"the filter:1:40: error: syntax error: unexpected end of declaration (expected a value)",
			"the order:1:8: error: the order names units twice",
		}},
	} {
		req.Names = c.names
		_, qd := m.NewQuery(req)
		var got []string
		for _, x := range qd {
			got = append(got, x.Error())
		}
		if strings.Join(got, "\n") != strings.Join(c.want, "\n") {
			t.Errorf("got:\n%s\nwant:\n%s", strings.Join(got, "\n"), strings.Join(c.want, "\n"))
		}
	}
}

func TestNullTextDeclaredTwice(t *testing.T) {
	expectErrors(t, "table notes with null \"NA\", \"-\", \"NA\" {\n  key id\n  id integer\n}\n",
		at(0, 34)+`: error: "NA" is already a NULL text of table notes | hint: write each text once`)
}

// TestTwoPathsThroughAChain: a table on a chain that leads into two paths
// reports them like the table where they start (the walk of a chain is
// shared along it, issue 17), with each path in full; a cycle does not
// count as a second path.
func TestTwoPathsThroughAChain(t *testing.T) {
	_, got := load(t, `table hq at "stores" {
  key id
  id integer
  region_id integer -> stores.id
}
table x {
  key id
  id integer
  s integer -> stores.id
  h integer -> hq.id
}
table y {
  key id
  id integer
  x_id integer -> x.id
}
table z {
  key id
  id integer
  y_id integer -> y.id
}
table p {
  key id
  id integer
  q_id integer -> q.id
}
table q {
  key id
  id integer
  p_id integer -> p.id
}
`)
	want := []string{"from x to stores", "from y to stores", "second path: y -> x -> hq -> stores", "from z to stores", "first path: z -> y -> x -> stores"}
	joined := strings.Join(got, "\n")
	if len(got) != 3 {
		t.Fatalf("got %d errors, want 3:\n%s", len(got), joined)
	}
	for _, w := range want {
		if !strings.Contains(joined, w) {
			t.Errorf("no %q in:\n%s", w, joined)
		}
	}
}

// TestMeasureNamedLikeGroupColumn: a measure whose name is a group
// column's output name is refused, not rendered as ambiguous SQL (issue
// 17); DuckDB compares quoted names without regard to case, so the test
// does too.
func TestMeasureNamedLikeGroupColumn(t *testing.T) {
	m, d := load(t, "measure `stores.region` = sum(sales.qty)\nmeasure `Stores.Region` = count(sales.qty)\n")
	if m == nil {
		t.Fatal(d)
	}
	for _, name := range []string{"stores.region", "Stores.Region"} {
		_, qd := m.NewQuery(model.Request{Measures: []string{"`" + name + "`"}, By: []string{"stores.region"}})
		if len(qd) != 1 || qd[0].Code != "name-clash" || !strings.Contains(qd[0].Message, "both be output columns") {
			t.Errorf("%s: %v", name, qd)
		}
	}
}

// TestNumberLiteralOutOfRange: an integer literal beyond 64 bits and a
// float literal beyond double precision are refused at check, not handed
// to the engine (which reads them as another type or an infinity).
func TestNumberLiteralOutOfRange(t *testing.T) {
	for src, want := range map[string]string{
		"measure a = sum(sales.qty) * 9223372036854775808\n": "9223372036854775808 is out of range for integer",
		"measure a = sum(sales.qty) * 1e400\n":               "1e400 is out of range for float",
	} {
		if _, got := load(t, src); len(got) != 1 || !strings.Contains(got[0], want) {
			t.Errorf("%s: %v, want %q", src, got, want)
		}
	}
	if m, got := load(t, "measure a = sum(sales.qty) * 9223372036854775807 * 1e-400\n"); m == nil {
		t.Errorf("the largest integer or an underflowing float refused: %v", got)
	}
}
