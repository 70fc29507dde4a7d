// Package explain answers "why is this number what it is" for one
// measure in one cell of a report, without SQL: the measure as a tree of
// the measures and aggregates it is made of, each part with its iteration
// tables, the narrowings and edits on the way to it, its additivity, the
// row constraints it is evaluated under in the cell (after its edits) and
// its value there. Values come from the reference evaluator
// (planner/reference), which computes them cell by cell from the rows the
// measure reads, held in memory.
package explain

import (
	"fmt"
	"slices"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/reference"
)

// Tree is the explanation of one measure in one cell.
type Tree struct {
	// Measure is the measure's name.
	Measure string `json:"measure"`
	// Cell is the cell as the query gives it: its group values and
	// filters in words (empty for the whole data).
	Cell []string `json:"cell"`
	// Rolled names the group columns the cell rolls up (a total).
	Rolled []string `json:"rolled_up"`
	// Total says which total the cell is, in words ("" for a detail
	// cell); Default says no --cell was given, so the cell is the grand
	// total.
	Total   string `json:"total,omitempty"`
	Default bool   `json:"default_cell"`
	Root    *Node  `json:"explain"`
	// Omitted counts the parts left out past MaxParts.
	Omitted int `json:"omitted_parts,omitempty"`
}

// Node is one part of a measure: a measure, an aggregate or a per-grain
// aggregate.
type Node struct {
	// Kind is "measure", "aggregate" or "per-grain".
	Kind string `json:"kind"`
	// Name is a measure's name ("" for an aggregate).
	Name string `json:"name,omitempty"`
	// Definition is a measure's expression, or the aggregate itself.
	Definition string `json:"definition"`
	Type       string `json:"type"`
	Format     string `json:"format,omitempty"`
	// Tables are the iteration tables of the part's aggregates.
	Tables []string `json:"iterates_over"`
	// Additivity says whether the part's subtotals are sums of its rows'
	// values or re-evaluated.
	Additivity string `json:"additivity"`
	// Via are the narrowings ("where P") and edits ("[E; E]") between the
	// part above and this one, outermost first: what turns the cell
	// above into this part's cell.
	Via []string `json:"via"`
	// Cell is the part's cell, after the edits: its row constraints in
	// words. Nil where the part is not evaluated (see Note).
	Cell []string `json:"cell"`
	// Rows counts the rows of an aggregate's iteration table in the cell.
	Rows *Rows `json:"rows,omitempty"`
	// Groups are a per-grain aggregate's groups in the cell.
	Groups *Groups `json:"groups,omitempty"`
	// Value is the part's value in its cell, as run --format json writes
	// it; Shown is the value as the table format shows it.
	Value any    `json:"value"`
	Shown string `json:"shown"`
	// Note says why a part has no value, or that it was shown above.
	Note  string  `json:"note,omitempty"`
	Parts []*Node `json:"parts"`
}

// Rows counts an aggregate's rows.
type Rows struct {
	Table  string `json:"table"`
	InCell int    `json:"in_cell"`
	All    int    `json:"all"`
}

// Groups describes a per-grain aggregate's groups in the cell.
type Groups struct {
	Per  []string `json:"per"`
	All  int      `json:"all"`
	Kept int      `json:"kept"`
	// First are the first kept groups (at most MaxGroups), each with the
	// value of the inner measure.
	First []Group `json:"first"`
	// Having is the condition a group must meet to count ("" without).
	Having string `json:"having,omitempty"`
	// Dropped are the first groups not kept (at most MaxGroups), each
	// with the reason.
	Dropped []string `json:"dropped"`
	// PartsIn says which group the parts below are shown in.
	PartsIn string `json:"parts_in,omitempty"`
}

// Group is one kept group of a per-grain aggregate.
type Group struct {
	Group string `json:"group"`
	Value any    `json:"value"`
	Shown string `json:"shown"`
}

// MaxParts bounds the parts of a tree; MaxGroups the groups shown of a
// per-grain aggregate.
const (
	MaxParts  = 400
	MaxGroups = 5
)

// Explain explains q's one measure in the cell of c.
func Explain(d *reference.Data, q *model.Query, c Cell) (*Tree, error) {
	if len(q.Measures) != 1 {
		return nil, fmt.Errorf("explain takes one measure, not %d", len(q.Measures))
	}
	m := q.Measures[0]
	p := d.Probe()
	cell := p.QueryCell(q, c.Values, c.Rolled)
	t := &Tree{Measure: m.Name, Cell: tidyAll(cell.Constraints()), Rolled: []string{}, Default: c.Default}
	for i, name := range q.GroupNames {
		if c.Rolled[i] {
			t.Rolled = append(t.Rolled, name)
		}
	}
	switch {
	case len(q.Groups) == 0:
	case len(t.Rolled) == len(q.Groups):
		t.Total = "the grand total: every group column rolled up"
	case len(t.Rolled) > 0:
		t.Total = "a subtotal: " + strings.Join(t.Rolled, ", ") + " rolled up"
	}
	b := &builder{p: p, seen: map[string]bool{}}
	root, err := b.measure(m, &cell, nil)
	if err != nil {
		return nil, err
	}
	t.Root, t.Omitted = root, b.omitted
	return t, nil
}

