// Package drawing draws the pictures of rollwise's HTML pages as inline
// SVG: a layered layout of graphs (measures and what they build on,
// tables and their links) and the marks of charts. Everything is computed
// here, with no outside tool, and the same input always gives the same
// bytes.
package drawing

import (
	"sort"
)

// Size is the width and height of a node box.
type Size struct{ W, H float64 }

// Edge goes from node From to node To; From is drawn above To.
type Edge struct{ From, To int }

// Point is a point of the picture.
type Point struct{ X, Y float64 }

// Layout is where a layered layout puts nodes and edges.
type Layout struct {
	// Centres are the nodes' centres, in the order of the nodes given.
	Centres []Point
	// Routes are the edges' polylines, from the bottom of From to the top
	// of To (for an edge that goes against the layers, the other way
	// round); nil for an edge from a node to itself.
	Routes [][]Point
	// Width and Height are the size of the whole picture.
	Width, Height float64
}

// Spacing of a layered layout, in SVG units.
const (
	nodeGap  = 28 // between boxes of one layer
	layerGap = 44 // between layers
	margin   = 8
	// dummyWidth is the room a long edge takes where it crosses a layer.
	dummyWidth = 6
	// sweeps is how many down-and-up passes of barycentre ordering run;
	// the ordering with the fewest crossings seen is kept.
	sweeps = 12
)

// Layered lays out a directed graph in layers (the usual layered drawing
// of Sugiyama, Tagawa and Toda, 1981): cycles are broken by turning the
// edges that close them, each node goes to the layer after the longest
// path that reaches it, an edge that spans several layers gets a bend
// point in each, and the order of the nodes in each layer comes from
// repeated barycentre sweeps, keeping the order with the fewest crossings.
// Nodes keep their given order where nothing else decides, so the layout
// is deterministic.
func Layered(nodes []Size, edges []Edge) *Layout {
	g := newLayeredGraph(nodes, edges)
	g.assignLayers()
	g.addBends()
	g.order()
	return g.place()
}

// layeredGraph is the working state of Layered. Vertices are the nodes
// and then the bend points of long edges.
type layeredGraph struct {
	sizes []Size
	// nodes is the number of nodes given (the rest are bends).
	nodes int
	// down[v] and up[v] are v's neighbours in the next and previous
	// layer, bends included.
	down, up [][]int
	edges    []Edge
	// turned marks edges laid out from To to From (they close a cycle).
	turned []bool
	layer  []int
	layers [][]int
	// chains[i] lists the vertices edge i passes, in layer order.
	chains [][]int
}

func newLayeredGraph(nodes []Size, edges []Edge) *layeredGraph {
	g := &layeredGraph{sizes: append([]Size(nil), nodes...), nodes: len(nodes), edges: edges, turned: make([]bool, len(edges))}
	// Depth-first search in node order: an edge to a vertex still on the
	// stack closes a cycle and is turned.
	out := make([][]int, len(nodes))
	for i, e := range edges {
		out[e.From] = append(out[e.From], i)
	}
	state := make([]int, len(nodes)) // 0 new, 1 on the stack, 2 done
	var visit func(v int)
	visit = func(v int) {
		state[v] = 1
		for _, i := range out[v] {
			switch w := edges[i].To; state[w] {
			case 0:
				visit(w)
			case 1:
				g.turned[i] = true
			}
		}
		state[v] = 2
	}
	for v := range nodes {
		if state[v] == 0 {
			visit(v)
		}
	}
	return g
}

// ends returns an edge's ends as laid out (top, bottom).
func (g *layeredGraph) ends(i int) (int, int) {
	e := g.edges[i]
	if g.turned[i] {
		return e.To, e.From
	}
	return e.From, e.To
}

// assignLayers puts each node one layer below the lowest node with an
// edge into it (longest path from the top).
func (g *layeredGraph) assignLayers() {
	n := len(g.sizes)
	g.layer = make([]int, n)
	indeg := make([]int, n)
	out := make([][]int, n)
	for i := range g.edges {
		a, b := g.ends(i)
		if a == b {
			continue
		}
		out[a] = append(out[a], b)
		indeg[b]++
	}
	var queue []int
	for v := 0; v < n; v++ {
		if indeg[v] == 0 {
			queue = append(queue, v)
		}
	}
	for len(queue) > 0 {
		v := queue[0]
		queue = queue[1:]
		for _, w := range out[v] {
			if g.layer[v]+1 > g.layer[w] {
				g.layer[w] = g.layer[v] + 1
			}
			if indeg[w]--; indeg[w] == 0 {
				queue = append(queue, w)
			}
		}
	}
}

