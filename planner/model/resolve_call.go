package model

import (
	"fmt"
	"maps"
	"slices"
	"sort"
	"strings"

	"github.com/rollwise/rollwise/grammar"
)

func (x *exprResolver) call(e *grammar.Call) Expr {
	name := strings.ToLower(e.Func.Name)
	if aggFuncs[name] {
		if x.row {
			x.errorf(e.Pos, "agg-in-row", "aggregate %s(...) cannot appear inside a row expression", name).Suggestion =
				"aggregates belong in measures; a derived column or a filter works on one row at a time"
			return nil
		}
		if e.Per != nil {
			return x.perAgg(name, e)
		}
		return x.agg(name, e)
	}
	if !slices.Contains(scalarFuncs, name) {
		all := append(append([]string{}, scalarFuncs...), "sum", "avg", "min", "max", "count", "median", "stddev", "variance")
		d := x.errorf(e.Func.Pos, "unknown-function", "unknown function '%s'", e.Func.Name)
		if near := grammar.Closest(name, all); near != "" {
			d.Message += fmt.Sprintf("; did you mean '%s'?", near)
		} else {
			d.Suggestion = "the functions are " + strings.Join(all, ", ")
		}
		return nil
	}
	if e.Star || e.Distinct || e.Per != nil {
		x.errorf(e.Pos, "bad-call", "%s(...) takes plain arguments (no *, distinct or per)", name)
		return nil
	}
	switch name {
	case "cast":
		return x.cast(e)
	case "extract", "date_trunc":
		return x.dateFunc(name, e)
	}
	if e.As != nil || e.From != nil {
		x.errorf(e.Pos, "bad-call", "%s(...) takes arguments separated by commas", name)
		return nil
	}
	var args []Expr
	for _, a := range e.Args {
		v := x.expr(a)
		if v == nil {
			return nil
		}
		args = append(args, v)
	}
	arity := map[string][2]int{"coalesce": {1, 99}, "nullif": {2, 2}, "abs": {1, 1}, "round": {1, 2},
		"least": {1, 99}, "greatest": {1, 99}, "lower": {1, 1}, "upper": {1, 1}}[name]
	if len(args) < arity[0] || len(args) > arity[1] {
		want := fmt.Sprintf("%d", arity[0])
		if arity[1] != arity[0] {
			want = fmt.Sprintf("%d or more", arity[0])
			if arity[1] < 99 {
				want = fmt.Sprintf("%d to %d", arity[0], arity[1])
			}
		}
		x.errorf(e.Pos, "bad-call", "%s takes %s arguments, not %d", name, want, len(args))
		return nil
	}
	f := &Func{Pos: e.Pos, Name: name, Args: args}
	switch name {
	case "coalesce", "least", "greatest":
		t, ok := x.commonType(e.Pos, name, args)
		if !ok {
			return nil
		}
		f.T = t
	case "nullif":
		if !x.comparable(e.Pos, args[0], args[1]) {
			return nil
		}
		f.T = args[0].Type()
	case "abs", "round":
		for _, a := range args {
			if !a.Type().Numeric() {
				x.errorf(a.Position(), "type", "%s needs a number, not %s", name, a.Type())
				return nil
			}
		}
		f.T = args[0].Type()
		if len(args) == 2 && args[1].Type() != TypeInteger {
			x.errorf(args[1].Position(), "type", "round's second argument is a whole number of decimal places")
			return nil
		}
	case "lower", "upper":
		if !x.wantType(args[0], TypeText, name) {
			return nil
		}
		f.T = TypeText
	}
	return f
}

func (x *exprResolver) cast(e *grammar.Call) Expr {
	if len(e.Args) != 1 || e.As == nil {
		x.errorf(e.Pos, "bad-call", "cast is written cast(x as TYPE)")
		return nil
	}
	t, ok := typeByName[strings.ToLower(e.As.Name)]
	if !ok {
		x.errorf(e.As.Pos, "unknown-type", "unknown type %q", e.As.Name).Suggestion =
			"write one of " + strings.Join(typeNameList(), ", ")
		return nil
	}
	v := x.expr(e.Args[0])
	if v == nil {
		return nil
	}
	return &Func{Pos: e.Pos, Name: "cast", Args: []Expr{v}, CastTo: t, T: t}
}

