package verify

import (
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// This file holds the wrong formulas that rewrite a measure's expression:
// the wrong measure is then planned and rendered like any other, so that
// its value is computed on the data by the same SQL path as the right one.

// formula is a wrong version of a measure's expression.
type formula struct {
	name   string
	detail string
	expr   model.Expr
}

// rewrite copies e bottom-up; fn may replace a node (after its children
// were rewritten) by returning a different expression. Measure references
// are inlined, so that the copy never shares a node with the model.
func rewrite(e model.Expr, fn func(model.Expr) model.Expr) model.Expr {
	if e == nil {
		return nil
	}
	var out model.Expr
	switch x := e.(type) {
	case *model.MeasureRef:
		return rewrite(x.Measure.Expr, fn)
	case *model.BinOp:
		c := *x
		c.L, c.R = rewrite(x.L, fn), rewrite(x.R, fn)
		out = &c
	case *model.UnOp:
		c := *x
		c.X = rewrite(x.X, fn)
		out = &c
	case *model.Func:
		c := *x
		c.Args = rewriteList(x.Args, fn)
		out = &c
	case *model.CaseExpr:
		c := *x
		c.Whens = nil
		for _, w := range x.Whens {
			c.Whens = append(c.Whens, model.WhenArm{Cond: rewrite(w.Cond, fn), Then: rewrite(w.Then, fn)})
		}
		c.Else = rewrite(x.Else, fn)
		out = &c
	case *model.InExpr:
		c := *x
		c.X = rewrite(x.X, fn)
		c.List = rewriteList(x.List, fn)
		out = &c
	case *model.IsNullExpr:
		c := *x
		c.X = rewrite(x.X, fn)
		out = &c
	case *model.Agg:
		c := *x
		c.Arg = rewrite(x.Arg, fn)
		out = &c
	case *model.NarrowExpr:
		c := *x
		c.X, c.Pred = rewrite(x.X, fn), rewrite(x.Pred, fn)
		out = &c
	case *model.EditExpr:
		c := *x
		c.X = rewrite(x.X, fn)
		c.Edits = append([]*model.CellEdit(nil), x.Edits...)
		out = &c
	case *model.PerAgg:
		c := *x
		c.X, c.Having = rewrite(x.X, fn), rewrite(x.Having, fn)
		out = &c
	default:
		// Column references and literals have no children.
		out = e
	}
	return fn(out)
}

func rewriteList(es []model.Expr, fn func(model.Expr) model.Expr) []model.Expr {
	var out []model.Expr
	for _, a := range es {
		out = append(out, rewrite(a, fn))
	}
	return out
}

func keep(e model.Expr) model.Expr { return e }

// inline is the measure's expression with every measure reference
// replaced by the measure's own expression.
func inline(m *model.Measure) model.Expr { return rewrite(m.Expr, keep) }

// changer rewrites one node and says, in words, what it changed.
type changer func(model.Expr) (model.Expr, string)

// rewriteWhere rewrites the nodes for which pick holds, and returns the
// copy and what was changed (each change said once).
func rewriteWhere(e model.Expr, pick func(model.Expr) bool, change changer) (model.Expr, []string) {
	var notes []string
	out := rewrite(e, func(x model.Expr) model.Expr {
		if !pick(x) {
			return x
		}
		y, note := change(x)
		notes = appendOnce(notes, note)
		return y
	})
	return out, notes
}

// variants applies change to the matching nodes: to each distinct one
// (every copy of the same aggregate at once, as a handwritten query
// repeats the same mistake) and, when there are several, to all of them:
// one formula each.
func variants(name string, e model.Expr, match func(model.Expr) bool, change changer) []formula {
	var keys []string
	model.Walk(e, func(x model.Expr) bool {
		if match(x) {
			keys = appendOnce(keys, model.Text(x))
		}
		return true
	})
	var out []formula
	add := func(pick func(model.Expr) bool) {
		x, notes := rewriteWhere(e, pick, change)
		out = append(out, formula{name: name, detail: strings.Join(notes, "; "), expr: x})
	}
	for _, k := range keys {
		add(func(x model.Expr) bool { return match(x) && model.Text(x) == k })
	}
	if len(keys) > 1 {
		add(match)
	}
	return out
}

// productOfSums: sum(a * b) written as sum(a) * sum(b). A derived column
// that is a product (line = price * qty) counts as one.
func productOfSums(m *model.Measure) []formula {
	match := func(x model.Expr) bool { _, _, ok := product(x); return ok }
	change := func(x model.Expr) (model.Expr, string) {
		a := x.(*model.Agg)
		l, r, _ := product(x)
		note := fmt.Sprintf("sum(%s) * sum(%s) in place of sum(%s * %s)", bare(l), bare(r), bare(l), bare(r))
		la, ra := *a, *a
		la.Arg, la.T = l, l.Type()
		ra.Arg, ra.T = r, r.Type()
		return &model.BinOp{Pos: a.Pos, Op: "*", L: &la, R: &ra, T: a.T}, note
	}
	return variants(ProductOfSums, inline(m), match, change)
}

// product splits the argument of sum(a * b).
func product(x model.Expr) (l, r model.Expr, ok bool) {
	a, isAgg := x.(*model.Agg)
	if !isAgg || a.Func != "sum" || a.Distinct || a.Arg == nil {
		return nil, nil, false
	}
	arg := a.Arg
	if c, isCol := arg.(*model.ColRef); isCol && c.Col.Derived != nil {
		arg = c.Col.Derived
	}
	b, isBin := arg.(*model.BinOp)
	if !isBin || b.Op != "*" {
		return nil, nil, false
	}
	return b.L, b.R, true
}

// bare is an expression's text without its outer parentheses.
func bare(e model.Expr) string {
	s := model.Text(e)
	if strings.HasPrefix(s, "(") && strings.HasSuffix(s, ")") && balanced(s[1:len(s)-1]) {
		return s[1 : len(s)-1]
	}
	return s
}

func balanced(s string) bool {
	depth := 0
	for _, c := range s {
		switch c {
		case '(':
			depth++
		case ')':
			depth--
			if depth < 0 {
				return false
			}
		}
	}
	return depth == 0
}

// narrowingIgnored: a narrowing (`M where PRED`) or a pin
// (`M[T.C = v]`) left out.
func narrowingIgnored(m *model.Measure) []formula {
	e := inline(m)
	isNarrow := func(x model.Expr) bool { _, ok := x.(*model.NarrowExpr); return ok }
	drop := func(x model.Expr) (model.Expr, string) {
		n := x.(*model.NarrowExpr)
		return n.X, fmt.Sprintf("the narrowing `where %s` is not applied", bare(n.Pred))
	}
	out := variants(FilterIgnored, e, isNarrow, drop)
	hasPin := func(x model.Expr) bool { return editsOf(x, model.EditPin) > 0 }
	unpin := func(x model.Expr) (model.Expr, string) {
		ed := x.(*model.EditExpr)
		var kept []*model.CellEdit
		var notes []string
		for _, c := range ed.Edits {
			if c.Kind == model.EditPin {
				notes = append(notes, fmt.Sprintf("the pin [%s] is not applied", editText(c)))
				continue
			}
			kept = append(kept, c)
		}
		if len(kept) == 0 {
			return ed.X, strings.Join(notes, "; ")
		}
		c := *ed
		c.Edits = kept
		return &c, strings.Join(notes, "; ")
	}
	return append(out, variants(FilterIgnored, e, hasPin, unpin)...)
}

// filterLeaked: a `drop` edit that lets the query's filters through, as a
// handwritten subquery for "all families" that keeps the report's WHERE
// does. The wrong cell is the `ungroup` of the same target, planned and
// run like any edit (testdata/verify/filter_leaked.sql is diagnosed so).
func filterLeaked(m *model.Measure) []formula {
	hasDrop := func(x model.Expr) bool { return editsOf(x, model.EditDrop) > 0 }
	leak := func(x model.Expr) (model.Expr, string) {
		ed := x.(*model.EditExpr)
		c := *ed
		c.Edits = nil
		var notes []string
		for _, d := range ed.Edits {
			if d.Kind == model.EditDrop {
				u := *d
				u.Kind = model.EditUngroup
				notes = append(notes, fmt.Sprintf("[%s] keeps the query's filters, as [%s] does", editText(d), editText(&u)))
				d = &u
			}
			c.Edits = append(c.Edits, d)
		}
		return &c, strings.Join(notes, "; ")
	}
	return variants(FilterLeaked, inline(m), hasDrop, leak)
}

func editsOf(x model.Expr, kind model.EditKind) int {
	ed, ok := x.(*model.EditExpr)
	if !ok {
		return 0
	}
	n := 0
	for _, c := range ed.Edits {
		if c.Kind == kind {
			n++
		}
	}
	return n
}

// editText is one edit as written in a measure.
func editText(c *model.CellEdit) string {
	s := model.Text(&model.EditExpr{X: &model.Lit{T: model.TypeNull}, Edits: []*model.CellEdit{c}})
	// "(null)[EDIT]"
	if i := strings.Index(s, "["); i >= 0 && strings.HasSuffix(s, "]") {
		return s[i+1 : len(s)-1]
	}
	return s
}

// nullAsZero: every aggregate reads coalesce(x, 0) in place of x, so that
// NULLs count as zeros (in an average, a count, a minimum, and a sum over
// only NULLs).
func nullAsZero(m *model.Measure) []formula {
	match := func(x model.Expr) bool {
		a, ok := x.(*model.Agg)
		return ok && a.Arg != nil && a.Arg.Type().Numeric() && a.Arg.Type() != model.TypeNull
	}
	change := func(x model.Expr) (model.Expr, string) {
		a := *x.(*model.Agg)
		note := model.Text(x)
		zero := &model.Lit{Pos: a.Pos, T: model.TypeInteger, Text: "0"}
		a.Arg = &model.Func{Pos: a.Pos, Name: "coalesce", Args: []model.Expr{a.Arg, zero}, T: a.Arg.Type()}
		return &a, note
	}
	if len(variants(NullAsZero, inline(m), match, change)) == 0 {
		return nil
	}
	v, notes := rewriteWhere(inline(m), match, change)
	return []formula{{name: NullAsZero, expr: v, detail: "NULL values counted as 0 in " + strings.Join(notes, ", ")}}
}

// ratioKind says which wrong totals suit a measure: "ratio" for a ratio
// or an average (sum-of-ratios, average-of-ratios), "distinct" for a
// distinct count (sum-of-distinct-counts), "" otherwise.
func ratioKind(m *model.Measure) string {
	switch e := inline(m).(type) {
	case *model.BinOp:
		if e.Op == "/" {
			return "ratio"
		}
	case *model.PerAgg:
		if e.Func == "avg" {
			return "ratio"
		}
	case *model.Agg:
		switch {
		case e.Func == "avg":
			return "ratio"
		case e.Func == "count" && e.Distinct:
			return "distinct"
		}
	}
	return ""
}

// iterationTables lists the tables a measure's aggregates iterate over,
// in first-use order.
func iterationTables(m *model.Measure) []*model.Table {
	var out []*model.Table
	model.Walk(inline(m), func(x model.Expr) bool {
		if a, ok := x.(*model.Agg); ok && a.Table != nil {
			for _, t := range out {
				if t == a.Table {
					return true
				}
			}
			out = append(out, a.Table)
		}
		return true
	})
	return out
}
