package drawing

import (
	"fmt"
	"html"
	"math"
	"strconv"
	"strings"
	"unicode/utf8"
)

// FontSize is the size of the text in pictures; CharWidth the width of a
// character of the monospace font they use, as a share of FontSize
// (common practice for monospace faces: 0.6 em), so that boxes can be
// sized for their text without measuring it.
const (
	FontSize  = 12.0
	CharWidth = 0.6
)

// TextWidth is the width that s takes in the pictures' font.
func TextWidth(s string) float64 {
	return float64(utf8.RuneCountInString(s)) * FontSize * CharWidth
}

// Esc escapes text for an HTML or SVG text node or a quoted attribute.
func Esc(s string) string { return html.EscapeString(s) }

// Num prints a coordinate with at most one decimal.
func Num(f float64) string {
	return strconv.FormatFloat(math.Round(f*10)/10, 'f', -1, 64)
}

// SVG builds one inline <svg> element.
type SVG struct {
	b strings.Builder
}

// NewSVG starts a picture of the given size; label names it for screen
// readers, class is its CSS class.
func NewSVG(width, height float64, class, label string) *SVG {
	s := &SVG{}
	fmt.Fprintf(&s.b, `<svg xmlns="http://www.w3.org/2000/svg" class="%s" width="%s" height="%s" viewBox="0 0 %s %s" role="img" aria-label="%s">`,
		Esc(class), Num(width), Num(height), Num(width), Num(height), Esc(label))
	s.b.WriteString("\n")
	return s
}

// Raw appends markup that the caller has escaped.
func (s *SVG) Raw(markup string) { s.b.WriteString(markup) }

// Rect draws a rectangle with the given CSS class.
func (s *SVG) Rect(x, y, w, h float64, class string) {
	fmt.Fprintf(&s.b, `<rect class="%s" x="%s" y="%s" width="%s" height="%s"/>`+"\n",
		Esc(class), Num(x), Num(y), Num(w), Num(h))
}

// Text writes text with its start (anchor "start"), middle or end at x
// and its baseline at y.
func (s *SVG) Text(x, y float64, anchor, class, text string) {
	fmt.Fprintf(&s.b, `<text class="%s" x="%s" y="%s" text-anchor="%s">%s</text>`+"\n",
		Esc(class), Num(x), Num(y), anchor, Esc(text))
}

// Line draws a polyline through pts.
func (s *SVG) Line(pts []Point, class string) {
	var b strings.Builder
	for i, p := range pts {
		if i > 0 {
			b.WriteString(" ")
		}
		b.WriteString(Num(p.X) + "," + Num(p.Y))
	}
	cls := ""
	if class != "" {
		cls = ` class="` + Esc(class) + `"`
	}
	fmt.Fprintf(&s.b, `<polyline%s points="%s"/>`+"\n", cls, b.String())
}

// Circle draws a circle.
func (s *SVG) Circle(x, y, r float64, class string) {
	fmt.Fprintf(&s.b, `<circle class="%s" cx="%s" cy="%s" r="%s"/>`+"\n", Esc(class), Num(x), Num(y), Num(r))
}

// Arrow draws an edge of a graph: a polyline through pts ending in an
// arrow head at the last point.
func (s *SVG) Arrow(pts []Point, class, title string) {
	if len(pts) < 2 {
		return
	}
	s.b.WriteString(`<g class="` + Esc(class) + `">`)
	if title != "" {
		s.b.WriteString("<title>" + Esc(title) + "</title>")
	}
	s.Line(pts, "")
	a, b := pts[len(pts)-2], pts[len(pts)-1]
	dx, dy := b.X-a.X, b.Y-a.Y
	n := math.Hypot(dx, dy)
	if n > 0 {
		ux, uy := dx/n, dy/n
		const size = 7
		l := Point{b.X - size*ux + size/2*uy, b.Y - size*uy - size/2*ux}
		r := Point{b.X - size*ux - size/2*uy, b.Y - size*uy + size/2*ux}
		fmt.Fprintf(&s.b, `<polygon points="%s,%s %s,%s %s,%s"/>`, Num(b.X), Num(b.Y), Num(l.X), Num(l.Y), Num(r.X), Num(r.Y))
	}
	s.b.WriteString("</g>\n")
}

// Link opens an <a> around what follows (closed by End); href must be a
// page name of our own.
func (s *SVG) Link(href, title string) {
	fmt.Fprintf(&s.b, `<a href="%s"><title>%s</title>`+"\n", Esc(href), Esc(title))
}

// End closes the last Link or Group.
func (s *SVG) End(tag string) { s.b.WriteString("</" + tag + ">\n") }

// Group opens a <g> with a class (closed by End("g")).
func (s *SVG) Group(class string) { s.b.WriteString(`<g class="` + Esc(class) + `">` + "\n") }

// String closes the picture and returns its markup.
func (s *SVG) String() string { return s.b.String() + "</svg>" }