func (x *exprResolver) dateFunc(name string, e *grammar.Call) Expr {
	var unitExpr, arg grammar.Expr
	if name == "extract" {
		if len(e.Args) != 1 || e.From == nil {
			x.errorf(e.Pos, "bad-call", "extract is written extract(UNIT from d)")
			return nil
		}
		unitExpr, arg = e.Args[0], e.From
	} else {
		if len(e.Args) != 2 || e.From != nil || e.As != nil {
			x.errorf(e.Pos, "bad-call", "date_trunc is written date_trunc(UNIT, d)")
			return nil
		}
		unitExpr, arg = e.Args[0], e.Args[1]
	}
	u, ok := unitExpr.(*grammar.Ref)
	unit := ""
	if ok && u.Table == "" {
		unit = strings.ToLower(u.Name)
	}
	if !slices.Contains(dateUnits, unit) {
		x.errorf(unitExpr.Position(), "bad-unit", "%s needs a unit: one of %s", name, strings.Join(dateUnits, ", "))
		return nil
	}
	v := x.expr(arg)
	if v == nil {
		return nil
	}
	if v.Type() != TypeDate && v.Type() != TypeTimestamp {
		x.errorf(arg.Position(), "type", "%s needs a date or timestamp, not %s", name, v.Type())
		return nil
	}
	f := &Func{Pos: e.Pos, Name: name, Args: []Expr{v}, Unit: unit, T: TypeInteger}
	if name == "date_trunc" {
		f.T = v.Type()
	}
	return f
}

// agg resolves a row-wise aggregate and finds its iteration table.
func (x *exprResolver) agg(name string, e *grammar.Call) Expr {
	if e.As != nil || e.From != nil || e.Having != nil {
		x.errorf(e.Pos, "bad-call", "%s(...) takes one expression", name)
		return nil
	}
	a := &Agg{Pos: e.Pos, Func: name, Distinct: e.Distinct}
	if e.Star {
		if name != "count" {
			x.errorf(e.Pos, "bad-call", "only count takes *")
			return nil
		}
		a.T = TypeInteger
		a.Table = x.r.rootTable(e.Pos)
		if a.Table == nil {
			return nil
		}
		return a
	}
	if len(e.Args) != 1 {
		x.errorf(e.Pos, "bad-call", "%s takes one expression, not %d", name, len(e.Args))
		return nil
	}
	if e.Distinct && name != "count" {
		x.errorf(e.Pos, "bad-call", "distinct is only for count(distinct ...)").Suggestion =
			fmt.Sprintf("%s over distinct values is written %s(m per t.c)", name, name)
		return nil
	}
	arg := x.sub(true).expr(e.Args[0])
	if arg == nil {
		return nil
	}
	a.Arg = arg
	at := arg.Type()
	switch name {
	case "count":
		a.T = TypeInteger
	case "min", "max":
		a.T = at
	default:
		if !at.Numeric() {
			x.errorf(e.Args[0].Position(), "type", "cannot %s a %s value", aggVerb(name), at).Suggestion =
				"count(distinct ...) counts values; min and max work on any type"
			return nil
		}
		a.T = TypeFloat
		if name == "sum" {
			a.T = at
		}
	}
	t := x.iterationTable(e.Pos, arg)
	if t == nil {
		return nil
	}
	a.Table = t
	if name == "sum" {
		x.checkAdditive(e, arg)
	}
	return a
}

func aggVerb(name string) string {
	if name == "avg" {
		return "average"
	}
	if name == "sum" {
		return "sum"
	}
	return "take the " + name + " of"
}

