package report

import (
	"fmt"
	"strings"
	"testing"
	"time"

	"github.com/rollwise/rollwise/planner/model"
)

func TestHTMLSetsTotalsApartAndChartsTheSubtotals(t *testing.T) {
	// sample has two group columns: the chart by plants.family takes the
	// subtotal that rolls up sales.sold_month (Roses), not the detail rows.
	page := render(t, sample(), Options{Format: FormatHTML, Title: "revenue by family", Cautions: []string{"basket adds float values"}})
	for _, want := range []string{
		"<title>revenue by family</title>",
		`<p class="caution"><strong>caution:</strong> basket adds float values</p>`,
		`<tr class="total"><td>Roses</td><td>Total</td><td class="num">1,234,567.51</td>`,
		`<tr class="total grand"><td>All</td><td>All</td>`,
		`<td class="num">25.0%</td>`,
		"<h2>revenue by plants.family</h2>",
	} {
		if !strings.Contains(page, want) {
			t.Errorf("the page lacks %q", want)
		}
	}
	// One bar per chart (Roses), for each of the four measures.
	if n := strings.Count(page, `<g class="mark">`); n != 4 {
		t.Errorf("%d marks, want 4 (one subtotal row, four measures)", n)
	}
	if strings.Contains(page, "<script") || strings.Contains(page, "<link") {
		t.Error("the page has a script or fetches a file")
	}
}

func TestHTMLDrawsALineByDate(t *testing.T) {
	tb := &Table{Columns: []Column{{Name: "sales.month", Group: true}, {Name: "rate", Format: model.FormatPercent}}}
	// Rows out of time order: the line joins them in time order.
	for _, m := range []int{3, 1, 2} {
		tb.Rows = append(tb.Rows, Row{Values: []any{time.Date(2026, time.Month(m), 1, 0, 0, 0, 0, time.UTC), 0.5 + float64(m)/100}})
	}
	tb.Rows = append(tb.Rows, Row{Values: []any{nil, 0.52}, RolledUp: []string{"sales.month"}})
	page := render(t, tb, Options{Format: FormatHTML})
	if n := strings.Count(page, `<circle class="point"`); n != 3 {
		t.Errorf("%d points, want 3 (the total row is not charted)", n)
	}
	first, second := strings.Index(page, "<title>2026-01-01: 51.0%</title>"), strings.Index(page, "<title>2026-02-01: 52.0%</title>")
	if first < 0 || second < first {
		t.Error("the points are not in time order")
	}
	// 51% to 53%: ticks of 0.5% (0.02 / 5 ticks, rounded up to 5 times a
	// power of ten), so the axis starts at 51%, which the page says.
	if !strings.Contains(page, "the value axis starts at 51.0%, not at zero") {
		t.Error("a line far from zero does not say where its axis starts")
	}
}

func TestHTMLEscapesValuesAndCapsRows(t *testing.T) {
	tb := &Table{Columns: []Column{{Name: "t.<b>g</b>", Group: true}, {Name: "n"}}}
	tb.Rows = append(tb.Rows, Row{Values: []any{"<script>alert(1)</script>", int64(1)}})
	for i := 0; i < MaxHTMLRows+4; i++ {
		tb.Rows = append(tb.Rows, Row{Values: []any{fmt.Sprint(i), int64(i)}})
	}
	page := render(t, tb, Options{Format: FormatHTML, Title: "<img src=x>"})
	if strings.Contains(page, "<script") || strings.Contains(page, "<b>") || strings.Contains(page, "<img") {
		t.Error("markup from names or values reached the page")
	}
	if !strings.Contains(page, "&lt;script&gt;alert(1)&lt;/script&gt;") {
		t.Error("the hostile value is not shown escaped")
	}
	if n := strings.Count(page, "<tr>"); n != MaxHTMLRows+1 { // header row + MaxHTMLRows
		t.Errorf("%d table rows, want %d", n, MaxHTMLRows+1)
	}
	if !strings.Contains(page, fmt.Sprintf("the first %d rows of %d", MaxHTMLRows, MaxHTMLRows+5)) {
		t.Error("the page does not say it left rows out")
	}
	if !strings.Contains(page, "values are too many to draw") {
		t.Error("a chart of 10,005 bars was not refused")
	}
}

func TestHTMLWithoutGroupsHasNoChart(t *testing.T) {
	tb := &Table{Columns: []Column{{Name: "revenue"}}, Rows: []Row{{Values: []any{int64(5)}}}}
	page := render(t, tb, Options{Format: FormatHTML})
	if !strings.Contains(page, "No chart: the result has no group column") || strings.Contains(page, "<svg") {
		t.Error("a result without group columns should say why it has no chart")
	}
}

func TestHTMLSaysWhatTheCallerLeftOut(t *testing.T) {
	tb := &Table{Columns: []Column{{Name: "t.g", Group: true}, {Name: "n"}},
		Rows: []Row{{Values: []any{"a", int64(1)}}, {Values: []any{"b", int64(2)}}}}
	page := render(t, tb, Options{Format: FormatHTML, Omitted: 3})
	if !strings.Contains(page, "show the first 2 rows of 5") {
		t.Error("the page does not count the rows left out before it")
	}
	if _, err := NewStream(&strings.Builder{}, tb.Columns, Options{Format: FormatHTML}); err == nil {
		t.Error("a stream accepted the html format, which needs every row first")
	}
}
