package catalog

import (
	"fmt"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/drawing"
	"github.com/rollwise/rollwise/planner/model"
)

// Boxes of the pictures, in SVG units.
const (
	boxPad    = 8  // text to the box's sides
	boxHeight = 24 // a one-line box
	lineStep  = 16 // between the lines of a table box
)

// graphNode is a box of a picture: a measure, or a table with its lines.
type graphNode struct {
	label string
	// lines are a table's columns; nil for a one-line box.
	lines []string
	class string
	href  string
	title string
}

func (n graphNode) size() drawing.Size {
	w := drawing.TextWidth(n.label)
	for _, l := range n.lines {
		w = max(w, drawing.TextWidth(l))
	}
	return drawing.Size{W: w + 2*boxPad, H: boxHeight + float64(len(n.lines))*lineStep}
}

// graphEdge is an arrow between two boxes, with a tooltip.
type graphEdge struct {
	drawing.Edge
	title string
}

// draw lays the boxes out in layers and draws them.
func draw(nodes []graphNode, edges []graphEdge, class, label string) string {
	sizes := make([]drawing.Size, len(nodes))
	for i, n := range nodes {
		sizes[i] = n.size()
	}
	plain := make([]drawing.Edge, len(edges))
	for i, e := range edges {
		plain[i] = e.Edge
	}
	lay := drawing.Layered(sizes, plain)
	s := drawing.NewSVG(lay.Width, lay.Height, class, label)
	for i, e := range edges {
		s.Arrow(lay.Routes[i], "edge", e.title)
	}
	for i, n := range nodes {
		c, sz := lay.Centres[i], sizes[i]
		x, y := c.X-sz.W/2, c.Y-sz.H/2
		s.Link(n.href, n.title)
		s.Group("node " + n.class)
		s.Rect(x, y, sz.W, sz.H, "box")
		if n.lines != nil {
			s.Rect(x, y, sz.W, boxHeight, "head")
		}
		s.Text(x+boxPad, y+boxHeight/2+drawing.FontSize*0.35, "start", "name", n.label)
		for k, l := range n.lines {
			s.Text(x+boxPad, y+boxHeight+float64(k)*lineStep+lineStep*0.75, "start", "line", l)
		}
		s.End("g")
		s.End("a")
	}
	return s.String()
}

// measureGraph draws what mf builds on, down to the tables read, with the
// measures built directly on it above it.
func (f *facts) measureGraph(mf *measureFacts) string {
	index := map[any]int{}
	var nodes []graphNode
	var edges []graphEdge
	addMeasure := func(m *model.Measure, class string) int {
		if i, ok := index[m]; ok {
			return i
		}
		index[m] = len(nodes)
		nodes = append(nodes, graphNode{label: m.Name, class: class, href: measurePage(m), title: "measure " + m.Name})
		return index[m]
	}
	addTable := func(t *model.Table) int {
		if i, ok := index[t]; ok {
			return i
		}
		index[t] = len(nodes)
		nodes = append(nodes, graphNode{label: t.Name, class: "table", href: tablePage(t), title: "table " + t.Name})
		return index[t]
	}
	for _, u := range mf.usedBy {
		addMeasure(u, "measure")
	}
	addMeasure(mf.m, "measure focus")
	inGraph := append([]*model.Measure{mf.m}, f.upstream(mf)...)
	for _, m := range inGraph {
		addMeasure(m, "measure")
	}
	for _, u := range mf.usedBy {
		edges = append(edges, graphEdge{drawing.Edge{From: index[u], To: index[mf.m]}, u.Name + " builds on " + mf.m.Name})
	}
	for _, m := range inGraph {
		x := f.byName[m]
		for _, u := range x.uses {
			edges = append(edges, graphEdge{drawing.Edge{From: index[m], To: index[u]}, m.Name + " builds on " + u.Name})
		}
		for _, t := range x.tables {
			edges = append(edges, graphEdge{drawing.Edge{From: index[m], To: addTable(t)}, m.Name + " reads " + t.Name})
		}
	}
	return draw(nodes, edges, "graph", "the measures and tables "+mf.m.Name+" builds on")
}

// tableDiagram draws the tables with their columns and links; an arrow
// goes from the table that holds a link to the table it leads to.
func tableDiagram(tables []*model.Table, label string) string {
	index := map[*model.Table]int{}
	var nodes []graphNode
	for _, t := range tables {
		index[t] = len(nodes)
		n := graphNode{label: t.Name, class: "table", href: tablePage(t), title: "table " + t.Name, lines: []string{}}
		for _, c := range t.Columns {
			n.lines = append(n.lines, columnLine(t, c))
		}
		nodes = append(nodes, n)
	}
	var edges []graphEdge
	for _, t := range tables {
		for _, l := range t.Links {
			if to, ok := index[l.To]; ok {
				edges = append(edges, graphEdge{drawing.Edge{From: index[t], To: to}, "link " + l.String()})
			}
		}
	}
	return draw(nodes, edges, "diagram", label)
}

// columnLine is a column as a table box shows it: a key mark, the name,
// the type, and where a link from it leads.
func columnLine(t *model.Table, c *model.Column) string {
	mark := "  "
	for _, k := range t.Key {
		if k == c {
			mark = "# "
		}
	}
	s := fmt.Sprintf("%s%s %s", mark, c.Name, c.Type)
	if c.Derived != nil {
		s += " (derived)"
	}
	for _, l := range t.Links {
		if len(l.FromCols) == 1 && l.FromCols[0] == c {
			s += " -> " + l.To.Name
		}
	}
	return s
}
