package plan

import (
	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
)

// Computed is a measure's value in one cell of a context, compiled once:
// every use of the measure in that cell reads this same node, so a plan's
// expressions form a graph whose size grows with the distinct measures a
// query needs, not with the paths between them. Walk does not descend
// into X; WalkOnce does, once per node. A renderer computes a node used
// more than once under a name (dialects: layers) and inlines the others.
type Computed struct {
	// Measure is the measure whose value this is.
	Measure *model.Measure
	X       model.Expr
}

// WalkOnce is Walk over the graph of several compiled expressions: it
// also goes into every Computed node below them, the first time it meets
// it (seen records those met; share it between calls to visit each node
// of a plan once).
func WalkOnce(e model.Expr, seen map[*Computed]bool, fn func(model.Expr) bool) {
	model.Walk(e, func(x model.Expr) bool {
		if !fn(x) {
			return false
		}
		if c, ok := x.(*Computed); ok && !seen[c] {
			seen[c] = true
			WalkOnce(c.X, seen, fn)
		}
		return true
	})
}

// Type is the measure's type.
func (e *Computed) Type() model.Type { return e.X.Type() }

// Position is where the measure's expression starts.
func (e *Computed) Position() grammar.Pos { return e.X.Position() }

// Text prints the node as its measure's name.
func (e *Computed) Text() string { return model.QuoteName(e.Measure.Name) }

// Text prints the value as relation.column.
func (e *ValueRef) Text() string {
	return model.QuoteName(e.Rel.Name) + "." + model.QuoteName(e.Column)
}
