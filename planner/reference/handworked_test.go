package reference_test

import (
	"math"
	"os"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/reference"
	"github.com/rollwise/rollwise/planner/reference/expect"
)

// The hand-worked expectations of cmd/rollwise/exec_test.go, computed by
// the reference evaluator alone (no SQL). The rows of testdata/exec
// (line = price * qty):
//
//	id store region area  item  price qty cost  line  cost*qty
//	1  1     North  Hills rose   2.50  4  1.00 10.00  4.00
//	2  1     North  Hills fern  10.00  1  6.00 10.00  6.00
//	3  2     North  Coast rose   2.50  2  1.00  5.00  2.00
//	4  3     South  Coast tulip  1.20 10  0.50 12.00  5.00
//	5  3     South  Coast rose   3.00  1  1.00  3.00  1.00
//	6  9     (no store: an unmatched link)  fern 10.00 2 6.00 20.00 12.00
//
//	repairs: store 1 (North) 30.00; store 3 (South) 45.50 and 10.00;
//	store 4 (South, no sales) 20.00.

const shopModel = "../../testdata/exec/shop.roll"

// loadModel parses and resolves model files.
func loadModel(t *testing.T, paths ...string) *model.Model {
	t.Helper()
	var files []*grammar.File
	for _, p := range paths {
		src, err := os.ReadFile(p)
		if err != nil {
			t.Fatal(err)
		}
		f, d := grammar.Parse(p, string(src))
		if d.HasErrors() {
			t.Fatalf("%s: %v", p, d)
		}
		files = append(files, f)
	}
	m, d := model.Load(files)
	if d.HasErrors() {
		t.Fatalf("load: %v", d)
	}
	return m
}

// evaluate runs a query on the shop model with the reference evaluator.
func evaluate(t *testing.T, spec model.QuerySpec) []map[string]any {
	t.Helper()
	return evaluateOn(t, loadModel(t, shopModel), spec)
}

func evaluateOn(t *testing.T, m *model.Model, spec model.QuerySpec) []map[string]any {
	t.Helper()
	if spec.Totals == "" {
		spec.Totals = "none"
	}
	q, d := m.NewQuery(spec)
	if d.HasErrors() {
		t.Fatalf("query: %v", d)
	}
	res, err := reference.Evaluate(m, q, "")
	if err != nil {
		t.Fatalf("evaluate: %v", err)
	}
	return res.JSON()
}

// The same expectations as the SQL path's tests (package expect).
type row = expect.Row

var expectRows, none = expect.Rows, expect.None

func spec(measures, by string, totals string) model.QuerySpec {
	s := model.QuerySpec{Measures: strings.Split(measures, ","), Totals: totals}
	if by != "" {
		s.By = strings.Split(by, ",")
	}
	return s
}

// The total of a ratio is the ratio of the totals: not the sum (1.52) nor
// the average (0.5067) of the rows' ratios.
func TestRatioTotalIsReevaluated(t *testing.T) {
	got := evaluate(t, spec("revenue,cost,margin_rate", "stores.region", "grand"))
	expectRows(t, got, []row{
		{"stores.region": "North", "revenue": "25.00", "cost": "12.00", "margin_rate": 0.52, "rolled_up": none},                 // 10+10+5; 4+6+2; 13/25
		{"stores.region": "South", "revenue": "15.00", "cost": "6.00", "margin_rate": 0.6, "rolled_up": none},                   // 12+3; 5+1; 9/15
		{"stores.region": nil, "revenue": "20.00", "cost": "12.00", "margin_rate": 0.4, "rolled_up": none},                      // unmatched link: 20; 12; 8/20
		{"stores.region": nil, "revenue": "60.00", "cost": "30.00", "margin_rate": 0.5, "rolled_up": []string{"stores.region"}}, // 30/60
	})
}

