package casegen

import (
	"fmt"
	"slices"
	"strings"
)

// mx is a generated measure expression and what the generator knows of
// it.
type mx struct {
	text string
	// kind is "num", "text", "date" or "bool".
	kind string
	// exact is true when the value is computed exactly on both paths
	// (integers and decimals, never a division or a float).
	exact bool
	// tables are the iteration tables of its aggregates.
	tables []*table
	// factors counts the decimal factors of a product (DuckDB adds their
	// scales; more than three could overflow DECIMAL(38, s)).
	factors  int
	advanced bool
}

// measure is a named measure of the model.
type measure struct {
	mx
	name string
}

func union(a, b []*table) []*table {
	out := slices.Clone(a)
	for _, t := range b {
		if !slices.Contains(out, t) {
			out = append(out, t)
		}
	}
	return out
}

// drawMeasures draws a few aggregate measures, then measures built on
// them and on fresh aggregates.
func (g *gen) drawMeasures() {
	nBase := g.intn(1, 4)
	for i := 0; i < nBase; i++ {
		g.addMeasure(g.aggregate(g.anyFact()))
	}
	nMore := g.intn(0, 5)
	for i := 0; i < nMore; i++ {
		g.addMeasure(g.expr(g.intn(1, 3)))
	}
	if f := g.anyFact(); g.chance(25) {
		// A running total, period to date or back on a fact's own date,
		// the edit alone: time reports over it (drawQuery) are what the
		// SQL path computes over the report's cells.
		if dates := g.dateCols(f.cols); len(dates) > 0 {
			// sum, min or max: aggregates that decompose over cells.
			fn := []string{"sum", "sum", "min", "max"}[g.pick(4)]
			arg, exact, factors := g.rowNumber(f, fn != "sum")
			a := mx{kind: "num", text: fn + "(" + arg + ")", exact: exact, factors: factors, tables: []*table{f}}
			units := []string{"day", "week", "month", "quarter", "year"}
			d := g.col(dates).ref()
			edit := d + " running"
			switch k := g.pick(10); {
			case k < 4:
				edit = d + " to date " + units[g.pick(5)]
			case k < 7:
				edit = fmt.Sprintf("%s back %d %s", d, g.intn(1, 13), units[g.pick(5)])
			}
			a.text, a.advanced = "("+a.text+")["+edit+"]", true
			g.addMeasure(a)
		}
	}
	g.drawChain()
}

// drawChain now and then adds an aggregate under two time edits in one
// brackets, on dates its table reaches: the second applies in the cell
// the first made (a window's range replaced, moved by back or pinned;
// two ranges where the dates are unrelated).
func (g *gen) drawChain() {
	if f := g.anyFact(); g.chance(25) {
		a := g.aggregate(f)
		if dates := g.dateCols(g.common(a.tables, func(c *column) bool { return c.groupable() })); len(dates) > 0 {
			d1, d2 := g.col(dates), g.col(dates)
			e1, e2 := g.timeEdit(d1), g.timeEdit(d2)
			if d1 != d2 && strings.Contains(e1, " back ") && strings.Contains(e2, " back ") {
				// two backs move along one date (along two, a constraint
				// has no defined meaning: both paths refuse it)
				e2 = g.timeEdit(d1)
			}
			a.text = "(" + a.text + ")[" + e1 + "; " + e2 + "]"
			a.advanced = true
			g.addMeasure(a)
		}
	}
}

func (g *gen) addMeasure(e mx) {
	g.nameSeq++
	g.measures = append(g.measures, &measure{mx: e, name: fmt.Sprintf("m%d", g.nameSeq)})
}

// anyFact picks an iteration table (now and then a dimension, which is
// an iteration table too when an aggregate reads only its columns).
func (g *gen) anyFact() *table {
	if g.chance(10) {
		for _, t := range g.tables {
			if !t.fact && len(t.cols) > 1 {
				return t
			}
		}
	}
	var facts []*table
	for _, t := range g.tables {
		if t.fact {
			facts = append(facts, t)
		}
	}
	return facts[g.pick(len(facts))]
}

