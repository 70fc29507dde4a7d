package main

import (
	"fmt"
	"strings"
	"testing"
	"time"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/pipeline"
	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
)

// Compile speed: how long checking a large model and planning a wide query
// take, on a synthetic model (docs/benchmarks.md has the figures).
//
//	go test ./cmd/rollwise -run '^$' -bench 'Check|Plan|Parse' -benchmem

// synthTables is the star schema the synthetic models measure: a fact
// table of sales lines linked to orders, products and stores, orders to
// customers, stores to regions.
const synthTables = `
table lines {
  key line_id
  line_id     integer
  order_id    integer  -> orders.order_id
  product_id  integer  -> products.product_id
  store_id    integer  -> stores.store_id
  qty         integer
  price       decimal  nonadditive
  cost        decimal  nonadditive
  discount    decimal  nonadditive
  shipped_on  date
  amount      = price * qty
  margin      = (price - cost) * qty
  ship_month  = date_trunc(month, shipped_on)
}

table orders {
  key order_id
  order_id     integer
  customer_id  integer  -> customers.customer_id
  channel      text
  ordered_on   date
}

table customers {
  key customer_id
  customer_id  integer
  segment      text
  country      text
}

table products {
  key product_id
  product_id  integer
  family      text
  brand       text
  list_price  decimal  nonadditive
}

table stores {
  key store_id
  store_id   integer
  region_id  integer  -> regions.region_id
  city       text
}

table regions {
  key region_id
  region_id  integer
  name       text
}
`

// synthBases are the shapes of the model's base measures (%d is the
// measure's number, which varies the constants so that no two measures
// are the same).
var synthBases = []string{
	"sum(lines.amount * (1 - lines.discount)) where lines.qty > %d",
	"sum(lines.margin) where products.family <> 'f%d'",
	"count(distinct lines.order_id) where orders.channel <> 'c%d'",
	"avg(lines.price) where stores.city <> 'x%d'",
	"sum(lines.qty) where lines.shipped_on >= date '2020-01-01' and lines.qty <> %d",
	"max(lines.price) where customers.segment <> 's%d'",
	"count(lines.line_id) where lines.discount < 0.%d",
}

// synthModel writes a model with n measures: one base measure in five,
// the others chains (each builds on the previous measure), fan-ins
// (combining four earlier measures, near and far), ratios, narrowings,
// cell edits (pins, drops, ungroups) and per-grain measures over earlier
// measures. Measure names are m0, m1, ...; the model always loads.
func synthModel(n int) string {
	var b strings.Builder
	b.WriteString("-- A synthetic model for the compile-speed benchmarks.\n")
	b.WriteString(synthTables)
	b.WriteString("\n")
	for i := range n {
		fmt.Fprintf(&b, "measure m%d = %s\n", i, synthMeasure(i))
	}
	return b.String()
}

// synthMeasure is the expression of measure i.
func synthMeasure(i int) string {
	if i < 5 || i%5 == 0 {
		return fmt.Sprintf(synthBases[(i/5)%len(synthBases)], i%97+1)
	}
	base := i - i%5 // the base measure of this group of five
	far := (i * 7919) % base
	switch i % 5 {
	case 1: // a chain: the previous measure, narrowed
		return fmt.Sprintf("m%d + m%d where regions.name <> 'r%d'", i-1, base, i%13)
	case 2: // fan-in of near and far measures
		return fmt.Sprintf("m%d + m%d - coalesce(m%d, 0) + m%d", i-1, i-2, far, base)
	case 3: // a ratio, or an edit of an earlier measure
		switch (i / 5) % 4 {
		case 0:
			return fmt.Sprintf("m%d / nullif(m%d, 0)", i-1, far)
		case 1:
			return fmt.Sprintf("m%d / m%d[drop products.family]", base, base)
		case 2:
			return fmt.Sprintf("m%d[customers.segment = 'seg%d'] + m%d", base, i%11, i-1)
		default:
			return fmt.Sprintf("m%d / m%d[ungroup]", i-1, base)
		}
	}
	if (i/5)%10 == 4 { // one group in ten ends with a per-grain measure
		return fmt.Sprintf("avg(m%d per lines.order_id)", base)
	}
	return fmt.Sprintf("case when m%d > %d then m%d else m%d end", i-1, i%50, far, i-3)
}

