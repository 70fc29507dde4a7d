package reference

import (
	"fmt"
	"slices"
	"time"

	"github.com/rollwise/rollwise/planner/model"
)

// The time edits of language.md ("Time"), evaluated cell by cell:
//
//	D = latest / earliest  the cell, D pinned to E (F): the latest (earliest) D among the cell's rows
//	D back N UNIT          the rows whose D, moved forward N units, meets the time-bound constraints
//	D to date UNIT         time-bound constraints replaced by start_of_UNIT(E) <= D <= E
//	D running              time-bound constraints replaced by D <= E
//	D last N UNIT          time-bound constraints replaced by E - N UNIT < D <= E
//
// A constraint is time-bound when every column it mentions is D, a
// derived column of D's table computed from D alone, or a column of the
// calendar: D's own table when D is its key, or the table D's link
// reaches.

// axis is the date column of a time edit and its calendar.
type axis struct {
	d *model.Column
	// cal is the calendar table (nil without one); calKey is its column
	// that holds D's value.
	cal    *model.Table
	calKey *model.Column
}

func axisOf(d *model.Column) axis {
	a := axis{d: d}
	if len(d.Table.Key) == 1 && d.Table.Key[0] == d {
		a.cal, a.calKey = d.Table, d
	}
	for _, l := range d.Table.Links {
		if len(l.FromCols) == 1 && l.FromCols[0] == d {
			a.cal, a.calKey = l.To, l.ToCols[0]
		}
	}
	return a
}

// bound reports whether col is time-bound to the axis.
func (a axis) bound(col *model.Column) bool {
	switch {
	case col == a.d || (a.cal != nil && col.Table == a.cal):
		return true
	case col.Table != a.d.Table || col.Derived == nil:
		return false
	}
	return a.fromDAlone(col)
}

// boundConstraint reports whether every column x mentions is time-bound.
func (a axis) boundConstraint(x *constraint) bool {
	return len(x.mentions) > 0 && !slices.ContainsFunc(x.mentions, func(c *model.Column) bool { return !a.bound(c) })
}

// step is one move of a date: N units forward (back negative).
type step struct {
	n    int
	unit string
}

// move moves t by s, clamping month, quarter and year moves to the target
// month's last day (2026-03-31 back 1 month is 2026-02-28), as SQL's
// interval arithmetic does (PostgreSQL documentation, "Date/Time Functions
// and Operators", section 9.9: adding a month to January 31 gives the last
// day of February).
func move(t time.Time, s step) time.Time {
	months := 0
	switch s.unit {
	case "day":
		return t.AddDate(0, 0, s.n)
	case "week":
		return t.AddDate(0, 0, 7*s.n)
	case "month":
		months = s.n
	case "quarter":
		months = 3 * s.n
	case "year":
		months = 12 * s.n
	}
	y, m, d := t.Date()
	total := int(m) - 1 + months
	ty, tm := y+floorDiv(total, 12), time.Month(floorMod(total, 12)+1)
	last := time.Date(ty, tm+1, 0, 0, 0, 0, 0, time.UTC).Day()
	if d > last {
		d = last
	}
	return time.Date(ty, tm, d, t.Hour(), t.Minute(), t.Second(), t.Nanosecond(), time.UTC)
}

func floorDiv(a, b int) int {
	q := a / b
	if a%b != 0 && a < 0 {
		q--
	}
	return q
}

func floorMod(a, b int) int { return a - floorDiv(a, b)*b }

// shifted is a constraint read on moved rows: a row meets it when the row
// with D moved by the steps (the last one first) meets inner.
type shifted struct {
	axis  axis
	steps []step
	inner *constraint
}

// shift wraps a time-bound constraint so that it reads D moved forward by
// s; a constraint already moved along the same axis gains one more step.
func shift(x *constraint, a axis, s step) (*constraint, error) {
	inner, steps := x, []step{s}
	if x.shift != nil {
		if x.shift.axis.d != a.d {
			return nil, fmt.Errorf("a constraint moved along %s cannot move along %s too", x.shift.axis.d, a.d)
		}
		inner, steps = x.shift.inner, append(slices.Clone(x.shift.steps), s)
	}
	key := "S" + a.d.String()
	for _, st := range steps {
		key += fmt.Sprintf("%+d%s", st.n, st.unit)
	}
	return &constraint{group: inner.group, col: inner.col, mentions: x.mentions, key: key + "|" + inner.key,
		shift: &shifted{axis: a, steps: steps, inner: inner}}, nil
}

// holdsShifted evaluates a shifted constraint on row i of td.
func (d *Data) holdsShifted(s *shifted, td *tableData, i int) (bool, error) {
	dv, err := d.column(td, i, s.axis.d)
	if err != nil {
		return false, err
	}
	var moved Value
	if t, ok := dv.(time.Time); ok {
		for j := len(s.steps) - 1; j >= 0; j-- {
			t = move(t, s.steps[j])
		}
		moved = t
	}
	col := func(c *model.Column) (Value, error) { return d.movedColumn(s.axis, td, i, c, moved) }
	x := s.inner
	switch {
	case x.group || x.vals != nil:
		v, err := col(x.col)
		if err != nil {
			return false, err
		}
		if x.group {
			return matchGroup(v, x.val)
		}
		return matchPin(v, x.vals)
	case x.pred != nil:
		v, err := d.rowWith(td, i, x.pred, col)
		return truth(v), err
	case x.rng != nil:
		v, err := col(x.col)
		return x.rng.holds(v), err
	}
	return false, fmt.Errorf("cannot move this constraint")
}

