package report

import (
	"fmt"
	"html/template"
	"io"
	"math"
	"sort"
	"time"

	"github.com/shopspring/decimal"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/drawing"
)

// HTML limits. The html format needs every row before it writes (a chart
// scales to all its values), so it is written whole by Write, never by a
// Stream; past MaxHTMLRows rows the page shows the first ones and says
// how many it left out. A bar chart takes at most maxBars bars, a line chart at most
// maxPoints points; past that the page says the chart is left out.
const (
	MaxHTMLRows = 10000
	maxBars     = 120
	maxPoints   = 5000
)

// chartPicture is one chart of the page, or the reason it is left out.
type chartPicture struct {
	Title string
	SVG   template.HTML
	Note  string
}

type htmlRow struct {
	Cells []string
	Total bool
	Grand bool
}

type htmlPage struct {
	Title    string
	Style    template.CSS
	Cautions []string
	Header   []string
	Numeric  []bool
	Rows     []htmlRow
	Left     string
	Charts   []chartPicture
	Note     string
}

// writeHTML writes one self-contained page: the title, the cautions, a
// chart for each measure that suits one, and the table with total rows
// set apart. Nothing on it is fetched and nothing runs. Past MaxHTMLRows
// rows (or with o.Omitted rows left out before) it says how many rows it
// does not show.
func writeHTML(w io.Writer, t *Table, o Options) error {
	if len(t.Rows) > MaxHTMLRows {
		o.Omitted += len(t.Rows) - MaxHTMLRows
		t = &Table{Columns: t.Columns, Rows: t.Rows[:MaxHTMLRows]}
	}
	p, err := prepareAll(t)
	if err != nil {
		return err
	}
	page := htmlPage{Title: o.Title, Style: template.CSS(drawing.Style), Cautions: o.Cautions, Numeric: p.numeric}
	if page.Title == "" {
		page.Title = "rollwise result"
	}
	for _, c := range p.cols {
		page.Header = append(page.Header, c.Name)
	}
	if o.Omitted > 0 {
		page.Left = fmt.Sprintf("The table and the charts show the first %d rows of %d; write --format csv or json for all of them.", len(t.Rows), len(t.Rows)+o.Omitted)
	}
	for _, r := range p.rows {
		page.Rows = append(page.Rows, htmlRow{Cells: displayCells(r), Total: len(r.rolledUp) > 0, Grand: r.grand})
	}
	page.Charts, page.Note = charts(t, p)
	return htmlTemplate.Execute(w, page)
}

// prepareAll validates and renders every row of t, as the table format
// would show them.
func prepareAll(t *Table) (*prepared, error) {
	s, err := newStream(io.Discard, t.Columns, Options{Format: FormatTable}, dateColumns(t))
	if err != nil {
		return nil, err
	}
	p := &prepared{cols: t.Columns}
	var numbers []numberCells
	for i, r := range t.Rows {
		pr, number, err := s.prepareRow(i+1, r)
		if err != nil {
			return nil, err
		}
		p.rows = append(p.rows, pr)
		numbers = append(numbers, number)
	}
	p.numeric = numericColumns(len(t.Columns), p.rows, numbers)
	return p, nil
}

// displayCells is a row's display text, rolled-up cells labelled.
func displayCells(r preparedRow) []string {
	out := make([]string, len(r.cells))
	for j, v := range displayRow(r, func(s string) string { return s }) {
		out[j], _ = v.(string)
	}
	return out
}

