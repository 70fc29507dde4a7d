package model

import (
	"strings"
)

// Text renders an expression back in the rollwise language, fully
// parenthesised where precedence could be in doubt. Measures print by
// name. The text is also a canonical key: equal texts mean equal
// expressions.
func Text(e Expr) string { return TextWith(e, nil) }

// TextWith is Text with the text of each Texter node given by leaf (its
// own Text where leaf is nil): a plan's dump names each computed value
// apart.
func TextWith(e Expr, leaf func(Texter) string) string {
	var b strings.Builder
	printer{leaf}.write(&b, e)
	return b.String()
}

// printer writes expressions as Text does.
type printer struct {
	leaf func(Texter) string
}

// Texter is an expression of a later pass (a plan's values) that writes
// its own text for Text.
type Texter interface {
	Expr
	Text() string
}

func quoteLit(s string) string { return "'" + strings.ReplaceAll(s, "'", "''") + "'" }

// QuoteName writes a name as the language reads it back: in backquotes
// unless it is a plain identifier. So the text stays a canonical key:
// a.`b.c` and `a.b`.c are two columns and print as two texts.
func QuoteName(s string) string {
	for i, r := range s {
		if r != '_' && !(r >= 'A' && r <= 'Z') && !(r >= 'a' && r <= 'z') && (i == 0 || !(r >= '0' && r <= '9')) {
			return "`" + s + "`"
		}
	}
	if s == "" {
		return "``"
	}
	return s
}

// columnText is a column reference as the text writes it.
func columnText(c *Column) string { return QuoteName(c.Table.Name) + "." + QuoteName(c.Name) }

func (p printer) write(b *strings.Builder, e Expr) {
	switch e := e.(type) {
	case nil:
		b.WriteString("null")
	case *ColRef:
		b.WriteString(columnText(e.Col))
	case *Lit:
		switch e.T {
		case TypeText:
			b.WriteString(quoteLit(e.Text))
		case TypeDate:
			b.WriteString("date " + quoteLit(e.Text))
		case TypeTimestamp:
			b.WriteString("timestamp " + quoteLit(e.Text))
		case TypeNull:
			b.WriteString("null")
		default:
			b.WriteString(e.Text)
		}
	case *BinOp:
		b.WriteString("(")
		p.write(b, e.L)
		b.WriteString(" " + e.Op + " ")
		p.write(b, e.R)
		b.WriteString(")")
	case *UnOp:
		b.WriteString("(" + e.Op)
		if e.Op == "not" {
			b.WriteString(" ")
		}
		p.write(b, e.X)
		b.WriteString(")")
	case *Func:
		b.WriteString(e.Name + "(")
		switch e.Name {
		case "cast":
			p.write(b, e.Args[0])
			b.WriteString(" as " + e.CastTo.String())
		case "extract":
			b.WriteString(e.Unit + " from ")
			p.write(b, e.Args[0])
		case "date_trunc":
			b.WriteString(e.Unit + ", ")
			p.write(b, e.Args[0])
		default:
			// A function with a unit other than extract and date_trunc is
			// a later pass's (a plan's date_move(D, N UNIT)).
			p.writeList(b, e.Args)
			if e.Unit != "" {
				b.WriteString(" " + e.Unit)
			}
		}
		b.WriteString(")")
	case *CaseExpr:
		b.WriteString("case")
		for _, w := range e.Whens {
			b.WriteString(" when ")
			p.write(b, w.Cond)
			b.WriteString(" then ")
			p.write(b, w.Then)
		}
		if e.Else != nil {
			b.WriteString(" else ")
			p.write(b, e.Else)
		}
		b.WriteString(" end")
	case *InExpr:
		b.WriteString("(")
		p.write(b, e.X)
		if e.Not {
			b.WriteString(" not")
		}
		b.WriteString(" in (")
		p.writeList(b, e.List)
		b.WriteString("))")
	case *IsNullExpr:
		b.WriteString("(")
		p.write(b, e.X)
		b.WriteString(" is ")
		if e.Not {
			b.WriteString("not ")
		}
		b.WriteString("null)")
	case *Agg:
		b.WriteString(e.Func + "(")
		switch {
		case e.Arg == nil:
			b.WriteString("*")
		case e.Distinct:
			b.WriteString("distinct ")
			p.write(b, e.Arg)
		default:
			p.write(b, e.Arg)
		}
		b.WriteString(")")
	case *MeasureRef:
		b.WriteString(QuoteName(e.Measure.Name))
	case *NarrowExpr:
		b.WriteString("(")
		p.write(b, e.X)
		b.WriteString(" where ")
		p.write(b, e.Pred)
		b.WriteString(")")
	case *EditExpr:
		b.WriteString("(")
		p.write(b, e.X)
		b.WriteString(")[")
		for i, ed := range e.Edits {
			if i > 0 {
				b.WriteString("; ")
			}
			p.writeEdit(b, ed)
		}
		b.WriteString("]")
	case *PerAgg:
		b.WriteString(e.Func + "(")
		if e.X == nil {
			b.WriteString("*")
		} else {
			p.write(b, e.X)
		}
		b.WriteString(" per ")
		for i, c := range e.Per {
			if i > 0 {
				b.WriteString(", ")
			}
			b.WriteString(columnText(c))
		}
		if e.Having != nil {
			b.WriteString(" having ")
			p.write(b, e.Having)
		}
		b.WriteString(")")
	case Texter:
		if p.leaf != nil {
			b.WriteString(p.leaf(e))
		} else {
			b.WriteString(e.Text())
		}
	}
}

func (p printer) writeEdit(b *strings.Builder, ed *CellEdit) {
	target := ""
	switch {
	case ed.Col != nil:
		target = columnText(ed.Col)
	case ed.Table != nil:
		target = QuoteName(ed.Table.Name)
	}
	switch ed.Kind {
	case EditDrop:
		b.WriteString(strings.TrimSpace("drop " + target))
	case EditUngroup:
		b.WriteString(strings.TrimSpace("ungroup " + target))
	case EditLatest, EditEarliest, EditBack, EditToDate, EditRunning, EditLast:
		b.WriteString(target + " " + ed.TimeText())
	default:
		b.WriteString(target)
		if len(ed.Values) == 1 {
			b.WriteString(" = ")
			p.write(b, ed.Values[0])
			return
		}
		b.WriteString(" in (")
		for i, v := range ed.Values {
			if i > 0 {
				b.WriteString(", ")
			}
			p.write(b, v)
		}
		b.WriteString(")")
	}
}

func (p printer) writeList(b *strings.Builder, es []Expr) {
	for i, a := range es {
		if i > 0 {
			b.WriteString(", ")
		}
		p.write(b, a)
	}
}