// aggregate draws an aggregate over table f: its argument reads at least
// one column of f, so f is its iteration table.
func (g *gen) aggregate(f *table) mx {
	out := mx{kind: "num", exact: true, tables: []*table{f}}
	roots := g.roots()
	switch k := g.intn(0, 11); {
	case k == 0 && len(roots) == 1:
		out.text = "count(*)"
		out.tables = []*table{roots[0]}
	case k <= 1:
		c := g.ownColumn(f, func(c *column) bool { return c.exactType() })
		out.text = "count(" + c.ref() + ")"
	case k <= 3:
		c := g.ownColumn(f, func(c *column) bool { return c.exactType() && !c.key })
		out.text = "count(distinct " + c.ref() + ")"
	case k <= 5:
		arg, exact, factors := g.rowNumber(f, false)
		out.text, out.exact, out.factors = "sum("+arg+")", exact, factors
	case k == 6:
		arg, _, _ := g.rowNumber(f, true)
		out.text, out.exact = "avg("+arg+")", false
	case k <= 8:
		fn := []string{"min", "max"}[g.pick(2)]
		if g.chance(30) {
			c := g.ownColumn(f, func(c *column) bool { return c.typ == "text" || c.typ == "date" || c.typ == "timestamp" })
			if c.typ == "text" || c.typ == "date" || c.typ == "timestamp" {
				out.kind = c.typ
				out.text = fn + "(" + c.ref() + ")"
				return out
			}
		}
		arg, exact, factors := g.rowNumber(f, true)
		out.text, out.exact, out.factors = fn+"("+arg+")", exact, factors
	default:
		fn := []string{"median", "stddev", "variance"}[g.pick(3)]
		arg, _, _ := g.rowNumber(f, true)
		out.text, out.exact = fn+"("+arg+")", false
	}
	return out
}

// ownColumn picks a column of f that keep accepts (f's key otherwise).
func (g *gen) ownColumn(f *table, keep func(*column) bool) *column {
	var cs []*column
	for _, c := range f.cols {
		if keep(c) {
			cs = append(cs, c)
		}
	}
	if len(cs) == 0 {
		return f.cols[0]
	}
	return cs[g.pick(len(cs))]
}

// rowNumber draws a numeric row expression that reads a column of f
// (nonadditive values only where allowNonadditive, for aggregates other
// than sum: additivity follows the value, so a nonadditive column is
// summed only as a rate times a quantity). It reports whether the value
// is exact and its decimal factors.
func (g *gen) rowNumber(f *table, allowNonadditive bool) (string, bool, int) {
	base := g.ownColumn(f, func(c *column) bool { return c.numeric() && !c.key && c.link == nil })
	if !base.numeric() || base.key {
		// f has no number: count rows of it instead, as a sum of ones.
		return "case when " + base.ref() + " is null then 0 else 1 end", true, 0
	}
	text, exact, factors := base.ref(), base.exactType(), 0
	if base.typ == "decimal" {
		factors = 1
	}
	nonadditive := base.nonadditive
	times := func(other *column) {
		text = text + " * " + other.ref()
		exact = exact && other.exactType()
		if other.typ == "decimal" {
			factors++
		}
		// a rate times a quantity is additive; two rates are not
		nonadditive = nonadditive == other.nonadditive && nonadditive
	}
	switch k := g.intn(0, 9); {
	case k <= 3:
	case k <= 5:
		other := g.numberColumn([]*table{f}, nil)
		if other != nil && (other.typ != "decimal" || factors < 2) {
			times(other)
		} else {
			text = "coalesce(" + text + ", 0)"
		}
	case k == 6:
		text = text + " + " + []string{"1", "2", "0.5"}[g.pick(3)]
	case k == 7:
		text = "case when " + g.predicate([]*table{f}) + " then " + text + " else 0 end"
	case k == 8:
		text = "coalesce(" + text + ", 0)"
	default:
		text = "abs(" + text + ")"
	}
	if nonadditive && !allowNonadditive {
		cs := g.common([]*table{f}, func(c *column) bool {
			return c.numeric() && !c.key && c.link == nil && !c.nonadditive && c.derived == "" && (c.typ != "decimal" || factors < 2)
		})
		if len(cs) == 0 {
			return "case when " + base.ref() + " is null then 0 else 1 end", true, 0
		}
		text = "(" + text + ")"
		times(cs[g.pick(len(cs))])
	}
	return text, exact, factors
}

// numberColumn picks a numeric column reachable from ts, other than
// not; nil when there is none.
func (g *gen) numberColumn(ts []*table, not *column) *column {
	cs := g.common(ts, func(c *column) bool { return c.numeric() && !c.key && c.link == nil && c != not })
	if len(cs) == 0 {
		return nil
	}
	return cs[g.pick(len(cs))]
}