// movedColumn reads column c of row i of td as if the row's D were moved
// (NULL when D is): c is time-bound, or read as it is.
func (d *Data) movedColumn(a axis, td *tableData, i int, c *model.Column, moved Value) (Value, error) {
	switch {
	case !a.bound(c):
		return d.column(td, i, c)
	case moved == nil:
		return nil, nil
	case c == a.d:
		return moved, nil
	case c.Table == a.d.Table && c.Derived != nil && a.fromDAlone(c):
		// a derived column computed from D alone moves by its formula
		// (a calendar's too, when D is the calendar's key)
		return d.rowWith(td, i, c.Derived, func(x *model.Column) (Value, error) { return d.movedColumn(a, td, i, x, moved) })
	case a.cal != nil && c.Table == a.cal:
		cd := d.tables[a.cal]
		pos, ok := cd.stored[a.calKey]
		if !ok {
			return nil, fmt.Errorf("%s is not a stored column", a.calKey)
		}
		for r, row := range cd.rows {
			if row[pos] != nil {
				if cmp, err := compare(row[pos], moved); err == nil && cmp == 0 {
					return d.column(cd, r, c)
				}
			}
		}
		return nil, nil
	}
	return nil, fmt.Errorf("%s cannot be moved along %s", c, a.d)
}

// fromDAlone reports whether the derived column c reads no stored column
// but D.
func (a axis) fromDAlone(c *model.Column) bool {
	stored := 0
	for _, x := range model.Columns(c.Derived) {
		if x.Stored() {
			if x != a.d {
				return false
			}
			stored++
		}
	}
	return stored > 0
}

// rowWith evaluates a row expression for row i of td, reading columns
// through col.
func (d *Data) rowWith(td *tableData, i int, e model.Expr, col func(*model.Column) (Value, error)) (Value, error) {
	if c, ok := e.(*model.ColRef); ok {
		return col(c.Col)
	}
	v, ok, err := scalar(e, func(x model.Expr) (Value, error) { return d.rowWith(td, i, x, col) })
	if !ok && err == nil {
		return nil, fmt.Errorf("%s cannot appear in a row expression", model.Text(e))
	}
	return v, err
}

// timeRange is lo < D <= hi (lo <= D with loIn; no lower end without lo).
type timeRange struct {
	lo, hi *time.Time
	loIn   bool
}

func (r *timeRange) holds(v Value) bool {
	t, ok := v.(time.Time)
	if !ok {
		return false
	}
	if r.lo != nil && (t.Before(*r.lo) || (!r.loIn && t.Equal(*r.lo))) {
		return false
	}
	return !t.After(*r.hi)
}

// rangeOn is the constraint that D lies in r.
func rangeOn(col *model.Column, r *timeRange) *constraint {
	k := "R" + colKey(col) + "|" + key(*r.hi)
	if r.lo != nil {
		k += fmt.Sprintf("|%v|%s", r.loIn, key(*r.lo))
	}
	return &constraint{col: col, rng: r, mentions: []*model.Column{col}, key: k}
}

// timeEdit applies a time edit to cell c of a measure expression x. ok is
// false where the edit needs E and the cell has no rows of x: the value
// there is NULL.
func (ev *evaluator) timeEdit(c cell, ed *model.CellEdit, x model.Expr) (out cell, ok bool, err error) {
	a := axisOf(ed.Col)
	if ed.Kind == model.EditBack {
		out = cell{}
		for _, k := range c {
			if a.boundConstraint(k) {
				if k, err = shift(k, a, step{n: ed.N, unit: ed.Unit}); err != nil {
					return nil, false, err
				}
			}
			out = out.with(k)
		}
		return out, true, nil
	}
	e, found, err := ev.extreme(c, ed, x)
	if err != nil || !found {
		return nil, false, err
	}
	if ed.Kind == model.EditLatest || ed.Kind == model.EditEarliest {
		return c.without(func(k *constraint) bool { return k.mentionsCol(ed.Col) }).with(pinOn(ed.Col, []Value{e})), true, nil
	}
	r := &timeRange{hi: &e}
	switch ed.Kind {
	case model.EditToDate:
		lo := truncate(ed.Unit, e)
		r.lo, r.loIn = &lo, true
	case model.EditLast:
		lo := move(e, step{n: -ed.N, unit: ed.Unit})
		r.lo = &lo
	}
	return c.without(a.boundConstraint).with(rangeOn(ed.Col, r)), true, nil
}

// extreme is E (the latest D) or, for `= earliest`, F (the earliest)
// among the cell's rows of x's iteration tables.
func (ev *evaluator) extreme(c cell, ed *model.CellEdit, x model.Expr) (time.Time, bool, error) {
	tables, err := iterationTables(x, nil, map[*model.Measure]bool{})
	if err != nil {
		return time.Time{}, false, err
	}
	var best time.Time
	found := false
	for _, t := range tables {
		td := ev.d.tables[t]
		if td == nil {
			return best, false, fmt.Errorf("table %s is not loaded", t.Name)
		}
		if _, ok := reachable(td, ed.Col.Table); !ok {
			return best, false, &errUnreachable{col: ed.Col, from: t}
		}
		rows, err := ev.rowsOf(td, c)
		if err != nil {
			return best, false, err
		}
		for _, r := range rows {
			v, err := ev.d.column(td, r, ed.Col)
			if err != nil {
				return best, false, err
			}
			tv, ok := v.(time.Time)
			if !ok {
				continue
			}
			if !found || (ed.Kind == model.EditEarliest && tv.Before(best)) || (ed.Kind != model.EditEarliest && tv.After(best)) {
				best, found = tv, true
			}
		}
	}
	return best, found, nil
}
