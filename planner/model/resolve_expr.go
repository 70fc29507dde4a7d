package model

import (
	"fmt"
	"strconv"
	"strings"
	"time"

	"github.com/rollwise/rollwise/grammar"
)

// exprResolver resolves one expression. In a row expression (row = true)
// names are columns; in a measure context bare names are measures and
// columns appear only inside aggregates.
type exprResolver struct {
	r *resolver
	// self is the table whose columns may be written bare (inside a derived
	// column), or nil.
	self *Table
	row  bool
	// pinned holds the columns that enclosing cell edits pin to one
	// value, and grouped the per columns of enclosing per-grain
	// aggregates, each as the edits inside leave them (applyEdit).
	pinned, grouped map[*Column]bool
	// outerPins are the pins in force around an edit list that is
	// directly the measure of another (deadPins).
	outerPins map[*Column]grammar.Pos
	// havingPer is the per list of the per-grain aggregate whose having
	// clause is being resolved, or "".
	havingPer string
}

var aggFuncs = map[string]bool{
	"sum": true, "avg": true, "min": true, "max": true, "count": true,
	"median": true, "stddev": true, "variance": true,
}

var scalarFuncs = []string{"coalesce", "nullif", "abs", "round", "least", "greatest",
	"lower", "upper", "cast", "extract", "date_trunc"}

var dateUnits = []string{"day", "week", "month", "quarter", "year"}

func (x *exprResolver) errorf(p grammar.Pos, code, format string, args ...any) *grammar.Diagnostic {
	return x.r.diags.Errorf(p, code, format, args...)
}

func (x *exprResolver) sub(row bool) *exprResolver {
	return &exprResolver{r: x.r, self: x.self, row: row, pinned: x.pinned, grouped: x.grouped}
}

// expr resolves e; it returns nil after reporting an error.
func (x *exprResolver) expr(e grammar.Expr) Expr {
	switch e := e.(type) {
	case *grammar.Ref:
		return x.ref(e)
	case *grammar.NumberLit:
		t := TypeInteger
		if strings.ContainsAny(e.Text, ".eE") {
			t = TypeDecimal
			if strings.ContainsAny(e.Text, "eE") {
				t = TypeFloat
			}
		}
		if !x.numberFits(e, t) {
			return nil
		}
		return &Lit{Pos: e.Pos, T: t, Text: e.Text}
	case *grammar.StringValue:
		return &Lit{Pos: e.Pos, T: TypeText, Text: e.Value}
	case *grammar.DateLit:
		return x.dateLit(e)
	case *grammar.BoolLit:
		return &Lit{Pos: e.Pos, T: TypeBoolean, Text: strconv.FormatBool(e.Value)}
	case *grammar.NullLit:
		return &Lit{Pos: e.Pos, T: TypeNull}
	case *grammar.Binary:
		return x.binary(e)
	case *grammar.Unary:
		v := x.expr(e.X)
		if v == nil {
			return nil
		}
		if e.Op == "not" {
			x.wantType(v, TypeBoolean, "not")
		} else if !v.Type().Numeric() {
			x.errorf(e.Pos, "type", "cannot negate a %s value", v.Type())
			return nil
		}
		return &UnOp{Pos: e.Pos, Op: e.Op, X: v}
	case *grammar.IsNull:
		v := x.expr(e.X)
		if v == nil {
			return nil
		}
		return &IsNullExpr{Pos: e.Pos, X: v, Not: e.Not}
	case *grammar.In:
		return x.in(e)
	case *grammar.Between:
		v, lo, hi := x.expr(e.X), x.expr(e.Lo), x.expr(e.Hi)
		if v == nil || lo == nil || hi == nil {
			return nil
		}
		x.comparable(e.Pos, v, lo)
		x.comparable(e.Pos, v, hi)
		var out Expr = &BinOp{Pos: e.Pos, Op: "and", T: TypeBoolean,
			L: &BinOp{Pos: e.Pos, Op: ">=", L: v, R: lo, T: TypeBoolean},
			R: &BinOp{Pos: e.Pos, Op: "<=", L: v, R: hi, T: TypeBoolean}}
		if e.Not {
			out = &UnOp{Pos: e.Pos, Op: "not", X: out}
		}
		return out
	case *grammar.Case:
		return x.caseExpr(e)
	case *grammar.Call:
		return x.call(e)
	case *grammar.Narrow:
		return x.narrow(e)
	case *grammar.Edited:
		return x.edited(e)
	}
	x.errorf(e.Position(), "internal", "unexpected expression %T", e)
	return nil
}