// builder walks a measure expression, evaluating each part in its cell.
type builder struct {
	p       *reference.Probe
	count   int
	omitted int
	// seen holds measure-and-cell keys already explained in full.
	seen map[string]bool
}

// measure is the node of measure m evaluated in cell c (nil: not
// evaluated), reached through via.
func (b *builder) measure(m *model.Measure, c *reference.Cell, via []string) (*Node, error) {
	n := &Node{Kind: "measure", Name: m.Name, Definition: tidy(model.Text(m.Expr)), Type: m.Type.String(),
		Format: string(m.Format), Tables: tablesOf(m.Expr), Via: nonNil(via), Parts: []*Node{}}
	n.Additivity = additivity(m.Expr)
	if err := b.evaluate(n, &model.MeasureRef{Measure: m}, c, m.Format); err != nil {
		return nil, err
	}
	key := m.Name + "\x00" + strings.Join(n.Cell, "\x00")
	if c != nil && b.seen[key] {
		n.Note = "as explained above, in the same cell"
		return n, nil
	}
	b.seen[key] = true
	// A measure that is one aggregate is shown as that aggregate.
	switch x := m.Expr.(type) {
	case *model.Agg:
		return n, b.aggregate(n, x, c)
	case *model.PerAgg:
		n.Kind = "per-grain"
		return n, b.perGrain(n, x, c)
	}
	var err error
	n.Parts, err = b.parts(m.Expr, c, nil)
	return n, err
}

// evaluate sets n's cell and value: x evaluated in c.
func (b *builder) evaluate(n *Node, x model.Expr, c *reference.Cell, f model.Format) error {
	if c == nil {
		return nil
	}
	n.Cell = tidyAll(c.Constraints())
	v, err := b.p.Value(x, *c)
	if err != nil {
		return err
	}
	n.Value = reference.ValueJSON(v, x.Type())
	n.Shown = show(v, x.Type(), f)
	return nil
}

// parts are the nodes of the measures and aggregates inside e, evaluated
// in c, each reached through via plus the narrowings and edits on the
// way.
func (b *builder) parts(e model.Expr, c *reference.Cell, via []string) ([]*Node, error) {
	if b.count >= MaxParts {
		b.omitted++
		return nil, nil
	}
	switch x := e.(type) {
	case *model.MeasureRef:
		b.count++
		n, err := b.measure(x.Measure, c, via)
		return []*Node{n}, err
	case *model.Agg:
		b.count++
		n := &Node{Kind: "aggregate", Definition: tidy(model.Text(x)), Type: x.T.String(), Tables: tablesOf(x),
			Additivity: additivity(x), Via: nonNil(via), Parts: []*Node{}}
		if err := b.evaluate(n, x, c, ""); err != nil {
			return nil, err
		}
		return []*Node{n}, b.aggregate(n, x, c)
	case *model.PerAgg:
		b.count++
		n := &Node{Kind: "per-grain", Definition: tidy(model.Text(x)), Type: x.T.String(), Tables: tablesOf(x),
			Additivity: additivity(x), Via: nonNil(via), Parts: []*Node{}}
		if err := b.evaluate(n, x, c, ""); err != nil {
			return nil, err
		}
		return []*Node{n}, b.perGrain(n, x, c)
	case *model.NarrowExpr:
		var inner *reference.Cell
		if c != nil {
			nc := b.p.Narrow(*c, x.Pred)
			inner = &nc
		}
		return b.parts(x.X, inner, append(slices.Clone(via), "where "+tidy(model.Text(x.Pred))))
	case *model.EditExpr:
		var inner *reference.Cell
		if c != nil {
			ec, ok, err := b.p.Edit(*c, x)
			if err != nil {
				return nil, err
			}
			if ok {
				inner = &ec
			}
		}
		step := strings.TrimPrefix(model.Text(x), "("+model.Text(x.X)+")")
		ns, err := b.parts(x.X, inner, append(slices.Clone(via), step))
		note := ""
		switch {
		case c != nil && inner == nil:
			note = "not evaluated: the cell has no rows to find the date this time edit starts from, so its value is NULL"
		case c != nil && slices.Equal(c.Constraints(), inner.Constraints()):
			note = "the edits " + step + " leave this cell as it was: " + unchanged(x)
		}
		for _, n := range ns {
			addNote(n, note)
		}
		return ns, err
	}
	var out []*Node
	var err error
	model.Walk(e, func(x model.Expr) bool {
		if x == e || err != nil {
			return err == nil
		}
		var ns []*Node
		ns, err = b.parts(x, c, via)
		out = append(out, ns...)
		return false
	})
	return out, err
}

