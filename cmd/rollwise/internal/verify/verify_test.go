package verify

import (
	"math"
	"strings"
	"testing"
	"time"

	"github.com/shopspring/decimal"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/pipeline"
	"github.com/rollwise/rollwise/planner/model"
)

func dec(s string) Value { return exactValue(decimal.RequireFromString(s)) }

func TestAgree(t *testing.T) {
	cases := []struct {
		a, b Value
		tol  float64
		want bool
	}{
		{dec("10.00"), dec("10"), 1e-9, true},                // exact: scale does not matter
		{dec("10.000000001"), dec("10"), 0.1, false},         // exact: tolerance does not apply
		{floatValue(0.5), dec("0.5"), 0, true},               // one inexact side
		{floatValue(0.1 + 0.2), floatValue(0.3), 1e-9, true}, // float noise
		{floatValue(1.52), floatValue(0.5), 1e-9, false},
		{floatValue(1000.001), floatValue(1000), 1e-6, true}, // relative to the larger value
		{floatValue(1000.01), floatValue(1000), 1e-6, false},
		{floatValue(1e-12), floatValue(0), 1e-9, true}, // absolute below 1
		{Null, Null, 0, true},
		{Null, dec("0"), 1, false},
		{floatValue(math.NaN()), floatValue(math.NaN()), 0, true},
		{floatValue(math.Inf(1)), floatValue(1e308), 1, false},
	}
	for i, c := range cases {
		if got := Agree(c.a, c.b, c.tol); got != c.want {
			t.Errorf("case %d: Agree(%v, %v, %g) = %v", i, c.a, c.b, c.tol, got)
		}
		if got := Agree(c.b, c.a, c.tol); got != c.want {
			t.Errorf("case %d: Agree is not symmetric", i)
		}
	}
}

// Group values read from two queries may come in different types.
func TestKeyText(t *testing.T) {
	same := [][2]any{
		{int64(5), decimal.RequireFromString("5.00")},
		{int64(5), 5.0},
		{time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC), time.Date(2026, 3, 1, 0, 0, 0, 0, time.UTC)},
	}
	for _, p := range same {
		if keyText(p[0]) != keyText(p[1]) {
			t.Errorf("%v and %v should be the same key: %q, %q", p[0], p[1], keyText(p[0]), keyText(p[1]))
		}
	}
	differ := [][2]any{{"5", int64(5)}, {nil, "(null)"}, {nil, ""}, {true, "true"}}
	for _, p := range differ {
		if keyText(p[0]) == keyText(p[1]) {
			t.Errorf("%#v and %#v should differ", p[0], p[1])
		}
	}
}

func row(mask uint64, keys ...any) resultRow {
	return resultRow{keys: keys, mask: mask, known: true}
}

func unknown(keys ...any) resultRow { return resultRow{keys: keys} }

func index(rows []resultRow) map[string]int {
	m := map[string]int{}
	for i, r := range rows {
		m[cellKey(r.mask, r.keys)] = i
	}
	return m
}

// A rollup over one column with a genuine NULL group: the NULL rows are
// ambiguous; without a genuine NULL group, the NULL row is the total.
func TestAlignNullGroupAndTotal(t *testing.T) {
	sets := []uint64{0, 1}
	comp := []resultRow{row(0, "North"), row(0, nil), row(1, nil)}
	h := &handwritten{rows: []resultRow{unknown("North"), unknown(nil), unknown(nil)}}
	a := align(1, sets, comp, index(comp), h)
	if len(a.pairs) != 1 || a.pairs[0] != 0 {
		t.Errorf("pairs = %v, want North only", a.pairs)
	}
	if len(a.ambiguous) != 1 || len(a.ambiguous[0].hw) != 2 || len(a.ambiguous[0].comp) != 2 {
		t.Fatalf("ambiguous = %+v", a.ambiguous)
	}
	if len(a.sqlOnly)+len(a.rwOnly) != 0 {
		t.Errorf("one-sided rows: %v %v", a.sqlOnly, a.rwOnly)
	}

	comp = []resultRow{row(0, "North"), row(0, "South"), row(1, nil)}
	h = &handwritten{rows: []resultRow{unknown("South"), unknown(nil), unknown("North")}}
	a = align(1, sets, comp, index(comp), h)
	if len(a.pairs) != 3 || a.pairs[2] != 1 || len(a.ambiguous) != 0 {
		t.Errorf("pairs = %v, ambiguous = %v; want the NULL row matched with the total", a.pairs, a.ambiguous)
	}
}

