package model

import (
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/grammar"
)

// Query asks for measures, grouped by columns, under filters.
type Query struct {
	Measures []*Measure
	// Groups are the --by columns; GroupNames the references as written.
	Groups     []*Column
	GroupNames []string
	GroupPos   []grammar.Pos
	// Filters are the --where conjuncts (row predicates).
	Filters []Expr
	Totals  TotalsMode
	// Order is the --order keys; empty for the default order (by the
	// group values).
	Order []OrderKey
	// Limit cuts the detail rows; 0 means no limit.
	Limit int

	model *Model
}

// Override applies the totals mode, order and limit of spec where they are
// given (a view's own query, changed on the command line).
func (q *Query) Override(spec QuerySpec) grammar.Diagnostics {
	var diags grammar.Diagnostics
	switch mode := TotalsMode(strings.ToLower(strings.TrimSpace(spec.Totals))); mode {
	case "":
	case TotalsNone, TotalsGrand, TotalsRollup, TotalsAll:
		q.Totals = mode
	default:
		diags.Errorf(grammar.Pos{File: "--totals"}, "usage", "unknown totals mode %q", spec.Totals).Suggestion =
			"write none, grand, rollup or all"
	}
	if strings.TrimSpace(spec.Order) != "" {
		keys, d := q.parseOrder(spec.Order)
		diags.Append(d)
		q.Order = keys
	}
	if spec.Limit < 0 {
		diags.Errorf(grammar.Pos{File: "--limit"}, "usage", "--limit must be a positive number, not %d", spec.Limit)
	}
	if spec.Limit > 0 {
		q.Limit = spec.Limit
	}
	return diags
}

// QuerySpec is a query as the command line gives it.
type QuerySpec struct {
	Measures []string
	By       []string
	Where    string
	Totals   string
	Order    string
	Limit    int
}

// NewQuery resolves a query against the model. Positions in diagnostics
// name the option they come from ("--by:1:9").
func (m *Model) NewQuery(spec QuerySpec) (*Query, grammar.Diagnostics) {
	var diags grammar.Diagnostics
	q := &Query{Totals: TotalsNone}
	r := &resolver{m: m, state: map[string]int{}}
	for _, name := range m.Measures {
		r.state[name.Name] = 2
	}
	if len(spec.Measures) == 0 {
		diags.Errorf(grammar.Pos{File: "--measures"}, "usage", "no measures asked for").Suggestion =
			"name one or more measures: -m revenue,margin_rate"
	}
	col := 1
	for _, name := range spec.Measures {
		p := grammar.Pos{File: "--measures", Line: 1, Col: col}
		col += len(name) + 1
		name = unbackquote(strings.TrimSpace(name))
		mm := m.Measure(name)
		if mm == nil {
			var names []string
			for _, x := range m.Measures {
				names = append(names, x.Name)
			}
			d := diags.Errorf(p, "unknown-measure", "unknown measure '%s'", name)
			if near := grammar.Closest(name, names); near != "" {
				d.Message += fmt.Sprintf("; did you mean '%s'?", near)
			}
			continue
		}
		q.Measures = append(q.Measures, mm)
	}
	col = 1
	for _, ref := range spec.By {
		p := grammar.Pos{File: "--by", Line: 1, Col: col}
		col += len(ref) + 1
		ref = strings.TrimSpace(ref)
		c := r.byColumn(ref, p)
		if c == nil {
			continue
		}
		for i, prev := range q.Groups {
			if prev == c {
				diags.Errorf(p, "duplicate-group", "%s is already grouped by (as %s)", c, q.GroupNames[i])
			}
		}
		q.Groups = append(q.Groups, c)
		q.GroupNames = append(q.GroupNames, ref)
		q.GroupPos = append(q.GroupPos, p)
	}
	diags.Append(r.diags)
	r.diags = nil
	diags.Append(nameClashes(q))
	if strings.TrimSpace(spec.Where) != "" {
		e, d := grammar.ParseExpr("--where", spec.Where)
		diags.Append(d)
		if e != nil {
			pred := (&exprResolver{r: r, row: true}).expr(e)
			if pred != nil && (&exprResolver{r: r}).wantType(pred, TypeBoolean, "--where") {
				q.Filters = Conjuncts(pred)
			}
		}
	}
	q.model = m
	diags.Append(q.Override(QuerySpec{Totals: spec.Totals, Order: spec.Order, Limit: spec.Limit}))
	diags.Append(r.diags)
	return q, diags
}

