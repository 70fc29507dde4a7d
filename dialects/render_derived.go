package dialects

import (
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
)

// Derived columns computed once per row. A derived column is written
// inline wherever it is read, with the derived columns it reads written
// inline in turn; a column that reads another one twice (c2 = c1 + c1,
// c3 = c2 + c2, ...) would double the text at every step. So a derived
// column that other derived columns read more than once in all is
// computed once per row, as a named column of a CTE over its table (a
// SELECT of the table's stored columns, then one SELECT over the one
// before per level), and a scan reading it reads that CTE in place of the
// table, under the table's own name. Only columns computed from their own
// table's columns are named this way (the CTE reads the table alone); a
// model without such sharing gets the same SQL as before.

// derivedRel is the CTE of a table's shared derived columns.
type derivedRel struct {
	name string
	cols map[*model.Column]bool
}

// derivedOf returns the CTE of t's shared derived columns, rendering it on
// first use, or nil when t has none.
func (r *renderer) derivedOf(t *model.Table) (*derivedRel, error) {
	if d, ok := r.derived[t]; ok {
		return d, nil
	}
	r.derived[t] = nil
	uses := map[*model.Column]int{}
	for _, c := range t.Columns {
		if c.Derived == nil {
			continue
		}
		model.Walk(c.Derived, func(x model.Expr) bool {
			if ref, ok := x.(*model.ColRef); ok && ref.Col.Derived != nil {
				uses[ref.Col]++
			}
			return true
		})
	}
	named := map[*model.Column]bool{}
	var order []*model.Column
	for _, c := range t.Columns {
		if uses[c] > 1 && ownColumns(c) {
			named[c] = true
			order = append(order, c)
		}
	}
	if len(order) == 0 {
		return nil, nil
	}
	// A column's level is one more than the highest level among the
	// named columns its expression reads (through unnamed ones).
	level := map[*model.Column]int{}
	var levelOf func(e model.Expr) int
	levelOf = func(e model.Expr) int {
		top := 0
		model.Walk(e, func(x model.Expr) bool {
			ref, ok := x.(*model.ColRef)
			if !ok || ref.Col.Derived == nil {
				return true
			}
			if !named[ref.Col] {
				top = max(top, levelOf(ref.Col.Derived))
				return true
			}
			if _, done := level[ref.Col]; !done {
				level[ref.Col] = levelOf(ref.Col.Derived) + 1
			}
			top = max(top, level[ref.Col])
			return true
		})
		return top
	}
	depth := 0
	for _, c := range order {
		level[c] = levelOf(c.Derived) + 1
		depth = max(depth, level[c])
	}
	byLevel := make([][]*model.Column, depth+1)
	for _, c := range order {
		byLevel[level[c]] = append(byLevel[level[c]], c)
	}
	d := &derivedRel{cols: map[*model.Column]bool{}}
	outerIter, outerFound, outerUse := r.iter, r.found, r.useDerived
	r.iter, r.found, r.useDerived = nil, nil, map[*model.Table]*derivedRel{t: d}
	defer func() { r.iter, r.found, r.useDerived = outerIter, outerFound, outerUse }()
	tq := r.q(t.Name)
	var stored []string
	for _, c := range t.Columns {
		if c.Derived == nil {
			stored = append(stored, tq+"."+r.q(c.Name))
		}
	}
	from := r.relation(t)
	prev := ""
	for l := 1; l <= depth; l++ {
		cols := stored
		if l > 1 {
			cols = []string{tq + ".*"}
		}
		for _, c := range byLevel[l] {
			e, err := r.value(c.Derived)
			if err != nil {
				return nil, fmt.Errorf("derived column %s: %w", c, err)
			}
			cols = append(cols, e+" AS "+r.q(c.Name))
		}
		prev = r.cteName(fmt.Sprintf("%s_derived_%d", t.Name, l))
		r.ctes = append(r.ctes, r.layerSQL(prev, "  SELECT\n    "+strings.Join(cols, ",\n    ")+"\n  FROM "+from+" AS "+tq))
		from = r.q(prev)
		for _, c := range byLevel[l] {
			d.cols[c] = true
		}
	}
	d.name = prev
	r.derived[t] = d
	return d, nil
}

// ownColumns reports whether derived column c is computed from its own
// table's columns alone.
func ownColumns(c *model.Column) bool {
	for _, used := range model.Columns(c.Derived) {
		if used.Table != c.Table {
			return false
		}
	}
	return true
}

// derivedSources finds, for each table a scan reads (its iteration table
// and the tables it joins), the CTE of shared derived columns the scan's
// expressions read, if any: the scan then reads that CTE in place of the
// table.
func (r *renderer) derivedSources(s *plan.Scan) (map[*model.Table]*derivedRel, error) {
	var exprs []model.Expr
	exprs = append(exprs, s.Where...)
	for _, in := range s.Inputs {
		exprs = append(exprs, in.Expr)
	}
	for _, k := range s.Keys {
		exprs = append(exprs, &model.ColRef{Col: k.Col})
	}
	out := map[*model.Table]*derivedRel{}
	for _, e := range exprs {
		for _, c := range model.Columns(e) {
			if c.Derived == nil || out[c.Table] != nil {
				continue
			}
			d, err := r.derivedOf(c.Table)
			if err != nil {
				return nil, err
			}
			if d != nil && d.cols[c] {
				out[c.Table] = d
			}
		}
	}
	return out, nil
}

// source is what a scan reads for table t: its relation, or the CTE of its
// shared derived columns.
func (r *renderer) source(t *model.Table) string {
	if d := r.useDerived[t]; d != nil {
		return r.q(d.name)
	}
	return r.relation(t)
}
