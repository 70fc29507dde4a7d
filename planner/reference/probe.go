package reference

import (
	"fmt"
	"sort"
	"strings"
	"time"

	"github.com/shopspring/decimal"

	"github.com/rollwise/rollwise/planner/model"
)

// Probe evaluates the parts of a measure one at a time, in cells built
// step by step as the evaluator builds them (the query's cell, then each
// narrowing and edit on the way to a part), so that a caller can show
// what each part is evaluated under and its value there (rollwise
// explain). Values are memoized across calls, as within one query.
type Probe struct{ ev *evaluator }

// Probe returns a probe over d.
func (d *Data) Probe() *Probe { return &Probe{ev: newEvaluator(d)} }

// Cell is a cell of the evaluator: a set of constraints.
type Cell struct{ c cell }

// QueryCell is the cell of a result row of q: every filter conjunct, and
// the grouping T.C = groups[i] for every group column not rolled up.
func (p *Probe) QueryCell(q *model.Query, groups []Value, rolled []bool) Cell {
	var c cell
	for _, f := range q.Filters {
		c = c.with(filterOn(f))
	}
	for i, g := range q.Groups {
		if !rolled[i] {
			c = c.with(groupOn(g, groups[i]))
		}
	}
	return Cell{c: c}
}

// Narrow is the cell of `X where pred` evaluated in c.
func (p *Probe) Narrow(c Cell, pred model.Expr) Cell { return Cell{c: c.c.with(filterOn(pred))} }

// Edit is the cell in which e.X is evaluated when e is evaluated in c.
// ok is false where a time edit needs E (the latest date among the cell's
// rows of e.X) and the cell has none: e's value there is NULL.
func (p *Probe) Edit(c Cell, e *model.EditExpr) (Cell, bool, error) {
	out, ok, err := p.ev.editCell(c.c, e)
	return Cell{c: out}, ok, err
}

// Value evaluates a measure expression in c.
func (p *Probe) Value(x model.Expr, c Cell) (Value, error) { return p.ev.measure(x, c.c) }

// Rows counts the rows of table t in cell c, and all of t's rows.
func (p *Probe) Rows(t *model.Table, c Cell) (in, all int, err error) {
	td := p.ev.d.tables[t]
	if td == nil {
		return 0, 0, fmt.Errorf("table %s is not loaded", t.Name)
	}
	rows, err := p.ev.rowsOf(td, c.c)
	return len(rows), len(td.rows), err
}

// Group is one group of a per-grain aggregate in a cell.
type Group struct {
	// Values are the per columns' values.
	Values []Value
	// Cell is the cell plus the groupings on the per columns.
	Cell Cell
	// Kept says the group counts: no per value is NULL and the having
	// clause, if any, holds.
	Kept bool
}

// Groups lists the groups of a per-grain aggregate in c.
func (p *Probe) Groups(pa *model.PerAgg, c Cell) ([]Group, error) {
	gs, err := p.ev.perGroups(pa, c.c)
	if err != nil {
		return nil, err
	}
	out := make([]Group, len(gs))
	for i, g := range gs {
		out[i] = Group{Values: g.vals, Cell: Cell{c: g.cell}, Kept: g.kept}
	}
	return out, nil
}

// Combinations lists the distinct combinations of group values that the
// detail rows of q have (the row set of language.md), in no set order.
func (p *Probe) Combinations(q *model.Query) ([][]Value, error) {
	var filters cell
	for _, f := range q.Filters {
		filters = filters.with(filterOn(f))
	}
	return p.ev.combinations(q, filters)
}

// Constraints describes the cell's constraints in words, one each:
// groupings first, then pins, filters, date ranges and constraints read
// on moved dates, each kind in text order.
func (c Cell) Constraints() []string {
	type described struct{ kind, text string }
	var ds []described
	for _, x := range c.c {
		ds = append(ds, described{kind: x.key[:1], text: x.describe()})
	}
	sort.Slice(ds, func(i, j int) bool {
		if ds[i].kind != ds[j].kind {
			return ds[i].kind < ds[j].kind
		}
		return ds[i].text < ds[j].text
	})
	out := make([]string, len(ds))
	for i, d := range ds {
		out[i] = d.text
	}
	return out
}