// expr draws a measure expression of the given depth.
func (g *gen) expr(depth int) mx {
	if depth <= 0 {
		if len(g.measures) > 0 && g.chance(60) {
			return g.ref()
		}
		return g.aggregate(g.anyFact())
	}
	k := g.intn(0, 11)
	if !g.o.Advanced && (k == 4 || k == 5 || k == 6) {
		k = 0
	}
	switch k {
	case 0, 1:
		return g.arith(depth)
	case 2:
		a := g.numExpr(depth - 1)
		return mx{text: "((" + a.text + ") where " + g.predicate(a.tables) + ")", kind: a.kind, exact: a.exact,
			tables: a.tables, factors: a.factors, advanced: a.advanced}
	case 3:
		return g.scalarFunc(depth)
	case 4, 5:
		return g.edited(depth)
	case 6:
		return g.perGrain(depth)
	case 7:
		a, b := g.numExpr(depth-1), g.numExpr(depth-1)
		c := g.exactExpr(depth - 1)
		return mx{text: "case when (" + c.text + ") " + g.cmpOp() + " " + g.smallNumber() + " then " + a.text + " else " + b.text + " end",
			kind: "num", exact: a.exact && b.exact, tables: union(union(a.tables, b.tables), c.tables),
			factors: max(a.factors, b.factors), advanced: a.advanced || b.advanced || c.advanced}
	}
	return g.expr(depth - 1)
}

// ref uses a measure defined earlier.
func (g *gen) ref() mx {
	m := g.measures[g.pick(len(g.measures))]
	e := m.mx
	e.text = m.name
	return e
}

// numExpr draws a numeric expression.
func (g *gen) numExpr(depth int) mx {
	for i := 0; i < 4; i++ {
		if e := g.expr(depth); e.kind == "num" {
			return e
		}
	}
	return g.aggregateNum(g.anyFact())
}

func (g *gen) aggregateNum(f *table) mx {
	arg, exact, factors := g.rowNumber(f, false)
	return mx{text: "sum(" + arg + ")", kind: "num", exact: exact, tables: []*table{f}, factors: factors}
}

// exactExpr draws an exact numeric expression (for comparisons and
// divisors).
func (g *gen) exactExpr(depth int) mx {
	for i := 0; i < 4; i++ {
		if e := g.expr(depth); e.kind == "num" && e.exact {
			return e
		}
	}
	f := g.anyFact()
	c := g.ownColumn(f, func(c *column) bool { return c.exactType() })
	return mx{text: "count(" + c.ref() + ")", kind: "num", exact: true, tables: []*table{f}}
}

func (g *gen) arith(depth int) mx {
	a := g.numExpr(depth - 1)
	var b mx
	if g.chance(30) {
		b = mx{text: g.smallNumber(), kind: "num", exact: true}
	} else {
		b = g.numExpr(depth - 1)
	}
	op := []string{"+", "-", "*", "/"}[g.pick(4)]
	if op == "*" && a.factors+b.factors > 3 {
		op = "+"
	}
	if op == "/" && !b.exact {
		if g.chance(50) {
			b = g.exactExpr(depth - 1)
		} else {
			op = "-"
		}
	}
	out := mx{text: "(" + a.text + ") " + op + " (" + b.text + ")", kind: "num", exact: a.exact && b.exact && op != "/",
		tables: union(a.tables, b.tables), factors: max(a.factors, b.factors), advanced: a.advanced || b.advanced}
	if op == "*" {
		out.factors = a.factors + b.factors
	}
	return out
}

func (g *gen) scalarFunc(depth int) mx {
	a := g.numExpr(depth - 1)
	out := a
	switch g.intn(0, 6) {
	case 0:
		out.text = "coalesce(" + a.text + ", 0)"
	case 1:
		out.text = "abs(" + a.text + ")"
	case 2:
		if a.exact {
			out.text = "round(" + a.text + ", 1)"
		} else {
			out.text = "-(" + a.text + ")"
		}
	case 3, 4:
		b := g.numExpr(depth - 1)
		out.text = []string{"least", "greatest"}[g.pick(2)] + "(" + a.text + ", " + b.text + ")"
		out.exact, out.tables = a.exact && b.exact, union(a.tables, b.tables)
		out.factors, out.advanced = max(a.factors, b.factors), a.advanced || b.advanced
	case 5:
		if a.exact {
			out.text = "nullif(" + a.text + ", " + g.smallNumber() + ")"
		} else {
			out.text = "coalesce(" + a.text + ", 1)"
		}
	default:
		out.text = "-(" + a.text + ")"
	}
	return out
}

