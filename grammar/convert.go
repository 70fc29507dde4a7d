package grammar

import (
	"strings"

	"github.com/alecthomas/participle/v2/lexer"
)

// convert turns the concrete grammar (syntax.go) into the syntax tree
// (ast.go).

func pos(p lexer.Position) Pos {
	return Pos{File: p.Filename, Offset: p.Offset, Line: p.Line, Col: p.Column}
}

func unquoteName(s string) string {
	if len(s) >= 2 && s[0] == '`' {
		return s[1 : len(s)-1]
	}
	return s
}

func unquote(s string, q byte) string {
	if len(s) < 2 {
		return s
	}
	d := string([]byte{q, q})
	return strings.ReplaceAll(s[1:len(s)-1], d, string(q))
}

func (n *syntaxName) ident() Ident {
	return Ident{Pos: pos(n.Pos), Name: unquoteName(n.Text)}
}

func (n *syntaxMember) ident() Ident {
	return Ident{Pos: pos(n.Pos), Name: unquoteName(n.Text)}
}

func names(ns []*syntaxName) []Ident {
	out := make([]Ident, len(ns))
	for i, n := range ns {
		out[i] = n.ident()
	}
	return out
}

func (s *syntaxString) lit() *StringLit {
	if s == nil {
		return nil
	}
	return &StringLit{Pos: pos(s.Pos), Value: unquote(s.Text, '"')}
}

func (r *syntaxRef) ref() *Ref {
	if r == nil {
		return nil
	}
	first := r.First.ident()
	if r.Second == nil {
		return &Ref{Pos: pos(r.Pos), Name: first.Name, NamePos: first.Pos}
	}
	second := r.Second.ident()
	return &Ref{Pos: pos(r.Pos), Table: first.Name, Name: second.Name, NamePos: second.Pos}
}

// addTo adds the declaration to f; a measure's expression is left to be
// parsed again from lazy when lazy is set (ParseLazy).
func (d *syntaxDecl) addTo(f *File, lazy *lazySource) {
	switch {
	case d.Table != nil:
		f.Tables = append(f.Tables, d.Table.decl())
	case d.Measure != nil:
		m := d.Measure
		md := &MeasureDecl{Pos: pos(m.Pos), Name: m.Name.ident(), lazy: lazy}
		if lazy == nil {
			md.Expr = m.Expr.expr()
		}
		if m.Format != nil {
			id := m.Format.ident()
			md.Format = &id
		}
		if m.Doc != nil {
			md.Doc = m.Doc.lit().Value
		}
		f.Measures = append(f.Measures, md)
	case d.View != nil:
		v := d.View
		vd := &ViewDecl{Pos: pos(v.Pos), Name: v.Name.ident(), Measures: names(v.Measures)}
		for _, b := range v.By {
			vd.By = append(vd.By, b.ref())
		}
		if v.Where != nil {
			vd.Where = v.Where.expr()
		}
		if v.Totals != nil {
			vd.HasTotals = true
			if v.Totals.Mode != nil {
				id := v.Totals.Mode.ident()
				vd.TotalsMode = &id
			}
		}
		f.Views = append(f.Views, vd)
	}
}

func (t *syntaxTable) decl() *TableDecl {
	td := &TableDecl{Pos: pos(t.Pos), Name: t.Name.ident(), At: t.At.lit(), From: t.From.lit()}
	for _, n := range t.Nulls {
		td.Nulls = append(td.Nulls, n.lit())
	}
	for _, it := range t.Items {
		switch {
		case it.Key != nil:
			td.Key = append(td.Key, names(it.Key)...)
			td.KeyPos = pos(it.Pos)
		case it.Link != nil:
			td.Links = append(td.Links, &LinkDecl{Pos: pos(it.Link.Pos), From: names(it.Link.From),
				Table: it.Link.Table.ident(), To: names(it.Link.To), Required: it.Link.Required})
		case it.Column != nil:
			td.Columns = append(td.Columns, it.Column.decl())
		}
	}
	return td
}

func (c *syntaxColumn) decl() *ColumnDecl {
	cd := &ColumnDecl{Pos: pos(c.Pos), Name: c.Name.ident()}
	if c.Type != nil {
		id := c.Type.ident()
		cd.Type = &id
	}
	if c.Expr != nil {
		cd.Expr = c.Expr.expr()
	}
	for _, o := range c.Options {
		switch {
		case o.Link != nil:
			cd.Link, cd.LinkRequired = o.Link.Target.ref(), o.Link.Required
		case o.Additive:
			cd.Additivity, cd.AdditivityPos = Additive, pos(o.Pos)
		case o.Nonadditive:
			cd.Additivity, cd.AdditivityPos = NonAdditive, pos(o.Pos)
		case o.Semi != nil:
			cd.Additivity, cd.AdditivityPos = SemiAdditive, pos(o.Pos)
			cd.SemiDate = o.Semi.ref()
		}
	}
	return cd
}

func (e *syntaxExpr) expr() Expr {
	x := e.Left.expr()
	for _, w := range e.Where {
		x = &Narrow{Pos: pos(w.Left.Left.Pos), X: x, Pred: w.expr()}
	}
	return x
}

func (e *syntaxOr) expr() Expr {
	x := e.Left.expr()
	for _, r := range e.Right {
		x = &Binary{Pos: pos(r.Left.Pos), Op: "or", L: x, R: r.expr()}
	}
	return x
}

func (e *syntaxAnd) expr() Expr {
	x := e.Left.expr()
	for _, r := range e.Right {
		x = &Binary{Pos: pos(r.Pos), Op: "and", L: x, R: r.expr()}
	}
	return x
}

