package model

import (
	"strings"

	"github.com/rollwise/rollwise/grammar"
)

// Query asks for measures, grouped by columns, under filters.
type Query struct {
	Measures []*Measure
	// Groups are the group columns; GroupNames the references as written.
	Groups     []*Column
	GroupNames []string
	GroupPos   []grammar.Pos
	// Filters are the conjuncts of the request's filter (row predicates).
	Filters []Expr
	Totals  TotalsMode
	// Order is the keys of the request's order; empty for the default
	// order (by the group values).
	Order []OrderKey
	// Limit cuts the detail rows; 0 means no limit.
	Limit int

	model *Model
}

// nameClashes refuses a measure named like a group column of the query
// (a measure `stores.region` beside the group stores.region): both would be
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