// loadSynth parses and checks a synthetic model.
func loadSynth(src string) (*model.Model, error) {
	m, diags := pipeline.Resolve([]pipeline.Source{{Name: "synthetic.roll", Text: src}})
	if diags.HasErrors() {
		return nil, fmt.Errorf("%d errors, first: %v", len(diags.Errors()), diags.Errors()[0].Error())
	}
	return m, nil
}

// synthQuery asks for 50 measures spread over the model (the deepest
// chains included), by two columns of two tables, with rollup totals and
// a filter.
func synthQuery(n int) model.Request {
	q := model.Request{
		By:     []string{"products.family", "regions.name"},
		Where:  "orders.channel <> 'none'",
		Totals: "rollup",
	}
	for k := range 50 {
		q.Measures = append(q.Measures, fmt.Sprintf("m%d", n-1-k*(n/50)))
	}
	return q
}

// TestSyntheticModel checks that the benchmarks' synthetic model loads
// and that the 50-measure query plans, on a smaller model.
func TestSyntheticModel(t *testing.T) {
	t.Parallel()
	const n = 500
	m, err := loadSynth(synthModel(n))
	if err != nil {
		t.Fatal(err)
	}
	if len(m.Measures) != n {
		t.Fatalf("%d measures, want %d", len(m.Measures), n)
	}
	spec := synthQuery(n)
	sql, err := planSQL(m, spec)
	if err != nil {
		t.Fatal(err)
	}
	for _, name := range spec.Measures {
		if !strings.Contains(sql, `AS "`+name+`"`) {
			t.Errorf("the SQL has no column %s", name)
		}
	}
	// Every kind of measure the generator makes occurs.
	src := synthModel(n)
	for _, want := range []string{"[drop ", "[ungroup]", "[customers.segment = ", " per lines.order_id)", "count(distinct ", " where "} {
		if !strings.Contains(src, want) {
			t.Errorf("the synthetic model has no %q", want)
		}
	}
}

// BenchmarkCheckModel5000 parses and checks the whole 5,000-measure model
// (the target: under 1 s).
func BenchmarkCheckModel5000(b *testing.B) {
	src := synthModel(5000)
	b.SetBytes(int64(len(src)))
	b.ReportAllocs()
	cpu := processCPU()
	for b.Loop() {
		if _, err := loadSynth(src); err != nil {
			b.Fatal(err)
		}
	}
	reportMS(b, processCPU()-cpu)
}

// BenchmarkPlan50 checks, plans and renders a 50-measure query of the
// 5,000-measure model, already loaded (the target: under 20 ms).
func BenchmarkPlan50(b *testing.B) {
	const n = 5000
	benchPlan(b, synthModel(n), synthQuery(n))
}

// benchPlan loads the model src once, then plans and renders spec in the
// benchmark's loop, reporting CPU milliseconds and the SQL's size.
func benchPlan(b *testing.B, src string, spec model.Request) {
	b.Helper()
	m, err := loadSynth(src)
	if err != nil {
		b.Fatal(err)
	}
	sql, err := planSQL(m, spec)
	if err != nil {
		b.Fatal(err)
	}
	b.ReportAllocs()
	cpu := processCPU()
	for b.Loop() {
		if _, err := planSQL(m, spec); err != nil {
			b.Fatal(err)
		}
	}
	reportMS(b, processCPU()-cpu)
	b.ReportMetric(float64(len(sql))/1024, "sql-KiB")
}

// BenchmarkParse10MB parses a model file of about 10 MB (the synthetic
// model with as many measures as it takes).
func BenchmarkParse10MB(b *testing.B) {
	src := synthModelOfSize(10 << 20)
	b.Logf("%.1f MB", float64(len(src))/1e6)
	b.SetBytes(int64(len(src)))
	b.ReportAllocs()
	cpu := processCPU()
	for b.Loop() {
		if _, diags := grammar.Parse("big.roll", src); diags.HasErrors() {
			b.Fatal(diags.Errors()[0].Error())
		}
	}
	reportMS(b, processCPU()-cpu)
}

// reportMS reports the wall time per operation in milliseconds, the unit
// of the targets, and the CPU time per operation (all threads, the
// garbage collector's included), which the machine's other work does not
// inflate.
func reportMS(b *testing.B, cpu time.Duration) {
	b.ReportMetric(float64(b.Elapsed().Microseconds())/1000/float64(b.N), "ms/op")
	if cpu > 0 {
		b.ReportMetric(float64(cpu.Microseconds())/1000/float64(b.N), "cpu-ms/op")
	}
}