// addBends gives every edge that spans more than one layer a bend vertex
// in each layer between its ends, and fills the neighbour lists.
func (g *layeredGraph) addBends() {
	g.chains = make([][]int, len(g.edges))
	g.down = make([][]int, len(g.sizes))
	g.up = make([][]int, len(g.sizes))
	link := func(a, b int) {
		g.down[a] = append(g.down[a], b)
		g.up[b] = append(g.up[b], a)
	}
	for i := range g.edges {
		a, b := g.ends(i)
		if a == b {
			continue
		}
		chain := []int{a}
		for l := g.layer[a] + 1; l < g.layer[b]; l++ {
			v := len(g.sizes)
			g.sizes = append(g.sizes, Size{W: dummyWidth})
			g.layer = append(g.layer, l)
			g.down = append(g.down, nil)
			g.up = append(g.up, nil)
			link(chain[len(chain)-1], v)
			chain = append(chain, v)
		}
		link(chain[len(chain)-1], b)
		g.chains[i] = append(chain, b)
	}
	depth := 0
	for _, l := range g.layer {
		depth = max(depth, l+1)
	}
	g.layers = make([][]int, depth)
	for v, l := range g.layer {
		g.layers[l] = append(g.layers[l], v)
	}
}

// order sorts each layer by the barycentre of its neighbours, sweeping
// down and up, and keeps the best order seen.
func (g *layeredGraph) order() {
	pos := make([]float64, len(g.sizes))
	setPos := func() {
		for _, layer := range g.layers {
			for i, v := range layer {
				pos[v] = float64(i)
			}
		}
	}
	setPos()
	best, bestCross := g.copyLayers(), g.crossings(pos)
	sortBy := func(layer []int, nbrs [][]int) {
		bary := map[int]float64{}
		for _, v := range layer {
			bary[v] = pos[v]
			if len(nbrs[v]) > 0 {
				s := 0.0
				for _, w := range nbrs[v] {
					s += pos[w]
				}
				bary[v] = s / float64(len(nbrs[v]))
			}
		}
		sort.SliceStable(layer, func(i, j int) bool { return bary[layer[i]] < bary[layer[j]] })
		for i, v := range layer {
			pos[v] = float64(i)
		}
	}
	for s := 0; s < sweeps && bestCross > 0; s++ {
		for l := 1; l < len(g.layers); l++ {
			sortBy(g.layers[l], g.up)
		}
		for l := len(g.layers) - 2; l >= 0; l-- {
			sortBy(g.layers[l], g.down)
		}
		if c := g.crossings(pos); c < bestCross {
			best, bestCross = g.copyLayers(), c
		}
	}
	g.layers = best
}

func (g *layeredGraph) copyLayers() [][]int {
	out := make([][]int, len(g.layers))
	for i, l := range g.layers {
		out[i] = append([]int(nil), l...)
	}
	return out
}

// crossings counts the pairs of edge segments that cross between
// adjacent layers.
func (g *layeredGraph) crossings(pos []float64) int {
	n := 0
	for _, layer := range g.layers {
		var segs [][2]float64
		for _, v := range layer {
			for _, w := range g.down[v] {
				segs = append(segs, [2]float64{pos[v], pos[w]})
			}
		}
		for i := range segs {
			for j := i + 1; j < len(segs); j++ {
				if (segs[i][0]-segs[j][0])*(segs[i][1]-segs[j][1]) < 0 {
					n++
				}
			}
		}
	}
	return n
}

// place gives coordinates: layers top to bottom, each layer's boxes left
// to right and centred on the widest layer.
func (g *layeredGraph) place() *Layout {
	centres := make([]Point, len(g.sizes))
	heights := make([]float64, len(g.layers))
	widths := make([]float64, len(g.layers))
	for l, layer := range g.layers {
		for i, v := range layer {
			heights[l] = max(heights[l], g.sizes[v].H)
			if i > 0 {
				widths[l] += nodeGap
			}
			widths[l] += g.sizes[v].W
		}
	}
	width := 0.0
	for _, w := range widths {
		width = max(width, w)
	}
	y := float64(margin)
	for l, layer := range g.layers {
		x := margin + (width-widths[l])/2
		for _, v := range layer {
			centres[v] = Point{X: x + g.sizes[v].W/2, Y: y + heights[l]/2}
			x += g.sizes[v].W + nodeGap
		}
		y += heights[l] + layerGap
	}
	lay := &Layout{Width: width + 2*margin, Height: y - layerGap + margin}
	if len(g.layers) == 0 {
		lay.Height = 2 * margin
	}
	n := len(g.edges)
	lay.Routes = make([][]Point, n)
	for i, chain := range g.chains {
		if chain == nil {
			continue
		}
		var pts []Point
		for k, v := range chain {
			c := centres[v]
			switch k {
			case 0:
				c.Y += g.sizes[v].H / 2
			case len(chain) - 1:
				c.Y -= g.sizes[v].H / 2
			}
			pts = append(pts, c)
		}
		if g.turned[i] {
			for a, b := 0, len(pts)-1; a < b; a, b = a+1, b-1 {
				pts[a], pts[b] = pts[b], pts[a]
			}
		}
		lay.Routes[i] = pts
	}
	lay.Centres = centres[:g.nodes]
	return lay
}