// With known masks (a grouping column), rows match exactly; a second
// handwritten row for one cell is ambiguous; extra rows are one-sided.
func TestAlignKnownMasks(t *testing.T) {
	sets := []uint64{0, 1, 3}
	comp := []resultRow{row(0, nil, "fern"), row(1, nil, nil), row(3, nil, nil), row(0, "Coast", "rose")}
	h := &handwritten{rows: []resultRow{row(3, nil, nil), row(1, nil, "ignored"), row(0, nil, "fern"),
		row(0, nil, "fern"), row(2, nil, "rose")}, masks: []uint64{3, 1, 0, 0, 2}}
	a := align(2, sets, comp, index(comp), h)
	if a.pairs[1] != 1 || a.pairs[2] != 0 {
		t.Errorf("pairs = %v", a.pairs)
	}
	if len(a.ambiguous) != 1 || len(a.ambiguous[0].hw) != 2 {
		t.Errorf("ambiguous = %+v, want the two (NULL, fern) rows", a.ambiguous)
	}
	if len(a.sqlOnly) != 1 || a.sqlOnly[0] != 4 {
		t.Errorf("sql only = %v, want the (2, rose) row", a.sqlOnly)
	}
	if len(a.rwOnly) != 1 || a.rwOnly[0] != 3 {
		t.Errorf("rollwise only = %v, want (Coast, rose)", a.rwOnly)
	}
}

func TestMapColumns(t *testing.T) {
	lay, err := mapColumns([]string{"REGION", "stores.id", "total", "g", "extra"},
		[]string{"stores.region", "stores.id"}, []string{"revenue"}, map[string]string{"revenue": "total"}, "g")
	if err != nil {
		t.Fatal(err)
	}
	if lay.groups[0] != 0 || lay.groups[1] != 1 || lay.measures[0] != 2 || lay.gcol != 3 ||
		len(lay.unused) != 1 || lay.unused[0] != "extra" {
		t.Errorf("layout = %+v", lay)
	}
	bad := []struct {
		cols, groups, measures []string
		want                   string
	}{
		{[]string{"id", "revenue"}, []string{"stores.id", "districts.id"}, []string{"revenue"}, "several --by columns are named id"},
		{[]string{"region", "revenu"}, []string{"stores.region"}, []string{"revenue"}, "did you mean revenu?"},
		{[]string{"region", "Region", "revenue"}, []string{"stores.REGION"}, []string{"revenue"}, "two columns named region and Region"},
		{[]string{"revenue"}, []string{"stores.revenue"}, []string{"revenue"}, "would be both"},
	}
	for _, c := range bad {
		_, err := mapColumns(c.cols, c.groups, c.measures, nil, "")
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%v: error %v, want %q", c.cols, err, c.want)
		}
		if k, _ := failure.KindOf(err); err != nil && k != failure.Usage {
			t.Errorf("%v: %v is not a usage error", c.cols, err)
		}
	}
}

// loadShop loads the shop model with its edits.
func loadShop(t *testing.T) *model.Model {
	t.Helper()
	m, diags, err := pipeline.Load([]string{"../../../../testdata/exec/shop.roll", "../../../../testdata/exec/edits.roll", "../../../../testdata/verify/extra.roll"})
	if err != nil {
		t.Fatalf("%v\n%v", err, diags.Err())
	}
	return m.Model
}

func formulaTexts(fs []formula) []string {
	var out []string
	for _, f := range fs {
		out = append(out, f.name+": "+model.Text(f.expr)+" | "+f.detail)
	}
	return out
}

