package plan

import (
	"github.com/rollwise/rollwise/planner/model"
	"slices"
)

// Inner joins. A scan joins the tables it reads along links with LEFT
// JOIN, so that a row whose link finds no match is kept and reads NULL
// beyond the link. Where a row filter of the scan (a conjunct of
// Scan.Where) can never hold on such a row, the LEFT JOIN may as well be
// an inner join: the rows it would drop are the rows the WHERE drops. An
// inner join lets the engine reorder the joins and start from the most
// selective table, which a chain of LEFT JOINs forbids.
//
// Only row filters count: the FILTER predicate of a leaf (a narrowing, a
// pin) removes rows from that one aggregate, not from the scan's other
// leaves or from the rows that make the scan's cells.
//
// A link declared required promises that every row finds its row: it is
// an inner join wherever the table it leaves is always there, and a table
// read only to go further along a required composite link can be left
// out (shortcut). Both are exact only under the promise; the reference
// evaluator ignores it.

// innerJoins marks the joins of s that may be inner joins: every join on
// the path to a table T for which a row filter of s rejects the rows
// where T is missing, and every required link whose own table is always
// there (the iteration table, or a table joined by an inner join).
// s.Joins lists parents before children.
func innerJoins(s *Scan) map[*model.Link]bool {
	into := map[*model.Table]*model.Link{}
	for _, l := range s.Joins {
		into[l.To] = l
	}
	// path lists the joins from the iteration table to t.
	path := func(t *model.Table) []*model.Link {
		var out []*model.Link
		for l := into[t]; l != nil; l = into[l.From] {
			out = append(out, l)
		}
		return out
	}
	inner := map[*model.Link]bool{}
	for _, l := range s.Joins {
		// gone: the tables that read NULL when l finds no match, l's
		// target and everything joined through it.
		gone := func(t *model.Table) bool {
			return slices.Contains(path(t), l)
		}
		for _, w := range s.Where {
			if rejects(w, gone) {
				for _, p := range path(l.To) {
					inner[p] = true
				}
				break
			}
		}
	}
	for _, l := range s.Joins {
		if l.Required && (l.From == s.Table || inner[into[l.From]]) {
			inner[l] = true
		}
	}
	return inner
}

// shortcut leaves out of a scan's joins a table B that the scan reads
// nothing of, when B is joined by a required link L1 from A and every
// link from B onwards, B -(b...)-> C, uses only columns that L1 matches:
// C is joined on A's columns directly (A.a = C.key instead of A.a = B.b
// and B.b = C.key). Exact because L1 is required: every row of A finds
// its row of B, whose columns b equal A's columns a. (Without the
// promise, a row of A with no row of B would read NULL for C too.)
// TPC-H: lineitem -(l_partkey, l_suppkey)-> partsupp -(ps_partkey)-> part
// becomes lineitem.l_partkey = part.p_partkey.
func shortcut(links []*model.Link, read map[*model.Table]bool) []*model.Link {
	for {
		changed := false
		for _, l1 := range links {
			if !l1.Required || read[l1.To] {
				continue
			}
			var next []*model.Link
			ok := true
			for _, l2 := range links {
				if l2.From != l1.To {
					next = append(next, l2)
					continue
				}
				via := &model.Link{From: l1.From, To: l2.To, ToCols: l2.ToCols, Pos: l2.Pos, Required: l2.Required}
				for _, b := range l2.FromCols {
					i := slices.Index(l1.ToCols, b)
					if i < 0 {
						ok = false
						break
					}
					via.FromCols = append(via.FromCols, l1.FromCols[i])
				}
				next = append(next, via)
			}
			if ok {
				links = slices.DeleteFunc(next, func(l *model.Link) bool { return l == l1 })
				changed = true
				break
			}
		}
		if !changed {
			return links
		}
	}
}

// rejects reports whether predicate p is false or NULL on every row where
// the tables for which gone holds read NULL (their link found no match).
func rejects(p model.Expr, gone func(*model.Table) bool) bool {
	return (&nulls{gone: gone, derived: map[*model.Column]bool{}}).rejects(p)
}

// nulls answers rejects and nullOn for one gone, each derived column
// once: a column that reads another twice (c2 = c1 + c1) would otherwise
// be visited once per path, 2^n times for a chain of n.
type nulls struct {
	gone    func(*model.Table) bool
	derived map[*model.Column]bool
}

func (n *nulls) rejects(p model.Expr) bool {
	switch p := p.(type) {
	case *model.BinOp:
		switch p.Op {
		case "and":
			return n.rejects(p.L) || n.rejects(p.R)
		case "or":
			return n.rejects(p.L) && n.rejects(p.R)
		}
	case *model.UnOp:
		if p.Op == "not" {
			return n.nullOn(p.X)
		}
	case *model.IsNullExpr:
		return p.Not && n.nullOn(p.X)
	}
	return n.nullOn(p)
}

// nullOn reports whether e is NULL on every row where the tables for
// which gone holds read NULL. It answers false when unsure.
func (n *nulls) nullOn(e model.Expr) bool {
	gone := n.gone
	switch e := e.(type) {
	case *model.ColRef:
		if gone(e.Col.Table) {
			// Stored columns are NULL; so are derived ones, which the
			// SQL computes only where the row's link found a match.
			return true
		}
		if e.Col.Derived == nil {
			return false
		}
		v, ok := n.derived[e.Col]
		if !ok {
			v = n.nullOn(e.Col.Derived)
			n.derived[e.Col] = v
		}
		return v
	case *model.Lit:
		return e.T == model.TypeNull
	case *model.BinOp:
		if e.Op == "and" || e.Op == "or" {
			// NULL and false is false; NULL or true is true.
			return n.nullOn(e.L) && n.nullOn(e.R)
		}
		// Arithmetic, comparisons and || are NULL when a side is.
		return n.nullOn(e.L) || n.nullOn(e.R)
	case *model.UnOp:
		return n.nullOn(e.X)
	case *model.InExpr:
		return n.nullOn(e.X)
	case *model.Func:
		switch e.Name {
		case "coalesce", "least", "greatest":
			// NULL only when every argument is (least and greatest skip
			// NULL arguments).
			for _, a := range e.Args {
				if !n.nullOn(a) {
					return false
				}
			}
			return true
		case "nullif", "abs", "round", "lower", "upper", "cast", "extract", "date_trunc":
			return n.nullOn(e.Args[0])
		}
	}
	// is [not] null, case, and anything else: unsure.
	return false
}
