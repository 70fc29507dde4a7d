package explain

import (
	"context"
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/engine"
	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/reference"
)

// Tables are the tables whose rows explaining q needs: the iteration
// tables of its measures' aggregates (through the measures they name),
// the tables of per-grain columns, group columns and filters, and every
// table these reach along links, in model order.
func Tables(m *model.Model, q *model.Query) []*model.Table {
	need := map[*model.Table]bool{}
	var queue []*model.Table
	add := func(t *model.Table) {
		if t != nil && !need[t] {
			need[t] = true
			queue = append(queue, t)
		}
	}
	visit := func(x model.Expr) bool {
		switch x := x.(type) {
		case *model.Agg:
			add(x.Table)
		case *model.PerAgg:
			for _, c := range x.Per {
				add(c.Table)
			}
		case *model.ColRef:
			add(x.Col.Table)
		}
		return true
	}
	for _, x := range q.Measures {
		model.WalkMeasures(&model.MeasureRef{Measure: x}, visit)
	}
	for _, f := range q.Filters {
		model.Walk(f, visit)
	}
	for _, g := range q.Groups {
		add(g.Table)
	}
	for len(queue) > 0 {
		t := queue[0]
		queue = queue[1:]
		for _, l := range t.Links {
			add(l.To)
		}
	}
	var out []*model.Table
	for _, t := range m.Tables {
		if need[t] {
			out = append(out, t)
		}
	}
	return out
}

// Load reads the stored columns of each table from the engine, in SQL of
// its dialect, and holds them for the reference evaluator.
func Load(ctx context.Context, m *model.Model, tables []*model.Table, eng engine.Engine) (*reference.Data, error) {
	d, err := dialects.Get(eng.Dialect())
	if err != nil {
		return nil, err
	}
	rows := map[*model.Table][][]any{}
	for _, t := range tables {
		var cols []string
		var types []model.Type
		for _, c := range t.Columns {
			if c.Stored() {
				cols = append(cols, d.Ident(c.Name))
				types = append(types, c.Type)
			}
		}
		if len(cols) == 0 {
			return nil, fmt.Errorf("table %s has no stored column to read", t.Name)
		}
		var rel []string
		for _, part := range t.Relation {
			rel = append(rel, d.Ident(part))
		}
		got, err := eng.Query(ctx, "SELECT "+strings.Join(cols, ", ")+" FROM "+strings.Join(rel, "."), types)
		if err != nil {
			return nil, fmt.Errorf("reading the rows of %s: %w", t.Name, err)
		}
		rows[t] = got.Rows
	}
	return reference.FromRows(m, rows)
}
