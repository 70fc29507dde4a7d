package drawing

import (
	"math"
)

// Chart sizes, in SVG units.
const (
	chartHeight = 260
	plotTop     = 16
	plotBottom  = 200 // the x axis for values >= 0
	barStep     = 34
	barWidth    = 22
	axisRoom    = 96 // left of the plot, for the value labels
	minPlot     = 320
	tickCount   = 5
)

// ChartValue is one value to chart: a label, the value, and the value
// as the measure's format shows it.
type ChartValue struct {
	Label string
	Value float64
	Shown string
}

// Bars draws a bar chart, one bar per value in the given order, from a
// zero line; show formats the axis values.
func Bars(values []ChartValue, show func(float64) string, label string) string {
	lo, hi := valueRange(values, true)
	width := max(minPlot, float64(len(values))*barStep) + axisRoom + 16
	s := NewSVG(width, chartHeight, "chart bars", label)
	y := yScale(lo, hi)
	axis(s, lo, hi, y, width, show)
	s.Group("marks")
	for i, v := range values {
		x := axisRoom + float64(i)*barStep + (barStep-barWidth)/2
		top, bottom := y(max(v.Value, 0)), y(min(v.Value, 0))
		class := "bar"
		if v.Value < 0 {
			class = "bar negative"
		}
		s.Raw(`<g class="mark"><title>` + Esc(v.Label+": "+v.Shown) + `</title>`)
		s.Rect(x, top, barWidth, math.Max(bottom-top, 0.5), class)
		s.Raw("</g>\n")
		s.Raw(`<text class="label" transform="translate(` + Num(x+barWidth/2+4) + "," + Num(plotBottom+10) + `) rotate(40)">` + Esc(clip(v.Label)) + "</text>\n")
	}
	s.End("g")
	return s.String()
}

// Line draws a line through the values, at x positions xs (times in
// seconds, say) scaled to the plot; xLabels label the first and last
// points.
func Line(values []ChartValue, xs []float64, show func(float64) string, label string) string {
	lo, hi := valueRange(values, false)
	width := max(minPlot, float64(len(values))*12) + axisRoom + 40
	s := NewSVG(width, chartHeight, "chart line", label)
	y := yScale(lo, hi)
	axis(s, lo, hi, y, width, show)
	x0, x1 := xs[0], xs[0]
	for _, x := range xs {
		x0, x1 = min(x0, x), max(x1, x)
	}
	span := x1 - x0
	plotW := width - axisRoom - 40
	xPos := func(x float64) float64 {
		if span == 0 {
			return axisRoom + 20 + plotW/2
		}
		return axisRoom + 20 + (x-x0)/span*plotW
	}
	var pts []Point
	for i, v := range values {
		pts = append(pts, Point{xPos(xs[i]), y(v.Value)})
	}
	s.Line(pts, "series")
	s.Group("marks")
	for i, v := range values {
		s.Raw(`<g class="mark"><title>` + Esc(v.Label+": "+v.Shown) + `</title>`)
		s.Circle(pts[i].X, pts[i].Y, 3.5, "point")
		s.Raw("</g>\n")
	}
	s.End("g")
	if lo > 0 {
		// A line over a range far from zero magnifies small changes.
		s.Text(axisRoom, chartHeight-8, "start", "label", "the value axis starts at "+show(lo)+", not at zero")
	}
	s.Text(pts[0].X, plotBottom+18, "start", "label", values[0].Label)
	if len(values) > 1 {
		s.Text(pts[len(pts)-1].X, plotBottom+18, "end", "label", values[len(values)-1].Label)
	}
	return s.String()
}

// valueRange is the range the axis shows: the values', widened to nice
// ticks, and to zero for bars.
func valueRange(values []ChartValue, withZero bool) (float64, float64) {
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, v := range values {
		lo, hi = min(lo, v.Value), max(hi, v.Value)
	}
	if withZero {
		lo, hi = min(lo, 0), max(hi, 0)
	}
	if lo == hi {
		lo, hi = lo-1, hi+1
	}
	step := niceStep((hi - lo) / tickCount)
	return math.Floor(lo/step) * step, math.Ceil(hi/step) * step
}

// niceStep rounds a tick step up to 1, 2 or 5 times a power of ten
// (common practice for chart axes).
func niceStep(raw float64) float64 {
	p := math.Pow(10, math.Floor(math.Log10(raw)))
	for _, m := range []float64{1, 2, 5, 10} {
		if m*p >= raw {
			return m * p
		}
	}
	return 10 * p
}

func yScale(lo, hi float64) func(float64) float64 {
	return func(v float64) float64 { return plotBottom - (v-lo)/(hi-lo)*(plotBottom-plotTop) }
}

// axis draws the value axis with its ticks and grid lines.
func axis(s *SVG, lo, hi float64, y func(float64) float64, width float64, show func(float64) string) {
	step := niceStep((hi - lo) / tickCount)
	s.Group("axis")
	for v := lo; v <= hi+step/2; v += step {
		if math.Abs(v) < step/1e9 {
			v = 0
		}
		s.Raw(`<line class="grid" x1="` + Num(axisRoom) + `" x2="` + Num(width-8) + `" y1="` + Num(y(v)) + `" y2="` + Num(y(v)) + `"/>` + "\n")
		s.Text(axisRoom-6, y(v)+4, "end", "label", show(v))
	}
	s.Line([]Point{{axisRoom, plotTop}, {axisRoom, plotBottom}}, "")
	s.End("g")
}

// clip shortens a long label to 18 characters.
func clip(s string) string {
	r := []rune(s)
	if len(r) <= 18 {
		return s
	}
	return string(r[:17]) + "…"
}
