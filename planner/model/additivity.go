package model

import (
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/grammar"
)

// Additivity follows the value (language.md, "Additivity follows the
// value"): the kind of a row expression is carried through derived
// columns and expressions by a small rule set, so that a copy of a price,
// coalesce(price, 0), price * 1 or case when ... then price end is as
// nonadditive as the price itself:
//
//   - a constant (an expression that reads no column) is neutral;
//   - a copy, unary minus, coalesce, nullif, abs, round, least, greatest,
//     cast, case and + or - keep the strongest kind of their values
//     (nonadditive over semiadditive over additive);
//   - a constant factor or divisor keeps the kind;
//   - a rate times a quantity (nonadditive times additive) is additive;
//     a semiadditive(D) value times a nonadditive one stays
//     semiadditive(D); other products keep the strongest kind;
//   - a ratio of two values that read columns is nonadditive.

// valueKind is the additivity of a row value.
type valueKind struct {
	add Additivity
	// date is the date of a semiadditive value.
	date *Column
	// constant says the value reads no column.
	constant bool
	// from is the declared column the kind comes from, or nil for a kind
	// a rule made (a ratio).
	from *Column
}

var additive = valueKind{add: Additive}

// strength orders the kinds: the stronger wins where values combine.
func (k valueKind) strength() int {
	switch k.add {
	case NonAdditive:
		return 2
	case SemiAdditive:
		return 1
	}
	return 0
}

// join is the kind of a value that may be either a or b.
func join(a, b valueKind) valueKind {
	switch {
	case a.constant:
		return b
	case b.constant:
		return a
	case b.strength() > a.strength():
		return b
	}
	return a
}

// rowKind is the additivity of row expression e.
func rowKind(e Expr) valueKind { return rowKinds{}.of(e) }

// rowKinds remembers the kind of each derived column met, so that a chain
// of derived columns that read the one before twice is walked once per
// column, not once per path (c2 = c1 + c1, c3 = c2 + c2, ...).
type rowKinds map[*Column]valueKind

func (m rowKinds) of(e Expr) valueKind {
	switch e := e.(type) {
	case nil, *Lit:
		return valueKind{constant: true}
	case *ColRef:
		if e.Col.Derived != nil && e.Col.Additivity == Additive {
			// A derived column declared so keeps its declaration.
			k, ok := m[e.Col]
			if !ok {
				k = m.of(e.Col.Derived)
				m[e.Col] = k
			}
			return k
		}
		return valueKind{add: e.Col.Additivity, date: e.Col.SemiDate, from: e.Col}
	case *UnOp:
		if e.Op == "-" {
			return m.of(e.X)
		}
	case *BinOp:
		l, r := m.of(e.L), m.of(e.R)
		switch e.Op {
		case "+", "-":
			return join(l, r)
		case "*":
			return product(l, r)
		case "/":
			if r.constant {
				return l
			}
			return valueKind{add: NonAdditive}
		}
	case *Func:
		args := e.Args
		switch e.Name {
		case "nullif", "round", "cast", "abs":
			args = args[:min(1, len(args))]
		case "coalesce", "least", "greatest":
		default:
			return additive
		}
		k := valueKind{constant: true}
		for _, a := range args {
			k = join(k, m.of(a))
		}
		return k
	case *CaseExpr:
		k := m.of(e.Else)
		for _, w := range e.Whens {
			k = join(k, m.of(w.Then))
		}
		return k
	}
	return additive
}

// product is the kind of l * r.
func product(l, r valueKind) valueKind {
	switch {
	case l.constant:
		return r
	case r.constant:
		return l
	case l.add == NonAdditive && r.add == Additive, l.add == Additive && r.add == NonAdditive:
		return additive // a rate times a quantity
	case l.add == SemiAdditive && r.add != SemiAdditive:
		return l
	case r.add == SemiAdditive && l.add != SemiAdditive:
		return r
	}
	return join(l, r)
}