// edited draws (X)[edit; ...] with edits on columns X's tables reach.
func (g *gen) edited(depth int) mx {
	a := g.numExpr(depth - 1)
	cols := g.common(a.tables, func(c *column) bool { return c.groupable() })
	var edits []string
	if dates := g.dateCols(cols); len(dates) > 0 && g.chance(35) {
		edits = append(edits, g.timeEdit(g.col(dates)))
		if g.chance(30) {
			// a chain: the second time edit applies in the cell the
			// first one made (a window's range replaced, moved, pinned)
			edits = append(edits, g.timeEdit(g.col(dates)))
		}
	}
	for n := g.intn(1, 2); len(edits) < n; {
		switch k := g.intn(0, 9); {
		case k <= 2 && len(cols) > 0:
			c := g.col(cols)
			// A pin takes literals; the resolver reads -5.00 as an
			// expression, so negative values are left out.
			var vals []string
			for _, v := range c.vals {
				if !strings.HasPrefix(v, "-") {
					vals = append(vals, v)
				}
			}
			if c.derived == "" && len(vals) > 0 && !c.key && c.link == nil {
				v := vals[g.pick(len(vals))]
				if g.chance(40) && len(vals) > 1 {
					edits = append(edits, c.ref()+" in ("+v+", "+vals[g.pick(len(vals))]+")")
				} else {
					edits = append(edits, c.ref()+" = "+v)
				}
			} else {
				edits = append(edits, "drop "+c.ref())
			}
		case k <= 4 && len(cols) > 0:
			edits = append(edits, "drop "+g.col(cols).ref())
		case k == 5:
			edits = append(edits, "drop "+quoted(g.tables[g.pick(len(g.tables))].name))
		case k == 6:
			edits = append(edits, "drop")
		case k <= 8 && len(cols) > 0:
			edits = append(edits, "ungroup "+g.col(cols).ref())
		default:
			edits = append(edits, "ungroup")
		}
	}
	a.text = "(" + a.text + ")[" + strings.Join(edits, "; ") + "]"
	a.advanced = true
	return a
}

// dateCols are the stored date and timestamp columns among cols: the
// columns a time edit moves.
func (g *gen) dateCols(cols []*column) []*column {
	var out []*column
	for _, c := range cols {
		if c.derived == "" && (c.typ == "date" || c.typ == "timestamp") {
			out = append(out, c)
		}
	}
	return out
}

// timeEdit draws one of the six time edits on the date column d.
func (g *gen) timeEdit(d *column) string {
	units := []string{"day", "days", "week", "month", "months", "quarter", "year", "years"}
	unit := units[g.pick(len(units))]
	switch g.intn(0, 5) {
	case 0:
		return d.ref() + " = latest"
	case 1:
		return d.ref() + " = earliest"
	case 2:
		return fmt.Sprintf("%s back %d %s", d.ref(), g.intn(0, 2), unit)
	case 3:
		return d.ref() + " to date " + unit
	case 4:
		return d.ref() + " running"
	}
	return fmt.Sprintf("%s last %d %s", d.ref(), g.intn(1, 3), unit)
}

// perGrain draws AGG(X per C... having H) or count(* per C... having H).
func (g *gen) perGrain(depth int) mx {
	a := g.numExpr(depth - 1)
	star := g.chance(25)
	var having mx
	hasHaving := g.chance(50)
	if hasHaving {
		// The having clause may read other tables than X: it keeps or
		// drops groups and adds no rows (row_set_having_tables).
		having = g.exactExpr(depth - 1)
		if star {
			a = having
		}
	}
	tables := a.tables
	if hasHaving {
		tables = union(tables, having.tables)
	}
	cols := g.common(tables, func(c *column) bool { return c.groupable() })
	if star && !hasHaving {
		// Without a having clause, count(* per C) counts the groups of
		// C's own table: per columns of one iteration table.
		f := g.anyFact()
		tables = []*table{f}
		cols = nil
		for _, c := range f.cols {
			if c.groupable() {
				cols = append(cols, c)
			}
		}
	}
	if len(cols) == 0 {
		return a
	}
	first := g.col(cols)
	if star && hasHaving {
		// count(* per C having H): the groups are the rows of C's own
		// table, whichever tables H reads (row_set_having_tables): a second
		// per column must be reachable from it.
		tables = union([]*table{first.t}, having.tables)
		cols = slices.DeleteFunc(slices.Clone(cols), func(c *column) bool { return !reaches(first.t, c.t) })
	}
	per := []string{first.ref()}
	if g.chance(30) {
		if c := g.col(cols).ref(); c != per[0] {
			per = append(per, c)
		}
	}
	clause := " per " + strings.Join(per, ", ")
	if hasHaving {
		clause += " having " + g.havingCond(having)
	}
	out := mx{kind: "num", exact: true, tables: tables, advanced: true}
	if star {
		out.text = "count(*" + clause + ")"
		return out
	}
	fn := []string{"sum", "avg", "min", "max", "count", "median"}[g.pick(6)]
	out.text = fn + "(" + a.text + clause + ")"
	out.exact = a.exact && fn != "avg" && fn != "median"
	if fn == "sum" || fn == "min" || fn == "max" {
		out.factors = a.factors
	}
	return out
}