// A count distinct total is not the sum of the rows' counts (2+2+1 = 5).
func TestDistinctCountTotal(t *testing.T) {
	got := evaluate(t, spec("items,lines", "stores.region", "grand"))
	expectRows(t, got, []row{
		{"stores.region": "North", "items": 2, "lines": 3},                                     // rose, fern
		{"stores.region": "South", "items": 2, "lines": 2},                                     // tulip, rose
		{"stores.region": nil, "items": 1, "lines": 1},                                         // fern
		{"stores.region": nil, "items": 3, "lines": 6, "rolled_up": []string{"stores.region"}}, // rose, fern, tulip
	})
}

// sum(a*b) is computed row by row and differs from sum(a)*sum(b).
func TestSumOfProductIsRowByRow(t *testing.T) {
	got := evaluate(t, spec("qty_sq,qty_product", "stores.region", "grand"))
	expectRows(t, got, []row{
		{"stores.region": "North", "qty_sq": 21, "qty_product": 49},   // 16+1+4; 7*7
		{"stores.region": "South", "qty_sq": 101, "qty_product": 121}, // 100+1; 11*11
		{"stores.region": nil, "qty_sq": 4, "qty_product": 4},         // 2*2
		{"stores.region": nil, "qty_sq": 126, "qty_product": 400},     // 21+101+4; 20*20
	})
}

// Measures over two iteration tables meet on the group values: no row is
// counted twice (a naive sales-repairs join would double South's revenue
// to 30 and its fees to 111).
func TestTwoIterationTablesNoFanOut(t *testing.T) {
	got := evaluate(t, spec("revenue,fees,jobs,takings,per_job", "stores.region", "grand"))
	expectRows(t, got, []row{
		{"stores.region": "North", "revenue": "25.00", "fees": "30.00", "jobs": 1, "takings": "55.00", "per_job": 30.0},
		{"stores.region": "South", "revenue": "15.00", "fees": "75.50", "jobs": 3, "takings": "90.50", "per_job": 75.5 / 3}, // 45.5+10+20
		{"stores.region": nil, "revenue": "20.00", "fees": nil, "jobs": 0, "takings": "20.00", "per_job": nil},              // no repairs: count 0, sum null
		{"stores.region": nil, "revenue": "60.00", "fees": "105.50", "jobs": 4, "takings": "165.50", "per_job": 105.5 / 4},
	})
}

// Rollup over a snowflake (sales -> stores -> districts): each subtotal is
// re-evaluated over its own cell, and comes after its group.
func TestRollupOverSnowflake(t *testing.T) {
	got := evaluate(t, spec("revenue,units", "districts.area,sales.item", "rollup"))
	area := []string{"sales.item"}
	both := []string{"districts.area", "sales.item"}
	expectRows(t, got, []row{
		{"districts.area": "Coast", "sales.item": "rose", "revenue": "8.00", "units": 3, "rolled_up": none}, // 5+3; 2+1
		{"districts.area": "Coast", "sales.item": "tulip", "revenue": "12.00", "units": 10},
		{"districts.area": "Coast", "sales.item": nil, "revenue": "20.00", "units": 13, "rolled_up": area},
		{"districts.area": "Hills", "sales.item": "fern", "revenue": "10.00", "units": 1},
		{"districts.area": "Hills", "sales.item": "rose", "revenue": "10.00", "units": 4},
		{"districts.area": "Hills", "sales.item": nil, "revenue": "20.00", "units": 5, "rolled_up": area},
		{"districts.area": nil, "sales.item": "fern", "revenue": "20.00", "units": 2, "rolled_up": none}, // the unmatched line
		{"districts.area": nil, "sales.item": nil, "revenue": "20.00", "units": 2, "rolled_up": area},
		{"districts.area": nil, "sales.item": nil, "revenue": "60.00", "units": 20, "rolled_up": both},
	})
}