func (x *exprResolver) dateLit(e *grammar.DateLit) Expr {
	if e.Timestamp {
		for _, layout := range []string{"2006-01-02 15:04:05", "2006-01-02T15:04:05", "2006-01-02 15:04", "2006-01-02"} {
			if _, err := time.Parse(layout, e.Value); err == nil {
				return &Lit{Pos: e.Pos, T: TypeTimestamp, Text: e.Value}
			}
		}
		x.errorf(e.Pos, "bad-literal", "timestamp '%s' is not a valid timestamp", e.Value).Suggestion =
			"write timestamp 'YYYY-MM-DD HH:MM:SS'"
		return nil
	}
	if _, err := time.Parse("2006-01-02", e.Value); err != nil {
		x.errorf(e.Pos, "bad-literal", "date '%s' is not a valid date", e.Value).Suggestion = "write date 'YYYY-MM-DD'"
		return nil
	}
	return &Lit{Pos: e.Pos, T: TypeDate, Text: e.Value}
}

func (x *exprResolver) ref(e *grammar.Ref) Expr {
	if e.Table == "" && !x.row {
		m := x.r.measure(e.Name)
		if m == nil {
			x.unknownMeasure(e)
			return nil
		}
		if m.Expr == nil {
			return nil
		}
		return &MeasureRef{Pos: e.Pos, Measure: m}
	}
	if !x.row {
		d := x.errorf(e.Pos, "column-in-measure", "column %s.%s is used outside an aggregate", e.Table, e.Name)
		d.Suggestion = fmt.Sprintf("a measure works on cells, not rows: aggregate the column, for example sum(%s.%s) or max(%s.%s)",
			e.Table, e.Name, e.Table, e.Name)
		if x.havingPer != "" {
			d.Suggestion = fmt.Sprintf("having tests a measure of each group, not a row: write a measure such as max(%s.%s) > 1, or add the column to the per columns (per %s, %s.%s)",
				e.Table, e.Name, x.havingPer, e.Table, e.Name)
		}
		return nil
	}
	if e.Table == "" && x.self == nil {
		d := x.errorf(e.Pos, "bare-name", "'%s' is a bare name, which means a measure, but measures cannot be used inside a row expression", e.Name)
		d.Suggestion = "write columns as table.column"
		if owners := x.r.columnsNamed(e.Name); len(owners) > 0 {
			d.Suggestion = "write columns as table.column, for example " + owners[0].String()
		} else if _, measure := x.r.measureDecls[e.Name]; !measure {
			d.Suggestion = fmt.Sprintf("no column is called %s: to compare with the text, quote it: '%s'", e.Name, strings.ReplaceAll(e.Name, "'", "''"))
		}
		return nil
	}
	c := x.r.columnRef(e, x.self)
	if c == nil {
		return nil
	}
	if c.Derived == nil && x.r.derivedState != nil && x.r.derivedState[c] != 2 {
		x.r.ensureDerived(c)
	}
	if x.self != nil && c.Table != x.self {
		if !reachesAll(x.self, []*Table{c.Table}) {
			x.errorf(e.Pos, "unreachable", "derived column of %s reads %s, but no link leads from %s to %s",
				x.self.Name, c, x.self.Name, c.Table.Name)
			return nil
		}
	}
	return &ColRef{Pos: e.Pos, Col: c}
}

func (x *exprResolver) unknownMeasure(e *grammar.Ref) {
	var names []string
	for _, md := range x.r.measureOrder {
		names = append(names, md.Name.Name)
	}
	d := x.errorf(e.Pos, "unknown-measure", "unknown measure '%s'", e.Name)
	if near := grammar.Closest(e.Name, names); near != "" {
		d.Message += fmt.Sprintf("; did you mean '%s'?", near)
	} else {
		for _, t := range x.r.m.Tables {
			if t.Column(e.Name) != nil {
				d.Suggestion = fmt.Sprintf("a bare name is a measure; to use the column write %s.%s inside an aggregate", t.Name, e.Name)
				break
			}
		}
	}
}

func (x *exprResolver) wantType(v Expr, t Type, what string) bool {
	if v.Type() != t && v.Type() != TypeNull {
		x.errorf(v.Position(), "type", "%s needs a %s value, not %s", what, t, v.Type())
		return false
	}
	return true
}

func comparableTypes(a, b Type) bool {
	switch {
	case a == TypeNull || b == TypeNull || a == b:
		return true
	case a.Numeric() && b.Numeric():
		return true
	case (a == TypeDate || a == TypeTimestamp) && (b == TypeDate || b == TypeTimestamp):
		return true
	}
	return false
}

func (x *exprResolver) comparable(p grammar.Pos, a, b Expr) bool {
	if !comparableTypes(a.Type(), b.Type()) {
		x.errorf(p, "type", "cannot compare %s with %s", a.Type(), b.Type())
		return false
	}
	return true
}

// numericResult is the type of arithmetic on a and b.
func numericResult(a, b Type) Type {
	switch {
	case a == TypeFloat || b == TypeFloat:
		return TypeFloat
	case a == TypeDecimal || b == TypeDecimal:
		return TypeDecimal
	case a == TypeNull:
		return b
	}
	return a
}