// checkAdditive applies the additivity rules to sum(arg): a nonadditive
// value is never summed; a semiadditive(D) one only where the final cell
// holds D to one value (a pin, or a per-grain group over D, that no inner
// edit removed).
func (x *exprResolver) checkAdditive(e *grammar.Call, arg Expr) {
	k := rowKind(arg)
	what := Text(arg)
	c, bare := arg.(*ColRef)
	switch k.add {
	case NonAdditive:
		var d *grammar.Diagnostic
		switch {
		case bare && c.Col.Stored():
			d = x.errorf(e.Pos, "nonadditive-sum", "sum of %s, which is declared nonadditive: adding it across rows gives a meaningless number", c.Col)
		case k.from != nil:
			d = x.errorf(e.Pos, "nonadditive-sum", "sum of %s, whose value follows %s, which is declared nonadditive: adding it across rows gives a meaningless number", what, k.from)
			d.Notes = []string{"a copy, coalesce, case or a constant factor keeps a column's kind; a rate times a quantity (price * qty) is additive"}
		default:
			d = x.errorf(e.Pos, "nonadditive-sum", "sum of %s, a ratio of columns row by row, which is nonadditive: adding ratios across rows gives a meaningless number", what)
		}
		src := what
		if k.from != nil {
			src = k.from.String()
		}
		d.Suggestion = fmt.Sprintf("write avg(%s), a weighted ratio such as sum(%s * t.qty) / sum(t.qty), or a per-grain measure such as avg(m per t.c)",
			src, src)
	case SemiAdditive:
		if k.date != nil && !x.pinned[k.date] && !x.grouped[k.date] {
			d := x.errorf(e.Pos, "semiadditive-sum", "sum of %s, which is semiadditive: it adds up across everything but %s", what, k.date)
			if !bare {
				d.Notes = []string{fmt.Sprintf("its value follows %s, declared semiadditive(%s)", k.from, k.date)}
			}
			d.Suggestion = fmt.Sprintf("pin the date to one value, for example sum(%s)[%s = date '2026-01-31']", what, k.date)
		}
	}
}

// applyEdit updates the columns an edit list leaves held to one value:
// pinned (by a pin to one value, or to the latest or earliest) and
// grouped (by a per-grain group). An
// edit removes what mentions its column before it constrains it.
func applyEdit(ce *CellEdit, pinned, grouped map[*Column]bool) {
	forget := func(m map[*Column]bool) {
		for c := range m {
			if ce.Kind == EditDrop && ce.Col == nil && (ce.Table == nil || c.Table == ce.Table) {
				delete(m, c)
			}
		}
		if ce.Col != nil {
			delete(m, ce.Col)
		}
	}
	switch ce.Kind {
	case EditPin, EditLatest, EditEarliest:
		forget(pinned)
		forget(grouped)
		if len(ce.Values) == 1 || ce.Kind != EditPin {
			pinned[ce.Col] = true
		}
	case EditDrop:
		forget(pinned)
		forget(grouped)
	case EditUngroup:
		if ce.Col == nil {
			clear(grouped)
		}
		delete(grouped, ce.Col)
	default:
		// a window over D (back, to date, running, last) holds it to
		// one value no longer
		delete(pinned, ce.Col)
	}
}

// deadPins warns about a pin that a later pin on the same column makes
// dead: in one edit list, or in an edit list directly inside another
// (outer holds the pins in force around it, by column). It returns the
// pins in force after the list.
func (x *exprResolver) deadPins(edits []*CellEdit, outer map[*Column]grammar.Pos) map[*Column]grammar.Pos {
	pins := map[*Column]grammar.Pos{}
	for c, p := range outer {
		pins[c] = p
	}
	for _, ce := range edits {
		switch {
		case ce.Kind == EditPin || ce.Kind == EditLatest || ce.Kind == EditEarliest:
			// = latest (earliest) finds E among the rows the earlier pin
			// keeps: that pin is not dead (the reference evaluator).
			if p, ok := pins[ce.Col]; ok && ce.Kind == EditPin {
				x.r.diags.Warnf(p, "dead-pin", "this pin of %s has no effect: the pin at %d:%d replaces it", ce.Col, ce.Pos.Line, ce.Pos.Col).Suggestion =
					"remove one of the two pins"
			}
			pins[ce.Col] = ce.Pos
		case ce.Kind == EditDrop:
			for c := range pins {
				if ce.Col == c || ce.Col == nil && (ce.Table == nil || ce.Table == c.Table) {
					delete(pins, c)
				}
			}
		}
	}
	return pins
}

// checkSameRelation warns where two tables read the same relation and
// one declares a column's additivity that the other leaves out: the
// measures over the second would add up what the first refuses to.
func (r *resolver) checkSameRelation() {
	first := map[string]*Table{}
	for _, t := range r.m.Tables {
		rel := strings.Join(t.Relation, ".")
		f, seen := first[rel]
		if !seen {
			first[rel] = t
			continue
		}
		for _, c := range t.Columns {
			o := f.Column(c.Name)
			if o == nil || !c.Stored() || !o.Stored() || o.Additivity == c.Additivity {
				continue
			}
			declared, plain := o, c
			if c.Additivity != Additive {
				declared, plain = c, o
			}
			r.diags.Warnf(plain.Pos, "additivity-differs", "%s and %s read the same relation %s, but only %s is declared %s",
				plain, declared, rel, declared, kindWord(declared)).Suggestion =
				fmt.Sprintf("declare %s %s too, or the measures over %s add up what %s refuses to", plain, kindWord(declared), plain.Table.Name, declared.Table.Name)
		}
	}
}

func kindWord(c *Column) string {
	switch c.Additivity {
	case NonAdditive:
		return "nonadditive"
	case SemiAdditive:
		return fmt.Sprintf("semiadditive(%s)", c.SemiDate)
	}
	return "additive"
}