// --totals all: every subset of the groups, each re-evaluated.
func TestTotalsAll(t *testing.T) {
	got := evaluate(t, spec("units", "stores.region,sales.item", "all"))
	reg := []string{"stores.region"}
	expectRows(t, got, []row{
		{"stores.region": "North", "sales.item": "fern", "units": 1},
		{"stores.region": "North", "sales.item": "rose", "units": 6}, // 4+2
		{"stores.region": "North", "sales.item": nil, "units": 7, "rolled_up": []string{"sales.item"}},
		{"stores.region": "South", "sales.item": "rose", "units": 1},
		{"stores.region": "South", "sales.item": "tulip", "units": 10},
		{"stores.region": "South", "sales.item": nil, "units": 11},
		{"stores.region": nil, "sales.item": "fern", "units": 2, "rolled_up": none},
		{"stores.region": nil, "sales.item": nil, "units": 2, "rolled_up": []string{"sales.item"}},
		{"stores.region": nil, "sales.item": "fern", "units": 3, "rolled_up": reg}, // 1+2
		{"stores.region": nil, "sales.item": "rose", "units": 7, "rolled_up": reg}, // 4+2+1
		{"stores.region": nil, "sales.item": "tulip", "units": 10, "rolled_up": reg},
		{"stores.region": nil, "sales.item": nil, "units": 20, "rolled_up": []string{"stores.region", "sales.item"}},
	})
}

// A --where filter applies to every cell, totals included; a narrowing
// applies inside its measure only.
func TestFilterAndNarrowing(t *testing.T) {
	s := spec("revenue,roses,rose_share", "stores.region", "grand")
	s.Where = "stores.region = 'North'"
	expectRows(t, evaluate(t, s), []row{
		{"stores.region": "North", "revenue": "25.00", "roses": "15.00", "rose_share": 0.6}, // roses 10+5
		{"stores.region": nil, "revenue": "25.00", "roses": "15.00", "rose_share": 0.6, "rolled_up": []string{"stores.region"}},
	})
	s = spec("revenue", "sales.item", "")
	s.Where = "sales.qty >= 2"
	expectRows(t, evaluate(t, s), []row{
		{"sales.item": "fern", "revenue": "20.00"},  // line 6 only
		{"sales.item": "rose", "revenue": "15.00"},  // 10+5
		{"sales.item": "tulip", "revenue": "12.00"}, // line 4
	})
}

// Statistics: avg, the continuous median, the sample stddev and variance.
func TestStatistics(t *testing.T) {
	got := evaluate(t, spec("avg_price,mid_line,line_sd,line_var,cheapest", "", ""))
	expectRows(t, got, []row{{
		"avg_price": 29.2 / 6,        // (2.5+10+2.5+1.2+3+10)/6
		"mid_line":  10.0,            // lines 3,5,10,10,12,20: (10+10)/2
		"line_var":  35.6,            // mean 10; squares 0+0+25+4+49+100 = 178; 178/(6-1)
		"line_sd":   math.Sqrt(35.6), // sample standard deviation
		"cheapest":  "1.20",
		"rolled_up": none,
	}})
}

// --order and --limit sort and cut the detail rows; the total row stays,
// computed over every row, not just the ones shown.
func TestOrderAndLimit(t *testing.T) {
	s := spec("revenue", "sales.item", "grand")
	s.Order, s.Limit = "revenue desc", 2
	expectRows(t, evaluate(t, s), []row{
		{"sales.item": "fern", "revenue": "30.00"}, // 10+20
		{"sales.item": "rose", "revenue": "18.00"}, // 10+5+3
		{"sales.item": nil, "revenue": "60.00", "rolled_up": []string{"sales.item"}},
	})
}

// A filter that keeps no row leaves the grand total cell: sum of nothing is
// null, count of nothing is 0.
func TestEmptyCell(t *testing.T) {
	s := spec("revenue,lines", "stores.region", "grand")
	s.Where = "stores.region = 'East'"
	expectRows(t, evaluate(t, s), []row{
		{"stores.region": nil, "revenue": nil, "lines": 0, "rolled_up": []string{"stores.region"}},
	})
}
