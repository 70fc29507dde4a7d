package reference

import (
	"fmt"
	"slices"

	"github.com/shopspring/decimal"

	"github.com/rollwise/rollwise/planner/model"
)

// evaluator evaluates measure expressions in cells, caching what does
// not depend on the cell (constraint row sets, aggregate arguments) and
// measure values per cell.
type evaluator struct {
	d    *Data
	bits map[string]bits
	args map[string][]Value
	memo map[string]Value
	// depth guards against runaway recursion on a malformed model.
	depth int
}

func newEvaluator(d *Data) *evaluator {
	return &evaluator{d: d, bits: map[string]bits{}, args: map[string][]Value{}, memo: map[string]Value{}}
}

// maxDepth bounds measure nesting; resolved models have no cycles, so
// only a malformed model reaches it.
const maxDepth = 10000

// measure evaluates a measure expression in a cell.
func (ev *evaluator) measure(e model.Expr, c cell) (Value, error) {
	ev.depth++
	defer func() { ev.depth-- }()
	if ev.depth > maxDepth {
		return nil, fmt.Errorf("measures nest too deeply (a cycle?)")
	}
	switch e := e.(type) {
	case nil:
		return nil, fmt.Errorf("missing expression")
	case *model.Agg:
		return ev.agg(e, c)
	case *model.MeasureRef:
		if e.Measure == nil || e.Measure.Expr == nil {
			return nil, fmt.Errorf("measure reference without a definition")
		}
		k := fmt.Sprintf("M%p|%s", e.Measure, c.id())
		if v, ok := ev.memo[k]; ok {
			return v, nil
		}
		v, err := ev.measure(e.Measure.Expr, c)
		if err != nil {
			return nil, fmt.Errorf("measure %s: %w", e.Measure.Name, err)
		}
		ev.memo[k] = v
		return v, nil
	case *model.NarrowExpr:
		return ev.measure(e.X, c.with(filterOn(e.Pred)))
	case *model.EditExpr:
		edited, ok, err := ev.editCell(c, e)
		if err != nil || !ok {
			return nil, err
		}
		return ev.measure(e.X, edited)
	case *model.PerAgg:
		k := fmt.Sprintf("A%p|%s", e, c.id())
		if v, ok := ev.memo[k]; ok {
			return v, nil
		}
		v, err := ev.perAgg(e, c)
		if err != nil {
			return nil, err
		}
		ev.memo[k] = v
		return v, nil
	case *model.ColRef:
		return nil, fmt.Errorf("column %s used outside an aggregate", e.Col)
	}
	v, ok, err := scalar(e, func(x model.Expr) (Value, error) { return ev.measure(x, c) })
	if !ok && err == nil {
		return nil, fmt.Errorf("cannot evaluate %T", e)
	}
	return v, err
}

// editCell applies the edits of e to cell c, in order. ok is false where
// a time edit needs E and the cell has no rows of e.X: the value there is
// NULL.
func (ev *evaluator) editCell(c cell, e *model.EditExpr) (cell, bool, error) {
	edited := c
	for _, ed := range e.Edits {
		var err error
		if ed.Kind.Time() {
			ok := false
			if edited, ok, err = ev.timeEdit(edited, ed, e.X); err != nil || !ok {
				return nil, false, err
			}
			continue
		}
		if edited, err = edited.edit(ed); err != nil {
			return nil, false, err
		}
	}
	return edited, true, nil
}

// agg aggregates the rows of the iteration table that satisfy the cell.
func (ev *evaluator) agg(a *model.Agg, c cell) (Value, error) {
	td := ev.d.tables[a.Table]
	if td == nil {
		return nil, fmt.Errorf("table %v is not loaded", a.Table)
	}
	rows, err := ev.rowsOf(td, c)
	if err != nil {
		return nil, err
	}
	if a.Arg == nil {
		return decimal.NewFromInt(int64(len(rows))), nil
	}
	args, err := ev.argValues(td, a.Arg)
	if err != nil {
		return nil, err
	}
	vals := make([]Value, len(rows))
	for i, r := range rows {
		vals[i] = args[r]
	}
	return aggregate(a.Func, a.Distinct, vals, a.T)
}

// argValues evaluates a row expression on every row of td, once.
func (ev *evaluator) argValues(td *tableData, e model.Expr) ([]Value, error) {
	k := fmt.Sprintf("%s|%p", td.t.Name, e)
	if v, ok := ev.args[k]; ok {
		return v, nil
	}
	out := make([]Value, len(td.rows))
	for i := range td.rows {
		v, err := ev.d.row(td, i, e)
		if err != nil {
			return nil, err
		}
		out[i] = v
	}
	ev.args[k] = out
	return out, nil
}

// perAgg evaluates AGG(X per C... having H): the groups are the distinct
// values of the per columns among the iteration rows of X (of H for
// count(* per ...)) that satisfy the cell; each group is the cell plus
// the grouping C = value. A group whose value has a NULL is skipped,
// with or without a having clause (NULL is not a group); the having
// clause decides for the others. The kept groups' values of X are aggregated with AGG;
// count(* per ...) counts the kept groups.
func (ev *evaluator) perAgg(p *model.PerAgg, c cell) (Value, error) {
	groups, err := ev.perGroups(p, c)
	if err != nil {
		return nil, err
	}
	var vals []Value
	kept := 0
	for _, g := range groups {
		if !g.kept {
			continue
		}
		kept++
		if p.X == nil {
			continue
		}
		v, err := ev.measure(p.X, g.cell)
		if err != nil {
			return nil, err
		}
		vals = append(vals, v)
	}
	if p.X == nil {
		return decimal.NewFromInt(int64(kept)), nil
	}
	return aggregate(p.Func, false, vals, p.T)
}

