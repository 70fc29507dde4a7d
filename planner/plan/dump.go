package plan

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// Dump prints the plan for a reader: the query, its grouping sets, each
// context with its relations (scans with their joins, row filters, keys,
// inputs and leaves; per-grain aggregates with their sub-contexts;
// windows), the measure values computed once and read by name, the
// outputs, the order and the cautions. Expressions print as the language
// writes them; rel.column reads a relation's column in the current cell.
// A grouping set prints as the keys it rolls up, in braces; a relation's
// grouping ids map each set of its context to the id its cells carry.
func (p *Plan) Dump() string {
	d := &dumper{labels: map[*Computed]string{}}
	d.name(p)
	q := p.Query
	var measures []string
	for _, m := range q.Measures {
		measures = append(measures, m.Name)
	}
	d.line(0, "query")
	d.line(1, "measures: %s", strings.Join(measures, ", "))
	if len(q.GroupNames) > 0 {
		d.line(1, "by: %s", strings.Join(q.GroupNames, ", "))
	}
	d.list(1, "where", q.Filters)
	d.line(1, "totals: %s", q.Totals)
	if q.Limit > 0 {
		d.line(1, "limit: %d", q.Limit)
	}
	d.context(0, p.Root)
	if len(d.order) > 0 {
		d.line(0, "values")
		for _, c := range d.order {
			d.line(1, "%s = %s", d.labels[c], d.text(c.X))
		}
	}
	d.line(0, "outputs")
	for _, o := range p.Outputs {
		d.line(1, "%s = %s", o.Name, d.text(o.Expr))
	}
	if len(p.Order) > 0 {
		var keys []string
		for _, k := range p.Order {
			key := k.Group
			if k.Output != nil {
				key = k.Output.Name
			}
			if k.Desc {
				key += " desc"
			}
			keys = append(keys, key)
		}
		d.line(0, "order: %s", strings.Join(keys, ", "))
	}
	for _, c := range p.Cautions {
		d.line(0, "caution: %s", c)
	}
	return d.b.String()
}

// dumper writes a plan's dump.
type dumper struct {
	b strings.Builder
	// labels name the computed values, in order the order they are
	// defined in (each after the values it reads).
	labels map[*Computed]string
	order  []*Computed
}

func (d *dumper) line(depth int, format string, args ...any) {
	d.b.WriteString(strings.Repeat("  ", depth))
	fmt.Fprintf(&d.b, format, args...)
	d.b.WriteByte('\n')
}

// text prints e with computed values by their labels.
func (d *dumper) text(e model.Expr) string {
	return model.TextWith(e, func(x model.Texter) string {
		if c, ok := x.(*Computed); ok {
			return d.labels[c]
		}
		return x.Text()
	})
}

// list prints a line of expressions joined by and, when there are any.
func (d *dumper) list(depth int, what string, es []model.Expr) {
	if len(es) == 0 {
		return
	}
	var t []string
	for _, e := range es {
		t = append(t, d.text(e))
	}
	d.line(depth, "%s: %s", what, strings.Join(t, " and "))
}

// name labels every computed value of the plan: its measure's name, with
// #2, #3... when the measure is computed in more than one cell.
func (d *dumper) name(p *Plan) {
	seen := map[*Computed]bool{}
	count := map[*model.Measure]int{}
	var visit func(e model.Expr)
	visit = func(e model.Expr) {
		model.Walk(e, func(x model.Expr) bool {
			c, ok := x.(*Computed)
			if !ok || seen[c] {
				return true
			}
			seen[c] = true
			visit(c.X)
			count[c.Measure]++
			d.labels[c] = model.QuoteName(c.Measure.Name)
			if n := count[c.Measure]; n > 1 {
				d.labels[c] += "#" + strconv.Itoa(n)
			}
			d.order = append(d.order, c)
			return true
		})
	}
	var contexts func(ctx *Context)
	contexts = func(ctx *Context) {
		for _, r := range ctx.Rels {
			if r.Per != nil {
				contexts(r.Per.Sub)
			}
		}
		for _, v := range ctx.Values {
			visit(v.Expr)
		}
	}
	contexts(p.Root)
	for _, o := range p.Outputs {
		visit(o.Expr)
	}
}

// set prints a grouping set of a context with keys: the keys it rolls
// up, in braces.
func set(mask uint64, keys []Key) string {
	var up []string
	for i, k := range keys {
		if mask&bit(i, len(keys)) != 0 {
			up = append(up, k.Name)
		}
	}
	return "{" + strings.Join(up, ", ") + "}"
}

func (d *dumper) context(depth int, ctx *Context) {
	d.line(depth, "context %s", d.contextName(ctx))
	in := depth + 1
	var keys []string
	for _, k := range ctx.Keys {
		keys = append(keys, d.key(k))
	}
	if len(keys) > 0 {
		d.line(in, "keys: %s", strings.Join(keys, ", "))
	}
	var sets []string
	for _, s := range ctx.Sets {
		sets = append(sets, set(s, ctx.Keys))
	}
	d.line(in, "sets (rolled up): %s", strings.Join(sets, " "))
	d.list(in, "filters", ctx.Filters)
	for _, r := range ctx.Rels {
		d.rel(in, ctx, r)
	}
	var bases []string
	for _, b := range ctx.Bases {
		bases = append(bases, b.Name)
	}
	if len(bases) > 0 {
		d.line(in, "rows: the cells of %s", strings.Join(bases, ", "))
	}
	for _, v := range ctx.Values {
		d.line(in, "value %s = %s", v.Name, d.text(v.Expr))
	}
}