func (x *exprResolver) binary(e *grammar.Binary) Expr {
	l, r := x.expr(e.L), x.expr(e.R)
	if l == nil || r == nil {
		return nil
	}
	out := &BinOp{Pos: e.Pos, Op: e.Op, L: l, R: r}
	switch e.Op {
	case "and", "or":
		if !x.wantType(l, TypeBoolean, e.Op) || !x.wantType(r, TypeBoolean, e.Op) {
			return nil
		}
		out.T = TypeBoolean
	case "=", "<>", "<", "<=", ">", ">=":
		if !x.comparable(e.Pos, l, r) {
			return nil
		}
		out.T = TypeBoolean
	case "||":
		out.T = TypeText
	default:
		verb := map[string]string{"+": "add", "-": "subtract", "*": "multiply", "/": "divide"}[e.Op]
		for _, v := range []Expr{l, r} {
			if !v.Type().Numeric() {
				d := x.errorf(e.Pos, "type", "cannot %s a %s value", verb, v.Type())
				if v.Type() == TypeDate || v.Type() == TypeTimestamp {
					d.Suggestion = "date arithmetic is not part of the language; use extract(year from d) or date_trunc(month, d)"
				}
				return nil
			}
		}
		out.T = numericResult(l.Type(), r.Type())
		if e.Op == "/" {
			out.T = TypeFloat
			if l.Type() == TypeDecimal && r.Type() != TypeFloat || r.Type() == TypeDecimal && l.Type() != TypeFloat {
				out.T = TypeFloat
			}
		}
	}
	return out
}

func (x *exprResolver) in(e *grammar.In) Expr {
	v := x.expr(e.X)
	if v == nil {
		return nil
	}
	out := &InExpr{Pos: e.Pos, X: v, Not: e.Not}
	for _, it := range e.List {
		iv := x.expr(it)
		if iv == nil {
			return nil
		}
		if !x.comparable(it.Position(), v, iv) {
			return nil
		}
		out.List = append(out.List, iv)
	}
	return out
}

func (x *exprResolver) caseExpr(e *grammar.Case) Expr {
	out := &CaseExpr{Pos: e.Pos, T: TypeNull}
	var operand Expr
	if e.Operand != nil {
		if operand = x.expr(e.Operand); operand == nil {
			return nil
		}
	}
	var results []Expr
	for _, w := range e.Whens {
		c, t := x.expr(w.Cond), x.expr(w.Then)
		if c == nil || t == nil {
			return nil
		}
		if operand != nil {
			if !x.comparable(w.Cond.Position(), operand, c) {
				return nil
			}
			c = &BinOp{Pos: w.Cond.Position(), Op: "=", L: operand, R: c, T: TypeBoolean}
		} else if !x.wantType(c, TypeBoolean, "when") {
			return nil
		}
		out.Whens = append(out.Whens, WhenArm{Cond: c, Then: t})
		results = append(results, t)
	}
	if e.Else != nil {
		if out.Else = x.expr(e.Else); out.Else == nil {
			return nil
		}
		results = append(results, out.Else)
	}
	t, ok := x.commonType(e.Pos, "case", results)
	if !ok {
		return nil
	}
	out.T = t
	return out
}

// commonType is the type that values of several branches share.
func (x *exprResolver) commonType(p grammar.Pos, what string, vs []Expr) (Type, bool) {
	t := TypeNull
	for _, v := range vs {
		vt := v.Type()
		switch {
		case vt == TypeNull:
		case t == TypeNull:
			t = vt
		case t.Numeric() && vt.Numeric():
			t = numericResult(t, vt)
		case t != vt:
			x.errorf(p, "type", "the values of %s mix %s and %s", what, t, vt)
			return t, false
		}
	}
	return t, true
}

func (x *exprResolver) narrow(e *grammar.Narrow) Expr {
	if x.row {
		x.errorf(e.Pos, "narrow-in-row", "'where' narrows a measure; it cannot appear inside a row expression").Suggestion =
			"put the condition after the aggregate: sum(t.c) where PRED, or use case when ... inside it"
		return nil
	}
	v := x.expr(e.X)
	pred := x.sub(true).expr(e.Pred)
	if v == nil || pred == nil {
		return nil
	}
	if !x.wantType(pred, TypeBoolean, "where") {
		return nil
	}
	return &NarrowExpr{Pos: e.Pos, X: v, Pred: pred}
}

// numberFits refuses a number literal its type cannot hold: an integer
// beyond 64 bits, or a float beyond double precision's range (1e400),
// which engines would read as another type, an infinity or an error.
func (x *exprResolver) numberFits(e *grammar.NumberLit, t Type) bool {
	var err error
	switch t {
	case TypeInteger:
		_, err = strconv.ParseInt(e.Text, 10, 64)
	case TypeFloat:
		_, err = strconv.ParseFloat(e.Text, 64)
	}
	if err == nil {
		return true
	}
	d := x.errorf(e.Pos, "bad-literal", "%.40s is out of range for %s", e.Text, t)
	if t == TypeInteger {
		d.Suggestion = "integers are 64-bit; write the number with a decimal point to make it a decimal"
	} else {
		d.Suggestion = "floats are 64-bit, at most about 1.8e308"
	}
	return false
}