// perGroup is one group of a per-grain aggregate in a cell: the per
// columns' values, the cell plus their groupings, and whether the group
// is kept (no NULL value, and the having clause holds).
type perGroup struct {
	vals []Value
	cell cell
	kept bool
}

// perGroups lists the groups of p in cell c, in the order the rows give
// them (see perAgg).
func (ev *evaluator) perGroups(p *model.PerAgg, c cell) ([]perGroup, error) {
	tables, err := ev.perTables(p)
	if err != nil {
		return nil, err
	}
	var groups []perGroup
	seen := map[string]bool{}
	for _, t := range tables {
		td := ev.d.tables[t]
		if td == nil {
			return nil, fmt.Errorf("table %s is not loaded", t.Name)
		}
		rows, err := ev.rowsOf(td, c)
		if err != nil {
			return nil, err
		}
		for _, r := range rows {
			g := make([]Value, len(p.Per))
			for i, col := range p.Per {
				if g[i], err = ev.d.column(td, r, col); err != nil {
					return nil, err
				}
			}
			if k := tupleKey(g); !seen[k] {
				seen[k] = true
				groups = append(groups, perGroup{vals: g})
			}
		}
	}
	for i := range groups {
		g := &groups[i]
		g.cell = c
		null := false
		for j, col := range p.Per {
			g.cell = g.cell.with(groupOn(col, g.vals[j]))
			null = null || g.vals[j] == nil
		}
		if null {
			continue
		}
		g.kept = true
		if p.Having != nil {
			h, err := ev.measure(p.Having, g.cell)
			if err != nil {
				return nil, err
			}
			g.kept = truth(h)
		}
	}
	return groups, nil
}

// perTables are the tables whose rows give a per-grain's groups: the
// iteration tables of its measure expression; when that reads no table
// (count(* per ...), a literal), the table among the per columns' tables
// from which the others are reachable. The having clause never changes
// the groups (language.md, "Per-grain groups and NULL").
func (ev *evaluator) perTables(p *model.PerAgg) ([]*model.Table, error) {
	var tables []*model.Table
	var err error
	if p.X != nil {
		if tables, err = iterationTables(p.X, nil, map[*model.Measure]bool{}); err != nil || len(tables) > 0 {
			return tables, err
		}
	}
	t, err := perColumnsTable(p.Per)
	if err != nil {
		return nil, err
	}
	return []*model.Table{t}, nil
}

// perColumnsTable is the one table among the per columns' tables from
// which every other is reachable.
func perColumnsTable(per []*model.Column) (*model.Table, error) {
	var tables []*model.Table
	for _, c := range per {
		if !slices.Contains(tables, c.Table) {
			tables = append(tables, c.Table)
		}
	}
	var cands []*model.Table
	for _, t := range tables {
		all := true
		for _, o := range tables {
			if _, ok := reachableTable(t, o); !ok {
				all = false
			}
		}
		if all {
			cands = append(cands, t)
		}
	}
	if len(cands) != 1 {
		return nil, fmt.Errorf("the per columns have no table from which the others are reachable")
	}
	return cands[0], nil
}

func reachableTable(from, to *model.Table) (int, bool) {
	return reachable(&tableData{t: from}, to)
}

// iterationTables adds to acc the iteration tables of every aggregate in
// e, following measure references and per-grain aggregates.
func iterationTables(e model.Expr, acc []*model.Table, seen map[*model.Measure]bool) ([]*model.Table, error) {
	var err error
	add := func(t *model.Table) {
		if t != nil && !slices.Contains(acc, t) {
			acc = append(acc, t)
		}
	}
	model.Walk(e, func(x model.Expr) bool {
		if err != nil {
			return false
		}
		switch x := x.(type) {
		case *model.Agg:
			add(x.Table)
			return false
		case *model.MeasureRef:
			if x.Measure != nil && !seen[x.Measure] {
				seen[x.Measure] = true
				acc, err = iterationTables(x.Measure.Expr, acc, seen)
			}
			return false
		case *model.PerAgg:
			// The per-grain's own tables (measure references already
			// seen elsewhere count again here).
			// Its groups come from the rows of X's iteration tables; a
			// having clause only keeps or drops groups. count(* per ...)
			// has no X: then the per columns' table.
			var own []*model.Table
			if x.X != nil {
				own, err = iterationTables(x.X, own, map[*model.Measure]bool{})
			}
			if err == nil && len(own) == 0 {
				var t *model.Table
				if t, err = perColumnsTable(x.Per); err == nil {
					own = append(own, t)
				}
			}
			for _, t := range own {
				add(t)
			}
			return false
		case *model.NarrowExpr:
			acc, err = iterationTables(x.X, acc, seen)
			return false
		}
		return true
	})
	return acc, err
}