func (g *gen) havingCond(h mx) string {
	switch g.intn(0, 5) {
	case 0:
		return "(" + h.text + ") is not null"
	case 1:
		return "(" + h.text + ") is null"
	case 2:
		return "coalesce(" + h.text + ", 0) = 0"
	}
	return "(" + h.text + ") " + g.cmpOp() + " " + g.smallNumber()
}

func (g *gen) cmpOp() string { return []string{">", ">=", "<", "<=", "=", "<>"}[g.pick(6)] }

func (g *gen) smallNumber() string {
	return []string{"0", "1", "2", "3", "5", "10", "20", "1.5", "100"}[g.pick(9)]
}

// predicate draws a row predicate over columns every table of ts
// reaches.
func (g *gen) predicate(ts []*table) string {
	cols := g.common(ts, func(c *column) bool { return c.groupable() || c.typ == "float" })
	if len(cols) == 0 {
		return "1 = 1"
	}
	p := g.atom(g.col(cols))
	switch g.intn(0, 6) {
	case 0:
		return "not (" + p + ")"
	case 1:
		return "(" + p + " or " + g.atom(g.col(cols)) + ")"
	case 2:
		// Split into two conjuncts once negations are pushed inward: an
		// edit that drops one column keeps the other's.
		return "not (" + p + " or " + g.atom(g.col(cols)) + ")"
	}
	return p
}

// atom is one comparison on a column.
func (g *gen) atom(c *column) string {
	vals := c.vals
	if len(vals) == 0 {
		// keys, links and derived columns: values of their own kind.
		switch c.typ {
		case "integer":
			vals = []string{"1", "2", "3", "99"}
			if c.name == "yr" {
				vals = []string{"2025", "2026"}
			}
		case "decimal":
			vals = []string{"0", "1.5", "10"}
		case "text":
			switch c.name {
			case "band":
				vals = []string{"'big'", "'small'", "'none'", "'Big'", "'big '"}
			case "zone":
				vals = []string{"'none'", "'North'"}
			case "region_or":
				vals = []string{"'?'", "'North'", "'East'"}
			default:
				vals = []string{"'k1'", "'k2'", "'zz'"}
			}
		case "date":
			vals = []string{"date '2026-01-01'", "date '2026-02-01'", "date '2026-03-01'"}
		case "timestamp":
			vals = []string{"timestamp '2026-01-05 00:00:00'", "timestamp '2026-02-01 00:00:00'"}
		default:
			vals = []string{"true"}
		}
	}
	v := vals[g.pick(len(vals))]
	switch k := g.intn(0, 9); {
	case k <= 2:
		return c.ref() + " = " + v
	case k == 3:
		return c.ref() + " <> " + v
	case k == 4:
		return c.ref() + " in (" + v + ", " + vals[g.pick(len(vals))] + ")"
	case k == 5:
		return c.ref() + " is null"
	case k == 6:
		return c.ref() + " is not null"
	case c.typ == "boolean":
		return c.ref()
	case k == 7 && c.typ == "text":
		return "lower(" + c.ref() + ") = lower(" + v + ")"
	case k == 7:
		lo, hi := v, vals[g.pick(len(vals))]
		return c.ref() + " between " + lo + " and " + hi
	}
	return c.ref() + " " + []string{"<", "<=", ">", ">="}[g.pick(4)] + " " + v
}

// col picks one of cols, half the time among the case's hot columns
// (when cols holds any), so that edits, per columns, filters and group
// columns often meet on the same columns.
func (g *gen) col(cols []*column) *column {
	if g.hot == nil {
		for _, t := range g.tables {
			for _, c := range t.cols {
				if c.groupable() && !c.key && len(g.hot) < 3 && g.chance(40) {
					g.hot = append(g.hot, c)
				}
			}
		}
		if g.hot == nil {
			g.hot = []*column{}
		}
	}
	if g.chance(50) {
		var hot []*column
		for _, c := range cols {
			if slices.Contains(g.hot, c) {
				hot = append(hot, c)
			}
		}
		if len(hot) > 0 {
			return hot[g.pick(len(hot))]
		}
	}
	return cols[g.pick(len(cols))]
}