// iterationTable is the one table, among those arg references, from which
// every other referenced table is reachable along links.
func (x *exprResolver) iterationTable(p grammar.Pos, arg Expr) *Table {
	var tables []*Table
	Walk(arg, func(e Expr) bool {
		if c, ok := e.(*ColRef); ok && !slices.Contains(tables, c.Col.Table) {
			tables = append(tables, c.Col.Table)
		}
		return true
	})
	if len(tables) == 0 {
		x.errorf(p, "no-iteration-table", "the aggregate reads no column, so it has no table to iterate over").Suggestion =
			"aggregate a column, for example sum(t.c), or count rows with count(t.key)"
		return nil
	}
	var cands []*Table
	for _, t := range tables {
		if reachesAll(t, tables) {
			cands = append(cands, t)
		}
	}
	if len(cands) != 1 {
		var names []string
		for _, t := range tables {
			names = append(names, t.Name)
		}
		d := x.errorf(p, "no-iteration-table", "the aggregate reads tables %s, and none of them reaches all the others along links",
			strings.Join(names, ", "))
		d.Suggestion = "declare a link (-> TABLE.KEY) from the fact table to the others, or split the aggregate into two measures"
		return nil
	}
	return cands[0]
}

// rootTable is the table count(*) counts: the model's only table that no
// link points at.
func (r *resolver) rootTable(p grammar.Pos) *Table {
	pointed := map[*Table]bool{}
	for _, t := range r.m.Tables {
		for _, l := range t.Links {
			pointed[l.To] = true
		}
	}
	var roots []string
	var root *Table
	for _, t := range r.m.Tables {
		if !pointed[t] {
			roots = append(roots, t.Name)
			root = t
		}
	}
	if len(roots) != 1 {
		d := r.diags.Errorf(p, "no-iteration-table", "count(*) does not say whose rows it counts: the model has %d tables that no link points at (%s)",
			len(roots), strings.Join(roots, ", "))
		d.Suggestion = "count a table's key instead, for example count(T.KEY)"
		for _, t := range r.m.Tables {
			if !pointed[t] && len(t.Key) > 0 {
				d.Suggestion = fmt.Sprintf("count a table's key instead, for example count(%s)", t.Key[0])
				break
			}
		}
		return nil
	}
	return root
}

// perAgg resolves AGG(MEXPR per cols having COND).
func (x *exprResolver) perAgg(name string, e *grammar.Call) Expr {
	if e.Distinct || e.As != nil || e.From != nil {
		x.errorf(e.Pos, "bad-call", "a per-grain aggregate is written %s(MEASURE per t.c having COND)", name)
		return nil
	}
	p := &PerAgg{Pos: e.Pos, Func: name}
	for _, ref := range e.Per {
		c := x.r.columnRef(ref, nil)
		if c == nil {
			return nil
		}
		p.Per = append(p.Per, c)
	}
	// Inside, each group holds its per columns to one value.
	grouped := maps.Clone(x.grouped)
	if grouped == nil {
		grouped = map[*Column]bool{}
	}
	for _, c := range p.Per {
		grouped[c] = true
	}
	inner := &exprResolver{r: x.r, self: x.self, pinned: x.pinned, grouped: grouped}
	if e.Star {
		if name != "count" {
			x.errorf(e.Pos, "bad-call", "only count takes * per ...")
			return nil
		}
		p.T = TypeInteger
	} else {
		if len(e.Args) != 1 {
			x.errorf(e.Pos, "bad-call", "%s(... per ...) takes one measure expression", name)
			return nil
		}
		if p.X = inner.expr(e.Args[0]); p.X == nil {
			return nil
		}
		switch name {
		case "count":
			p.T = TypeInteger
		case "min", "max", "sum":
			p.T = p.X.Type()
		default:
			p.T = TypeFloat
		}
		if name != "count" && name != "min" && name != "max" && !p.X.Type().Numeric() {
			x.errorf(e.Args[0].Position(), "type", "cannot %s a %s value", aggVerb(name), p.X.Type())
			return nil
		}
		if name == "avg" && isRatio(p.X) {
			x.r.diags.Warnf(e.Pos, "avg-of-ratio", "avg of a ratio weighs every group the same, whatever its size").Suggestion =
				"if a weighted figure is meant, divide two per-grain sums instead"
		}
	}
	if e.Having != nil {
		hx := x.sub(false)
		var per []string
		for _, c := range p.Per {
			per = append(per, c.String())
		}
		hx.havingPer = strings.Join(per, ", ")
		h := hx.expr(e.Having)
		if h == nil {
			return nil
		}
		if !x.wantType(h, TypeBoolean, "having") {
			return nil
		}
		p.Having = h
	}
	return p
}