// charts draws a chart per numeric measure over the first group column:
// bars in the rows' order, or a line in time order when the column holds
// dates. With one group column the detail rows are charted; with more,
// the subtotals by the first column (--totals rollup or all gives them),
// since a measure's values per first column cannot be added up from
// finer rows.
func charts(t *Table, p *prepared) ([]chartPicture, string) {
	first := -1
	groups := 0
	for j, c := range t.Columns {
		if c.Group {
			if first < 0 {
				first = j
			}
			groups++
		}
	}
	switch {
	case first < 0:
		return nil, "No chart: the result has no group column (-b) to chart the measures over."
	case len(t.Rows) == 0:
		return nil, "No chart: the result has no rows."
	}
	var picked []int
	for i, r := range t.Rows {
		if byFirstOnly(t, r, first, groups) {
			picked = append(picked, i)
		}
	}
	if len(picked) == 0 {
		return nil, fmt.Sprintf("No chart: with %d group columns, a chart by %s needs its subtotals (--totals rollup).", groups, t.Columns[first].Name)
	}
	_, isTime := t.Rows[picked[0]].Values[first].(time.Time)
	var out []chartPicture
	for j, c := range t.Columns {
		if c.Group || !p.numeric[j] {
			continue
		}
		var values []drawing.ChartValue
		var xs []float64
		for _, i := range picked {
			f, ok := toFloat(t.Rows[i].Values[j])
			if !ok {
				continue
			}
			label := p.rows[i].cells[first].show
			if tv, ok := t.Rows[i].Values[first].(time.Time); ok && isTime {
				xs = append(xs, float64(tv.Unix()))
			} else if isTime {
				continue // a NULL date has no place on the line
			}
			values = append(values, drawing.ChartValue{Label: label, Value: f, Shown: p.rows[i].cells[j].show})
		}
		show := func(f float64) string { return showNumber(decimal.NewFromFloat(f), c) }
		title := c.Name + " by " + t.Columns[first].Name
		switch {
		case len(values) == 0:
			out = append(out, chartPicture{Title: title, Note: "no values to chart"})
		case isTime && len(values) > maxPoints, !isTime && len(values) > maxBars:
			out = append(out, chartPicture{Title: title, Note: fmt.Sprintf("no chart: %d values are too many to draw", len(values))})
		case isTime:
			sortByX(values, xs)
			out = append(out, chartPicture{Title: title, SVG: template.HTML(drawing.Line(values, xs, show, title))})
		default:
			out = append(out, chartPicture{Title: title, SVG: template.HTML(drawing.Bars(values, show, title))})
		}
	}
	return out, ""
}

// byFirstOnly reports whether a row is grouped by the first group column
// alone: a detail row when it is the only one, else a subtotal that rolls
// up every other group column.
func byFirstOnly(t *Table, r Row, first, groups int) bool {
	if groups == 1 {
		return len(r.RolledUp) == 0
	}
	if len(r.RolledUp) != groups-1 {
		return false
	}
	for _, name := range r.RolledUp {
		if name == t.Columns[first].Name {
			return false
		}
	}
	return true
}

// toFloat reads a number as a float for drawing; false for NULL and for
// NaN or an infinity, which have no place on an axis.
func toFloat(v any) (float64, bool) {
	v, err := normalize(v)
	if err != nil {
		return 0, false
	}
	var f float64
	switch x := v.(type) {
	case int64:
		f = float64(x)
	case float64:
		f = x
	case decimal.Decimal:
		f = x.InexactFloat64()
	default:
		return 0, false
	}
	return f, !isBad(f)
}

func isBad(f float64) bool { return math.IsNaN(f) || math.IsInf(f, 0) }

// sortByX puts the values of a line in the order of their x.
func sortByX(values []drawing.ChartValue, xs []float64) {
	idx := make([]int, len(xs))
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool { return xs[idx[a]] < xs[idx[b]] })
	v2 := make([]drawing.ChartValue, len(values))
	x2 := make([]float64, len(xs))
	for k, i := range idx {
		v2[k], x2[k] = values[i], xs[i]
	}
	copy(values, v2)
	copy(xs, x2)
}

// htmlTemplate is the page; html/template escapes every name and value.
var htmlTemplate = template.Must(template.New("page").Parse(`<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<title>{{.Title}}</title>
<style>
{{.Style}}</style>
</head>
<body>
<main>
<h1>{{.Title}}</h1>
{{range .Cautions}}<p class="caution"><strong>caution:</strong> {{.}}</p>
{{end}}{{if .Note}}<p class="none">{{.Note}}</p>
{{end}}{{if .Charts}}<div class="charts">
{{range .Charts}}<section class="chart"><h2>{{.Title}}</h2>
{{if .SVG}}<div class="picture">{{.SVG}}</div>{{else}}<p class="none">{{.Note}}</p>{{end}}
</section>
{{end}}</div>
{{end}}<h2>Result</h2>
<table class="result">
<thead><tr>{{range $j, $h := .Header}}<th{{if index $.Numeric $j}} class="num"{{end}}>{{$h}}</th>{{end}}</tr></thead>
<tbody>
{{range .Rows}}<tr{{if .Grand}} class="total grand"{{else if .Total}} class="total"{{end}}>{{range $j, $c := .Cells}}<td{{if index $.Numeric $j}} class="num"{{end}}>{{$c}}</td>{{end}}</tr>
{{end}}</tbody>
</table>
{{if .Left}}<p class="caution">{{.Left}}</p>
{{end}}</main>
<footer>Written by <code>rollwise run --format html</code>.</footer>
</body>
</html>
`))