func (e *syntaxNot) expr() Expr {
	if e.Not != nil {
		return &Unary{Pos: pos(e.Pos), Op: "not", X: e.Not.expr()}
	}
	return e.Cmp.expr()
}

func (e *syntaxCmp) expr() Expr {
	x := e.Left.expr()
	switch {
	case e.Op != nil:
		op := e.Op.Op
		if op == "!=" {
			op = "<>"
		}
		return &Binary{Pos: pos(e.Op.Pos), Op: op, L: x, R: e.Right.expr()}
	case e.IsNull != nil:
		return &IsNull{Pos: pos(e.IsNull.Pos), X: x, Not: e.IsNull.Not}
	case e.In != nil:
		in := &In{Pos: pos(e.In.Pos), X: x, Not: e.In.Not}
		for _, it := range e.In.Items {
			in.List = append(in.List, it.expr())
		}
		return in
	case e.Between != nil:
		return &Between{Pos: pos(e.Between.Pos), X: x, Lo: e.Between.Low.expr(),
			Hi: e.Between.High.expr(), Not: e.Between.Not}
	}
	return x
}

func (e *syntaxSum) expr() Expr {
	x := e.Left.expr()
	for _, r := range e.Rest {
		x = &Binary{Pos: pos(r.Pos), Op: r.Op, L: x, R: r.Right.expr()}
	}
	return x
}

func (e *syntaxProduct) expr() Expr {
	x := e.Left.expr()
	for _, r := range e.Rest {
		x = &Binary{Pos: pos(r.Pos), Op: r.Op, L: x, R: r.Right.expr()}
	}
	return x
}

func (e *syntaxUnary) expr() Expr {
	if e.Neg != nil {
		return &Unary{Pos: pos(e.Pos), Op: "-", X: e.Neg.expr()}
	}
	return e.Post.expr()
}

func (e *syntaxPostfix) expr() Expr {
	x := e.Primary.expr()
	for _, l := range e.Edits {
		ed := &Edited{Pos: pos(l.Pos), X: x}
		for _, s := range l.Edits {
			ed.Edits = append(ed.Edits, s.edit())
		}
		x = ed
	}
	return x
}

func (s *syntaxEdit) edit() *Edit {
	e := &Edit{Pos: pos(s.Pos)}
	switch s.Kind {
	case "":
		e.Kind, e.Target = EditPin, s.Pin.ref()
		if s.Time != nil {
			e.Kind, e.Time = EditTime, s.Time.edit()
			return e
		}
		if s.Value != nil {
			v := s.Value.expr()
			// `D = latest` and `D = earliest`: a pin takes literals
			// only, so these two bare names cannot mean a measure.
			if r, ok := v.(*Ref); ok && r.Table == "" && (strings.EqualFold(r.Name, "latest") || strings.EqualFold(r.Name, "earliest")) {
				e.Kind = EditTime
				e.Time = &TimeEdit{Pos: r.Pos, Word: Ident{Pos: r.NamePos, Name: strings.ToLower(r.Name)}}
				return e
			}
			e.Values = []Expr{v}
		}
		for _, v := range s.In {
			e.Values = append(e.Values, v.expr())
		}
		e.InList = s.In != nil
	default:
		e.Kind = EditDrop
		if strings.EqualFold(s.Kind, "ungroup") {
			e.Kind = EditUngroup
		}
		e.Target = s.Target.ref()
	}
	return e
}

func (s *syntaxTimeEdit) edit() *TimeEdit {
	t := &TimeEdit{Pos: pos(s.Pos), Word: s.Word.ident(), Date: s.Date}
	if s.N != nil {
		t.N = &NumberLit{Pos: pos(s.N.Pos), Text: s.N.Text}
	}
	if s.Unit != nil {
		u := s.Unit.ident()
		t.Unit = &u
	}
	return t
}

func (e *syntaxPrimary) expr() Expr {
	p := pos(e.Pos)
	switch {
	case e.Number != nil:
		return &NumberLit{Pos: p, Text: *e.Number}
	case e.String != nil:
		return &StringValue{Pos: p, Value: unquote(*e.String, '\'')}
	case e.Date != nil:
		return &DateLit{Pos: p, Value: unquote(*e.Date, '\'')}
	case e.Timestamp != nil:
		return &DateLit{Pos: p, Value: unquote(*e.Timestamp, '\''), Timestamp: true}
	case e.Bool != nil:
		return &BoolLit{Pos: p, Value: strings.EqualFold(*e.Bool, "true")}
	case e.Null:
		return &NullLit{Pos: p}
	case e.Case != nil:
		c := &Case{Pos: p}
		if e.Case.Operand != nil {
			c.Operand = e.Case.Operand.expr()
		}
		for _, w := range e.Case.Whens {
			c.Whens = append(c.Whens, When{Cond: w.Cond.expr(), Then: w.Then.expr()})
		}
		if e.Case.Else != nil {
			c.Else = e.Case.Else.expr()
		}
		return c
	case e.Call != nil:
		return e.Call.expr()
	case e.Paren != nil:
		return e.Paren.expr()
	}
	return e.Ref.ref()
}

func (c *syntaxCall) expr() Expr {
	call := &Call{Pos: pos(c.Pos), Func: c.Func.ident(), Star: c.Star, Distinct: c.Distinct}
	for _, a := range c.Args {
		call.Args = append(call.Args, a.expr())
	}
	for _, r := range c.Per {
		call.Per = append(call.Per, r.ref())
	}
	if c.Having != nil {
		call.Having = c.Having.expr()
	}
	if c.As != nil {
		id := c.As.ident()
		call.As = &id
	}
	if c.From != nil {
		call.From = c.From.expr()
	}
	return call
}