// key prints a key: its name, the row expression it groups by when that
// is not its column (a date moved by a time edit), and "(pin)" for the key
// that stands for the pin of `= latest` / `= earliest` (Key.Pin).
func (d *dumper) key(k Key) string {
	s := k.Name
	if k.Expr != nil {
		s += " = " + d.text(k.Expr)
	}
	if k.Pin {
		s += " (pin)"
	}
	return s
}

func (d *dumper) rel(depth int, ctx *Context, r *Rel) {
	var keys []string
	for _, i := range r.Keys {
		keys = append(keys, ctx.Keys[i].Name)
	}
	what := "rel"
	switch {
	case r.Scan != nil:
		what = "scan " + model.QuoteName(r.Scan.Table.Name)
	case r.Per != nil:
		what = "per-grain aggregate"
	case r.Window != nil:
		what = "window over " + r.Window.Base.Name
	}
	d.line(depth, "%s: %s", r.Name, what)
	in := depth + 1
	if len(keys) > 0 {
		d.line(in, "cell keys: %s", strings.Join(keys, ", "))
	}
	var gids []string
	for _, s := range ctx.Sets {
		gids = append(gids, fmt.Sprintf("%s→%d", set(s, ctx.Keys), r.GidOf[s]))
	}
	if len(gids) > 0 {
		d.line(in, "grouping ids: %s", strings.Join(gids, " "))
	}
	switch {
	case r.Scan != nil:
		d.scan(in, ctx, r.Scan)
	case r.Per != nil:
		for _, l := range r.Per.Leaves {
			arg := "*"
			if l.Value != nil {
				arg = l.Value.Name
			}
			var per []string
			for _, k := range l.PerKeys {
				per = append(per, d.key(k))
			}
			s := fmt.Sprintf("%s = %s(%s per %s)", l.Name, l.Func, arg, strings.Join(per, ", "))
			if l.Having != nil {
				s += " having " + l.Having.Name
			}
			d.line(in, "%s: %s", s, l.T)
		}
		d.context(in, r.Per.Sub)
	case r.Window != nil:
		var part []string
		for _, i := range r.Window.Partition {
			part = append(part, ctx.Keys[i].Name)
		}
		if len(part) == 0 {
			part = []string{"none (the whole grouping set)"}
		}
		d.line(in, "partition: %s", strings.Join(part, ", "))
		for _, w := range r.Window.Parts {
			d.line(in, "%s = %s(%s): %s", w.Name, w.Func, w.Source, w.T)
		}
	}
}

func (d *dumper) scan(depth int, ctx *Context, s *Scan) {
	for _, l := range s.Joins {
		kind := "left join"
		if s.Inner[l] {
			kind = "join"
		}
		d.line(depth, "%s %s", kind, l)
	}
	d.list(depth, "where", s.Where)
	var keys []string
	for _, k := range s.Keys {
		keys = append(keys, d.key(k))
	}
	if len(keys) > 0 {
		d.line(depth, "group by: %s", strings.Join(keys, ", "))
	}
	for _, in := range s.Inputs {
		d.line(depth, "input %s = %s", in.Name, d.text(in.Expr))
	}
	for _, l := range s.Leaves {
		arg := "*"
		if l.Arg != nil {
			arg = l.Arg.Name
		}
		if l.Distinct {
			arg = "distinct " + arg
		}
		line := fmt.Sprintf("leaf %s = %s(%s)", l.Name, l.Func, arg)
		if l.Filter != nil {
			line += " where " + l.Filter.Name
		}
		d.line(depth, "%s: %s", line, l.T)
	}
	if r := s.Range; r != nil {
		cells := ctx
		if r.Cells != nil {
			cells = r.Cells
		}
		var match, rows []string
		for _, i := range r.Match {
			if i < len(cells.Keys) {
				match = append(match, ctx.Keys[i].Name)
			} else {
				rows = append(rows, ctx.Keys[i].Name)
			}
		}
		line := "range: " + d.rangeText(r)
		for _, a := range r.Also {
			line += "; and " + d.rangeText(a)
		}
		if r.Cells != nil {
			line += "; cells of " + d.contextName(r.Cells)
		}
		if len(match) > 0 {
			line += "; matching " + strings.Join(match, ", ")
		}
		if len(rows) > 0 {
			line += "; grouped by the rows' " + strings.Join(rows, ", ")
		}
		d.line(depth, "%s", line)
	}
}

// contextName is how the dump names a context.
func (d *dumper) contextName(ctx *Context) string {
	if ctx.Name == "" {
		return "root"
	}
	return ctx.Name
}

// rangeText is one range of a window edit's scan.
func (d *dumper) rangeText(r *TimeRange) string {
	ed := &model.CellEdit{Kind: r.Kind, N: r.N, Unit: r.Unit}
	upTo := "up to"
	if r.Kind == model.EditLatest || r.Kind == model.EditEarliest {
		upTo = "at"
	}
	return fmt.Sprintf("%s %s, %s E = %s", r.D.Name, ed.TimeText(), upTo, d.text(r.E))
}