// The wrong formulas, as rewritten expressions: each must differ from the
// measure in exactly the way its name says.
func TestFormulas(t *testing.T) {
	m := loadShop(t)
	cases := []struct {
		measure string
		make    func(*model.Measure) []formula
		want    []string
	}{
		{"revenue", productOfSums, []string{
			"product-of-sums: (sum(sales.price) * sum(sales.qty)) | sum(sales.price) * sum(sales.qty) in place of sum(sales.price * sales.qty)"}},
		{"mid_line", productOfSums, nil}, // a median of a product is no sum
		// Each distinct sum(a * b) is replaced everywhere it occurs (revenue
		// twice), then all of them together.
		{"margin_rate", productOfSums, []string{
			"product-of-sums: (((sum(sales.price) * sum(sales.qty)) - sum((sales.cost * sales.qty))) / (sum(sales.price) * sum(sales.qty))) | sum(sales.price) * sum(sales.qty) in place of sum(sales.price * sales.qty)",
			"product-of-sums: ((sum((sales.price * sales.qty)) - (sum(sales.cost) * sum(sales.qty))) / sum((sales.price * sales.qty))) | sum(sales.cost) * sum(sales.qty) in place of sum(sales.cost * sales.qty)",
			"product-of-sums: (((sum(sales.price) * sum(sales.qty)) - (sum(sales.cost) * sum(sales.qty))) / (sum(sales.price) * sum(sales.qty))) | " +
				"sum(sales.price) * sum(sales.qty) in place of sum(sales.price * sales.qty); sum(sales.cost) * sum(sales.qty) in place of sum(sales.cost * sales.qty)"}},
		{"roses", narrowingIgnored, []string{
			"filter-ignored: sum((sales.price * sales.qty)) | the narrowing `where sales.item = 'rose'` is not applied"}},
		{"rose_rev", narrowingIgnored, []string{
			"filter-ignored: sum((sales.price * sales.qty)) | the pin [sales.item = 'rose'] is not applied"}},
		{"region_share", filterLeaked, []string{
			"filter-leaked: (sum((sales.price * sales.qty)) / (sum((sales.price * sales.qty)))[ungroup stores.region]) | [drop stores.region] keeps the query's filters, as [ungroup stores.region] does"}},
		{"shown_share", filterLeaked, nil}, // ungroup already keeps the filters
		{"visit_minutes", nullAsZero, []string{
			"null-as-zero: avg(coalesce(visits.minutes, 0)) | NULL values counted as 0 in avg(visits.minutes)"}},
		{"items", nullAsZero, nil}, // a text column has no zero
	}
	for _, c := range cases {
		mm := m.Measure(c.measure)
		if mm == nil {
			t.Fatalf("no measure %s", c.measure)
		}
		got := formulaTexts(c.make(mm))
		if strings.Join(got, "\n") != strings.Join(c.want, "\n") {
			t.Errorf("%s:\ngot:\n  %s\nwant:\n  %s", c.measure, strings.Join(got, "\n  "), strings.Join(c.want, "\n  "))
		}
		// The model's own measure is never changed.
		if c.measure == "revenue" && model.Text(mm.Expr) != "sum((sales.price * sales.qty))" {
			t.Errorf("revenue was changed: %s", model.Text(mm.Expr))
		}
	}
}

func TestRatioKind(t *testing.T) {
	m := loadShop(t)
	want := map[string]string{"margin_rate": "ratio", "unit_revenue": "ratio", "avg_price": "ratio",
		"items": "distinct", "revenue": "", "qty_product": "", "store_avg": "ratio"}
	for name, kind := range want {
		if got := ratioKind(m.Measure(name)); got != kind {
			t.Errorf("ratioKind(%s) = %q, want %q", name, got, kind)
		}
	}
}

// Weighted aggregates count each row as many times as a join would repeat
// it; distinct counts and extremes are unchanged; a median cannot be
// weighted.
func TestWeighted(t *testing.T) {
	m := loadShop(t)
	sales := m.Table("sales")
	w := &model.Column{Table: sales, Name: "w", Type: model.TypeInteger}
	cases := map[string]string{
		"revenue":   "sum(((sales.price * sales.qty) * sales.w))",
		"lines":     "coalesce(sum(case when (sales.id is not null) then sales.w end), 0)",
		"avg_price": "(sum((sales.price * sales.w)) / sum(case when (sales.price is not null) then sales.w end))",
		"items":     "count(distinct sales.item)",
		"cheapest":  "min(sales.price)",
		"fees":      "sum(repairs.fee)", // another table: unchanged
	}
	for name, want := range cases {
		e, ok := weighted(m.Measure(name), sales, w)
		if got := model.Text(e); !ok || got != want {
			t.Errorf("weighted(%s) = %s (%v), want %s", name, got, ok, want)
		}
	}
	if _, ok := weighted(m.Measure("mid_line"), sales, w); ok {
		t.Errorf("a median cannot be weighted")
	}
}