func isRatio(e Expr) bool {
	switch e := e.(type) {
	case *BinOp:
		return e.Op == "/"
	case *MeasureRef:
		return isRatio(e.Measure.Expr)
	}
	return false
}

func (x *exprResolver) edited(e *grammar.Edited) Expr {
	if x.row {
		x.errorf(e.Pos, "edit-in-row", "cell edits [...] change a measure's cell; they cannot appear inside a row expression")
		return nil
	}
	out := &EditExpr{Pos: e.Pos}
	for _, ed := range e.Edits {
		ce := &CellEdit{Pos: ed.Pos}
		switch ed.Kind {
		case grammar.EditDrop:
			ce.Kind = EditDrop
		case grammar.EditUngroup:
			ce.Kind = EditUngroup
		case grammar.EditTime:
			if !x.timeEdit(ed, ce) {
				return nil
			}
			out.Edits = append(out.Edits, ce)
			continue
		default:
			ce.Kind = EditPin
		}
		if ed.Target != nil {
			if ed.Target.Table == "" {
				if ce.Kind != EditDrop {
					verb := "ungroup"
					if ce.Kind == EditPin {
						verb = "a pin"
					}
					x.errorf(ed.Target.Pos, "bad-edit", "%s takes a column, written table.column, not '%s'", verb, ed.Target.Name)
					return nil
				}
				if ce.Table = x.r.lookupTable(ed.Target.Pos, ed.Target.Name); ce.Table == nil {
					return nil
				}
			} else if ce.Col = x.r.columnRef(ed.Target, nil); ce.Col == nil {
				return nil
			}
		}
		for _, v := range ed.Values {
			lv := x.sub(true).expr(v)
			if lv == nil {
				return nil
			}
			if u, neg := lv.(*UnOp); neg && u.Op == "-" {
				if l, isLit := u.X.(*Lit); isLit && l.T.Numeric() && l.T != TypeNull {
					lv = &Lit{Pos: u.Pos, T: l.T, Text: "-" + l.Text}
				}
			}
			lit, ok := lv.(*Lit)
			if ok && lit.T == TypeNull {
				x.errorf(v.Position(), "bad-edit", "a pin to null matches no row (nothing equals null)").Suggestion =
					fmt.Sprintf("narrow instead: m[drop %s] where %s is null", ce.Col, ce.Col)
				return nil
			}
			if !ok {
				x.errorf(v.Position(), "bad-edit", "a pin takes literal values").Suggestion =
					"write T.C = 'value' or T.C in ('a', 'b')"
				return nil
			}
			if !x.comparable(v.Position(), &ColRef{Col: ce.Col}, lit) {
				return nil
			}
			ce.Values = append(ce.Values, lit)
		}
		out.Edits = append(out.Edits, ce)
	}
	// The edits apply in order, outer lists before inner ones: what holds
	// a semiadditive date to one value is what is left after them all.
	pinned, grouped := map[*Column]bool{}, map[*Column]bool{}
	maps.Copy(pinned, x.pinned)
	maps.Copy(grouped, x.grouped)
	for _, ce := range out.Edits {
		applyEdit(ce, pinned, grouped)
	}
	inner := &exprResolver{r: x.r, self: x.self, pinned: pinned, grouped: grouped}
	pins := x.deadPins(out.Edits, x.outerPins)
	if _, nested := e.X.(*grammar.Edited); nested {
		inner.outerPins = pins
	}
	if out.X = inner.expr(e.X); out.X == nil {
		return nil
	}
	return out
}

// reservedNames are result columns rollwise adds beside the measures.
var reservedNames = map[string]bool{"rolled_up": true, "grouping_id": true, "detail_rank": true}