// aggregate adds to n the rows of x's iteration table in the cell.
func (b *builder) aggregate(n *Node, x *model.Agg, c *reference.Cell) error {
	if c == nil || x.Table == nil {
		return nil
	}
	in, all, err := b.p.Rows(x.Table, *c)
	n.Rows = &Rows{Table: x.Table.Name, InCell: in, All: all}
	if err == nil && in == 0 && all > 0 {
		addNote(n, fmt.Sprintf("no row of %s meets every constraint of this cell: the %s of no rows", x.Table.Name, x.Func))
	}
	return err
}

// perGrain adds to n the groups of x in the cell, and the parts of x's
// measure, shown in the first kept group.
func (b *builder) perGrain(n *Node, x *model.PerAgg, c *reference.Cell) error {
	g := &Groups{First: []Group{}, Dropped: []string{}}
	for _, col := range x.Per {
		g.Per = append(g.Per, model.Text(&model.ColRef{Col: col}))
	}
	if x.Having != nil {
		g.Having = tidy(model.Text(x.Having))
	}
	n.Groups = g
	var in *reference.Cell
	if c != nil {
		groups, err := b.p.Groups(x, *c)
		if err != nil {
			return err
		}
		g.All = len(groups)
		for _, gr := range groups {
			var words []string
			null := false
			for i, col := range g.Per {
				words = append(words, col+" = "+reference.Literal(gr.Values[i]))
				null = null || gr.Values[i] == nil
			}
			if !gr.Kept {
				if len(g.Dropped) < MaxGroups {
					why := "having is not true"
					if null {
						why = "a NULL is not a group"
					}
					g.Dropped = append(g.Dropped, strings.Join(words, ", ")+" ("+why+")")
				}
				continue
			}
			g.Kept++
			if len(g.First) == MaxGroups {
				continue
			}
			grp := Group{Group: strings.Join(words, ", ")}
			if x.X != nil {
				v, err := b.p.Value(x.X, gr.Cell)
				if err != nil {
					return err
				}
				grp.Value, grp.Shown = reference.ValueJSON(v, x.X.Type()), show(v, x.X.Type(), "")
			}
			if in == nil {
				gc := gr.Cell
				in, g.PartsIn = &gc, grp.Group
			}
			g.First = append(g.First, grp)
		}
	}
	var parts []*Node
	for _, e := range []model.Expr{x.X, x.Having} {
		if e == nil {
			continue
		}
		via := []string{}
		if e == x.Having {
			via = append(via, "having "+g.Having)
		}
		ps, err := b.parts(e, in, via)
		if err != nil {
			return err
		}
		parts = append(parts, ps...)
	}
	if c != nil && in == nil {
		for _, p := range parts {
			addNote(p, "not evaluated: no group is kept in this cell")
		}
	}
	n.Parts = append(n.Parts, parts...)
	return nil
}

// tablesOf names the iteration tables of e's aggregates.
func tablesOf(e model.Expr) []string {
	out := []string{}
	for _, t := range model.IterationTables(e) {
		out = append(out, t.Name)
	}
	return out
}

// additivity says in words whether e's subtotals equal the sums of their
// rows.
func additivity(e model.Expr) string {
	if model.AdditiveMeasure(e) {
		return "additive: a subtotal equals the sum of its rows"
	}
	return "not additive: re-evaluated in every cell, never summed"
}

// unchanged says why edits can leave a cell as it was.
func unchanged(e *model.EditExpr) string {
	for _, ed := range e.Edits {
		if ed.Kind.Time() {
			return fmt.Sprintf("a time edit moves or replaces only constraints on %s, on columns of its table derived from it alone, and on columns of its calendar (the table it links to); a constraint on another column (a month derived on the fact table) stays as it is", ed.Col)
		}
	}
	return "no constraint of the cell mentions what they change"
}

// addNote adds a note to n's notes.
func addNote(n *Node, note string) {
	switch {
	case note == "":
	case n.Note == "":
		n.Note = note
	default:
		n.Note = note + "; " + n.Note
	}
}

// tidyAll tidies each constraint's text (never nil).
func tidyAll(s []string) []string {
	out := []string{}
	for _, x := range s {
		out = append(out, tidy(x))
	}
	return out
}

func nonNil(s []string) []string {
	if s == nil {
		return []string{}
	}
	return s
}