// describe is one constraint in words, as the language would write it:
// stores.region = 'North', stores.region is null, sales.item in ('a',
// 'b'), orders.day in 2026-01-01..2026-03-31.
func (x *constraint) describe() string {
	switch {
	case x.shift != nil:
		var moves []string
		for _, s := range x.shift.steps {
			moves = append(moves, fmt.Sprintf("%d %s", s.n, s.unit))
		}
		by := strings.Join(moves, " and ")
		return fmt.Sprintf("%s, on the rows %s back (their %s, %s later, meets it)",
			x.shift.inner.describe(), by, colKey(x.shift.axis.d), by)
	case x.group:
		if x.val == nil {
			return colKey(x.col) + " is null"
		}
		return colKey(x.col) + " = " + Literal(x.val)
	case x.pred != nil:
		return model.Text(x.pred)
	case x.rng != nil:
		hi := Literal(*x.rng.hi)
		switch {
		case x.rng.lo == nil:
			return colKey(x.col) + " <= " + hi
		case x.rng.loIn:
			return colKey(x.col) + " in " + Literal(*x.rng.lo) + ".." + hi
		}
		return colKey(x.col) + " > " + Literal(*x.rng.lo) + " and <= " + hi
	}
	if len(x.vals) == 1 {
		return colKey(x.col) + " = " + Literal(x.vals[0])
	}
	vals := make([]string, len(x.vals))
	for i, v := range x.vals {
		vals[i] = Literal(v)
	}
	return colKey(x.col) + " in (" + strings.Join(vals, ", ") + ")"
}

// Literal writes a value as a constraint shows it: text quoted as the
// language quotes it ('Bramble”s'), numbers as they are, dates
// YYYY-MM-DD, timestamps YYYY-MM-DD HH:MM:SS, null.
func Literal(v Value) string {
	switch x := v.(type) {
	case nil:
		return "null"
	case string:
		return "'" + strings.ReplaceAll(x, "'", "''") + "'"
	case time.Time:
		if x.Equal(truncate("day", x)) {
			return x.Format(time.DateOnly)
		}
		return x.Format("2006-01-02 15:04:05.999999999")
	case decimal.Decimal:
		return x.String()
	}
	return fmt.Sprint(v)
}

// ValueJSON is a value as `rollwise run --format json` writes a value of
// type t (see Result.JSON).
func ValueJSON(v Value, t model.Type) any { return jsonValue(v, t == model.TypeDate) }

// FromRows builds the data of the tables given from their rows, each row
// holding the table's stored columns in declaration order. Values are
// nil, int64, decimal.Decimal, float64, string, bool or time.Time (as
// the engine returns them); integers are held as decimals, dates cut to
// the day. Every table reachable along links from a given table must be
// given too.
func FromRows(m *model.Model, rows map[*model.Table][][]any) (*Data, error) {
	d := &Data{model: m, tables: map[*model.Table]*tableData{}}
	var tables []*model.Table
	for _, t := range m.Tables {
		rs, ok := rows[t]
		if !ok {
			continue
		}
		td := &tableData{t: t, stored: map[*model.Column]int{}, derived: map[*model.Column]*derivedCache{}}
		var cols []*model.Column
		for _, c := range t.Columns {
			if c.Stored() {
				td.stored[c] = len(cols)
				cols = append(cols, c)
			}
		}
		for n, r := range rs {
			if len(r) != len(cols) {
				return nil, fmt.Errorf("table %s: row %d has %d values for %d stored columns", t.Name, n+1, len(r), len(cols))
			}
			row := make([]Value, len(r))
			for i, v := range r {
				var err error
				if row[i], err = engineValue(v, cols[i].Type); err != nil {
					return nil, fmt.Errorf("table %s: row %d: column %s: %v", t.Name, n+1, cols[i], err)
				}
			}
			td.rows = append(td.rows, row)
		}
		d.tables[t] = td
		tables = append(tables, t)
	}
	for _, t := range tables {
		if err := d.link(d.tables[t]); err != nil {
			return nil, err
		}
	}
	return d, nil
}

// engineValue converts a value read from an engine to the evaluator's
// value of a column of type t.
func engineValue(v any, t model.Type) (Value, error) {
	switch x := v.(type) {
	case nil:
		return nil, nil
	case int64:
		if t == model.TypeFloat {
			return float64(x), nil
		}
		return decimal.NewFromInt(x), nil
	case decimal.Decimal:
		if t == model.TypeFloat {
			return toFloat(x), nil
		}
		return x, nil
	case float64:
		if t == model.TypeInteger || t == model.TypeDecimal {
			return decimal.NewFromFloat(x), nil
		}
		return x, nil
	case string, bool:
		return x, nil
	case time.Time:
		if t == model.TypeDate {
			return truncate("day", x.UTC()), nil
		}
		return x.UTC(), nil
	}
	return nil, fmt.Errorf("a value of Go type %T", v)
}