// measure resolves the measure called name on first use, reporting cycles.
func (r *resolver) measure(name string) *Measure {
	if m := r.m.measures[name]; m != nil && r.state[name] == 2 {
		return m
	}
	md := r.measureDecls[name]
	if md == nil {
		return nil
	}
	if r.state[name] == 1 {
		i := slices.Index(r.stack, name)
		cycle := append(append([]string{}, r.stack[i:]...), name)
		r.diags.Errorf(md.Name.Pos, "cycle", "measure %s depends on itself", name).
			Notes = []string{"the cycle: " + strings.Join(cycle, " -> ")}
		return &Measure{Name: name, Pos: md.Name.Pos}
	}
	if reservedNames[name] {
		r.diags.Errorf(md.Name.Pos, "reserved-name", "%q is the name of a result column rollwise adds; a measure cannot use it", name).
			Suggestion = "rename the measure"
	}
	r.state[name] = 1
	r.stack = append(r.stack, name)
	m := &Measure{Name: name, Pos: md.Name.Pos, Doc: md.Doc}
	r.m.measures[name] = m
	if md.Format != nil {
		f := Format(strings.ToLower(md.Format.Name))
		switch f {
		case FormatPercent, FormatNumber, FormatInteger, FormatCurrency:
			m.Format = f
		default:
			r.diags.Errorf(md.Format.Pos, "bad-format", "unknown format %q", md.Format.Name).Suggestion =
				"write percent, number, integer or currency"
		}
	}
	x := &exprResolver{r: r}
	m.Expr = x.expr(md.Expression())
	if m.Expr != nil {
		m.Type = m.Expr.Type()
		r.checkMeasure(m)
	}
	r.stack = r.stack[:len(r.stack)-1]
	r.state[name] = 2
	r.m.Measures = append(r.m.Measures, m)
	return m
}

// checkMeasure reports a measure without any aggregate and suspicious
// products of sums.
func (r *resolver) checkMeasure(m *Measure) {
	hasAgg := false
	Walk(m.Expr, func(e Expr) bool {
		switch e := e.(type) {
		case *Agg, *PerAgg, *MeasureRef:
			hasAgg = true
		case *BinOp:
			if e.Op == "*" && isSum(e.L) && isSum(e.R) {
				r.diags.Warnf(e.Pos, "product-of-sums", "this multiplies two totals (a sum times a sum), not the rows' products").Suggestion =
					"to multiply row by row, write sum(a * b)"
			}
		}
		return true
	})
	if !hasAgg {
		r.diags.Errorf(m.Pos, "no-aggregate", "measure %s aggregates nothing, so it has no value in a cell", m.Name).Suggestion =
			"use an aggregate such as sum(t.c) or count(distinct t.c)"
	}
}

func isSum(e Expr) bool {
	switch e := e.(type) {
	case *Agg:
		return e.Func == "sum"
	case *MeasureRef:
		return isSum(e.Measure.Expr)
	}
	return false
}

func (r *resolver) view(vd *grammar.ViewDecl) {
	v := &View{Name: vd.Name.Name, Pos: vd.Name.Pos, Totals: TotalsNone}
	if r.viewNames[v.Name] {
		r.diags.Errorf(vd.Name.Pos, "duplicate-view", "view %q is declared twice", v.Name)
		return
	}
	r.viewNames[v.Name] = true
	for _, mn := range vd.Measures {
		m := r.measure(mn.Name)
		if m == nil {
			(&exprResolver{r: r}).unknownMeasure(&grammar.Ref{Pos: mn.Pos, Name: mn.Name})
			continue
		}
		v.Measures = append(v.Measures, m)
	}
	for _, b := range vd.By {
		if c := r.columnRef(b, nil); c != nil {
			v.By = append(v.By, c)
		}
	}
	if vd.Where != nil {
		v.Where = (&exprResolver{r: r, row: true}).expr(vd.Where)
	}
	if vd.HasTotals {
		v.Totals = TotalsRollup
		if vd.TotalsMode != nil {
			mode := TotalsMode(strings.ToLower(vd.TotalsMode.Name))
			switch mode {
			case TotalsGrand, TotalsRollup, TotalsAll:
				v.Totals = mode
			default:
				r.diags.Errorf(vd.TotalsMode.Pos, "bad-totals", "unknown totals mode %q", vd.TotalsMode.Name).Suggestion =
					"write with totals grand, with totals rollup or with totals all"
			}
		}
	}
	r.m.Views = append(r.m.Views, v)
}

// sortedNames returns the keys of a set, sorted.
func sortedNames(set map[string]bool) []string {
	out := make([]string, 0, len(set))
	for k := range set {
		out = append(out, k)
	}
	sort.Strings(out)
	return out
}
