package reference

import (
	"fmt"
	"slices"
	"sort"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// constraint is one condition of a cell.
//
// A grouping (group = true) says col = val, NULL-safely: it comes from a
// group column of the result row or from a per-grain group. Every other
// constraint is a filter: a query filter conjunct or a narrowing (pred
// set), or a pin (col IN vals). A filter mentions the columns its
// predicate writes (derived columns are not looked through).
type constraint struct {
	group    bool
	col      *model.Column
	val      Value
	pred     model.Expr
	vals     []Value
	mentions []*model.Column
	key      string
	// shift is set for a constraint read on rows moved by `back`; rng
	// for the date range of a window edit (see time.go).
	shift *shifted
	rng   *timeRange
}

// colKey names a column in a constraint's key as the language writes it
// (a.`b.c` and `a.b`.c are two columns with two keys).
func colKey(col *model.Column) string { return model.Text(&model.ColRef{Col: col}) }

// groupOn is the grouping col = v.
func groupOn(col *model.Column, v Value) *constraint {
	return &constraint{group: true, col: col, val: v, mentions: []*model.Column{col},
		key: "G" + colKey(col) + "=" + key(v)}
}

// filterOn is a filter conjunct or narrowing predicate.
func filterOn(pred model.Expr) *constraint {
	c := &constraint{pred: pred, key: fmt.Sprintf("P%p", pred)}
	model.Walk(pred, func(e model.Expr) bool {
		if r, ok := e.(*model.ColRef); ok && !slices.Contains(c.mentions, r.Col) {
			c.mentions = append(c.mentions, r.Col)
		}
		return true
	})
	return c
}

// pinOn is a pin col IN vals. A NULL value matches nothing, as with =.
func pinOn(col *model.Column, vals []Value) *constraint {
	keys := make([]string, len(vals))
	for i, v := range vals {
		keys[i] = key(v)
	}
	sort.Strings(keys)
	return &constraint{col: col, vals: vals, mentions: []*model.Column{col},
		key: "I" + colKey(col) + "=" + strings.Join(keys, ",")}
}

// holds reports whether row i of td satisfies the constraint.
func (d *Data) holds(c *constraint, td *tableData, i int) (bool, error) {
	switch {
	case c.shift != nil:
		return d.holdsShifted(c.shift, td, i)
	case c.group:
		v, err := d.column(td, i, c.col)
		if err != nil {
			return false, err
		}
		return matchGroup(v, c.val)
	case c.pred != nil:
		v, err := d.row(td, i, c.pred)
		return truth(v), err
	}
	v, err := d.column(td, i, c.col)
	if err != nil {
		return false, err
	}
	if c.rng != nil {
		return c.rng.holds(v), nil
	}
	return matchPin(v, c.vals)
}

// matchGroup is the grouping v = val, NULL-safely.
func matchGroup(v, val Value) (bool, error) {
	if v == nil || val == nil {
		return v == nil && val == nil, nil
	}
	cmp, err := compare(v, val)
	return err == nil && cmp == 0, err
}

// matchPin is v IN vals; NULL matches nothing.
func matchPin(v Value, vals []Value) (bool, error) {
	if v == nil {
		return false, nil
	}
	for _, p := range vals {
		if p == nil {
			continue
		}
		cmp, err := compare(v, p)
		if err != nil {
			return false, err
		}
		if cmp == 0 {
			return true, nil
		}
	}
	return false, nil
}

// cell is a set of constraints, kept sorted by key without duplicates.
type cell []*constraint

// with returns the cell plus more constraints.
func (c cell) with(more ...*constraint) cell {
	out := slices.Clone(c)
	for _, m := range more {
		if !slices.ContainsFunc(out, func(x *constraint) bool { return x.key == m.key }) {
			out = append(out, m)
		}
	}
	sort.Slice(out, func(i, j int) bool { return out[i].key < out[j].key })
	return out
}

// without returns the cell less the constraints drop selects.
func (c cell) without(drop func(*constraint) bool) cell {
	var out cell
	for _, x := range c {
		if !drop(x) {
			out = append(out, x)
		}
	}
	return out
}

// id is a canonical text for the cell.
func (c cell) id() string {
	keys := make([]string, len(c))
	for i, x := range c {
		keys[i] = x.key
	}
	return strings.Join(keys, "\x01")
}

func (c *constraint) mentionsCol(col *model.Column) bool {
	return slices.Contains(c.mentions, col)
}

func (c *constraint) mentionsTable(t *model.Table) bool {
	return slices.ContainsFunc(c.mentions, func(x *model.Column) bool { return x.Table == t })
}

// edit applies one cell edit, as language.md defines it:
//
//	T.C = v, T.C in (...)  remove every grouping and filter that mentions T.C, then pin T.C
//	drop T.C               remove every grouping and filter that mentions T.C
//	drop T                 the same for every column of T
//	drop                   remove everything
//	ungroup T.C            remove the grouping on T.C, keep the filters
//	ungroup                remove every grouping, keep the filters
//
// A pin is a filter: a later ungroup keeps it, a later drop removes it.
func (c cell) edit(ed *model.CellEdit) (cell, error) {
	switch ed.Kind {
	case model.EditPin:
		if ed.Col == nil {
			return nil, fmt.Errorf("a pin without a column")
		}
		vals := make([]Value, len(ed.Values))
		for i, l := range ed.Values {
			v, err := litValue(l)
			if err != nil {
				return nil, err
			}
			vals[i] = v
		}
		return c.without(func(x *constraint) bool { return x.mentionsCol(ed.Col) }).with(pinOn(ed.Col, vals)), nil
	case model.EditDrop:
		switch {
		case ed.Col != nil:
			return c.without(func(x *constraint) bool { return x.mentionsCol(ed.Col) }), nil
		case ed.Table != nil:
			return c.without(func(x *constraint) bool { return x.mentionsTable(ed.Table) }), nil
		}
		return cell{}, nil
	case model.EditUngroup:
		if ed.Col != nil {
			return c.without(func(x *constraint) bool { return x.group && x.col == ed.Col }), nil
		}
		return c.without(func(x *constraint) bool { return x.group }), nil
	}
	return nil, fmt.Errorf("unknown edit kind %d", ed.Kind)
}

// bits is the set of rows of one table that satisfy something.
type bits []bool

// rowsOf returns the rows of td that satisfy every constraint of the
// cell. A constraint on a column td cannot reach is an error.
func (ev *evaluator) rowsOf(td *tableData, c cell) ([]int, error) {
	sets := make([]bits, 0, len(c))
	for _, x := range c {
		b, err := ev.constraintBits(td, x)
		if err != nil {
			return nil, err
		}
		sets = append(sets, b)
	}
	var out []int
	for i := range td.rows {
		ok := true
		for _, b := range sets {
			if !b[i] {
				ok = false
				break
			}
		}
		if ok {
			out = append(out, i)
		}
	}
	return out, nil
}

// constraintBits evaluates a constraint on every row of td, once.
func (ev *evaluator) constraintBits(td *tableData, c *constraint) (bits, error) {
	k := td.t.Name + "\x02" + c.key
	if b, ok := ev.bits[k]; ok {
		return b, nil
	}
	for _, col := range c.mentions {
		if _, ok := reachable(td, col.Table); !ok {
			return nil, &errUnreachable{col: col, from: td.t}
		}
	}
	b := make(bits, len(td.rows))
	for i := range td.rows {
		ok, err := ev.d.holds(c, td, i)
		if err != nil {
			return nil, err
		}
		b[i] = ok
	}
	ev.bits[k] = b
	return b, nil
}

// reachable reports whether t is reachable from td's table (the table
// itself included). A table without rows reaches only itself as far as
// its data says; the model's links decide.
func reachable(td *tableData, t *model.Table) (int, bool) {
	if td.t == t {
		return 0, true
	}
	seen := map[*model.Table]bool{td.t: true}
	queue := []*model.Table{td.t}
	depth := 0
	for len(queue) > 0 {
		depth++
		var next []*model.Table
		for _, x := range queue {
			for _, l := range x.Links {
				if l.To == t {
					return depth, true
				}
				if !seen[l.To] {
					seen[l.To] = true
					next = append(next, l.To)
				}
			}
		}
		queue = next
	}
	return 0, false
}
