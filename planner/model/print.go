package model

import (
	"strings"
)

// Text renders an expression back in the rollwise language, fully
// parenthesised where precedence could be in doubt. Measures print by
// name. The text is also a canonical key: equal texts mean equal
// expressions.
func Text(e Expr) string {
	var b strings.Builder
	writeText(&b, e)
	return b.String()
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

func writeText(b *strings.Builder, e Expr) {
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
		writeText(b, e.L)
		b.WriteString(" " + e.Op + " ")
		writeText(b, e.R)
		b.WriteString(")")
	case *UnOp:
		b.WriteString("(" + e.Op)
		if e.Op == "not" {
			b.WriteString(" ")
		}
		writeText(b, e.X)
		b.WriteString(")")
	case *Func:
		b.WriteString(e.Name + "(")
		switch e.Name {
		case "cast":
			writeText(b, e.Args[0])
			b.WriteString(" as " + e.CastTo.String())
		case "extract":
			b.WriteString(e.Unit + " from ")
			writeText(b, e.Args[0])
		case "date_trunc":
			b.WriteString(e.Unit + ", ")
			writeText(b, e.Args[0])
		default:
			// A function with a unit other than extract and date_trunc is
			// a later pass's (a plan's date_move(D, N UNIT)).
			writeList(b, e.Args)
			if e.Unit != "" {
				b.WriteString(" " + e.Unit)
			}
		}
		b.WriteString(")")
	case *CaseExpr:
		b.WriteString("case")
		for _, w := range e.Whens {
			b.WriteString(" when ")
			writeText(b, w.Cond)
			b.WriteString(" then ")
			writeText(b, w.Then)
		}
		if e.Else != nil {
			b.WriteString(" else ")
			writeText(b, e.Else)
		}
		b.WriteString(" end")
	case *InExpr:
		b.WriteString("(")
		writeText(b, e.X)
		if e.Not {
			b.WriteString(" not")
		}
		b.WriteString(" in (")
		writeList(b, e.List)
		b.WriteString("))")
	case *IsNullExpr:
		b.WriteString("(")
		writeText(b, e.X)
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
			writeText(b, e.Arg)
		default:
			writeText(b, e.Arg)
		}
		b.WriteString(")")
	case *MeasureRef:
		b.WriteString(QuoteName(e.Measure.Name))
	case *NarrowExpr:
		b.WriteString("(")
		writeText(b, e.X)
		b.WriteString(" where ")
		writeText(b, e.Pred)
		b.WriteString(")")
	case *EditExpr:
		b.WriteString("(")
		writeText(b, e.X)
		b.WriteString(")[")
		for i, ed := range e.Edits {
			if i > 0 {
				b.WriteString("; ")
			}
			writeEdit(b, ed)
		}
		b.WriteString("]")
	case *PerAgg:
		b.WriteString(e.Func + "(")
		if e.X == nil {
			b.WriteString("*")
		} else {
			writeText(b, e.X)
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
			writeText(b, e.Having)
		}
		b.WriteString(")")
	case Texter:
		b.WriteString(e.Text())
	}
}

func writeEdit(b *strings.Builder, ed *CellEdit) {
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
			writeText(b, ed.Values[0])
			return
		}
		b.WriteString(" in (")
		for i, v := range ed.Values {
			if i > 0 {
				b.WriteString(", ")
			}
			writeText(b, v)
		}
		b.WriteString(")")
	}
}

func writeList(b *strings.Builder, es []Expr) {
	for i, a := range es {
		if i > 0 {
			b.WriteString(", ")
		}
		writeText(b, a)
	}
}