// nameClashes refuses a measure named like a group column of the query
// (a measure `stores.region` beside -b stores.region): both would be
// output columns of one name, and the SQL ambiguous. Engines compare
// quoted names without regard to case (DuckDB) or with it, so the test
// ignores case.
func nameClashes(q *Query) grammar.Diagnostics {
	var diags grammar.Diagnostics
	for _, m := range q.Measures {
		for i, c := range q.Groups {
			if strings.EqualFold(m.Name, c.String()) || strings.EqualFold(m.Name, q.GroupNames[i]) {
				diags.Errorf(q.GroupPos[i], "name-clash", "measure %q and group column %s would both be output columns named %q", m.Name, c, m.Name).Suggestion =
					"rename the measure (measure names need no dot), or leave one of them out of the query"
			}
		}
	}
	return diags
}

func (r *resolver) byColumn(ref string, p grammar.Pos) *Column {
	e, d := grammar.ParseExpr(p.File, ref)
	for _, x := range d {
		x.Pos.Col += p.Col - 1
	}
	r.diags.Append(d)
	if e == nil {
		return nil
	}
	gr, ok := e.(*grammar.Ref)
	if !ok || gr.Table == "" {
		r.diags.Errorf(p, "usage", "%q is not a column reference", ref).Suggestion = "group by columns written table.column"
		return nil
	}
	gr.Pos.Col += p.Col - 1
	gr.NamePos.Col += p.Col - 1
	return r.columnRef(gr, nil)
}

// Conjuncts splits a predicate at its top-level `and`s.
//
// Negations are pushed inward first (negationsInward), so that two
// equivalent filters split alike: not (a or b) gives the two conjuncts
// not a and not b, and an edit that drops a's column keeps not b.
func Conjuncts(e Expr) []Expr {
	return splitAnd(negationsInward(e))
}

func splitAnd(e Expr) []Expr {
	if b, ok := e.(*BinOp); ok && b.Op == "and" {
		return append(splitAnd(b.L), splitAnd(b.R)...)
	}
	return []Expr{e}
}

// negationsInward rewrites a predicate so that not applies only to
// predicates that are neither and, or, not, in nor is null: De Morgan's
// laws, which hold in SQL's three-valued logic, and not (x in L) = x not
// in L, not (x is null) = x is not null.
func negationsInward(e Expr) Expr {
	switch x := e.(type) {
	case *UnOp:
		if x.Op == "not" {
			return negated(x.X, x.Pos)
		}
	case *BinOp:
		if x.Op == "and" || x.Op == "or" {
			return &BinOp{Pos: x.Pos, Op: x.Op, L: negationsInward(x.L), R: negationsInward(x.R), T: x.T}
		}
	}
	return e
}

// negated is not e with the negation pushed inward; pos is the not's.
func negated(e Expr, pos grammar.Pos) Expr {
	switch x := e.(type) {
	case *UnOp:
		if x.Op == "not" {
			return negationsInward(x.X)
		}
	case *BinOp:
		if x.Op == "and" || x.Op == "or" {
			op := map[string]string{"and": "or", "or": "and"}[x.Op]
			return &BinOp{Pos: x.Pos, Op: op, L: negated(x.L, pos), R: negated(x.R, pos), T: x.T}
		}
	case *InExpr:
		return &InExpr{Pos: x.Pos, X: x.X, List: x.List, Not: !x.Not}
	case *IsNullExpr:
		return &IsNullExpr{Pos: x.Pos, X: x.X, Not: !x.Not}
	}
	return &UnOp{Pos: pos, Op: "not", X: e}
}

// RolledUp names the groups a grouping mask rolls up.
func (q *Query) RolledUp(mask uint64) []string {
	out := []string{}
	n := len(q.Groups)
	for i := range q.Groups {
		if mask&(1<<(n-1-i)) != 0 {
			out = append(out, q.GroupNames[i])
		}
	}
	return out
}

// ViewQuery is the query a view block declares.
func (m *Model) ViewQuery(v *View) *Query {
	q := &Query{Measures: v.Measures, Totals: v.Totals, model: m}
	for _, c := range v.By {
		q.Groups = append(q.Groups, c)
		q.GroupNames = append(q.GroupNames, c.String())
		q.GroupPos = append(q.GroupPos, v.Pos)
	}
	if v.Where != nil {
		q.Filters = Conjuncts(v.Where)
	}
	return q
}
