package dialects

import (
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
)

// expr renders a row or measure expression. Literals are rendered by the
// dialect; numbers were checked by the lexer to hold only digits, a dot and
// an exponent.
func (r *renderer) expr(e model.Expr) (string, error) {
	switch e := e.(type) {
	case *model.ColRef:
		if d := r.useDerived[e.Col.Table]; d != nil && d.cols[e.Col] {
			return r.q(e.Col.Table.Name) + "." + r.q(e.Col.Name), nil
		}
		if e.Col.Derived != nil {
			x, err := r.expr(e.Col.Derived)
			if err != nil {
				return "", err
			}
			t := e.Col.Table
			if r.iter != nil && t != r.iter && len(t.Key) > 0 && !r.found[t] {
				// A row whose link finds no match has NULL for every column
				// beyond the link, derived ones included (an inner join
				// keeps no such row).
				return "CASE WHEN " + r.q(t.Name) + "." + r.q(t.Key[0].Name) + " IS NOT NULL THEN " + x + " END", nil
			}
			return "(" + x + ")", nil
		}
		return r.q(e.Col.Table.Name) + "." + r.q(e.Col.Name), nil
	case *model.Lit:
		return r.lit(e), nil
	case *model.BinOp:
		side := r.value
		if e.Op == "and" || e.Op == "or" {
			side = r.pred
		}
		l, err := side(e.L)
		if err != nil {
			return "", err
		}
		right := e.R
		if e.Op == "/" {
			// Divide gives NULL on a zero divisor already: x / nullif(y, 0)
			// need not say it twice.
			right = nonZero(right)
		}
		rt, err := side(right)
		if err != nil {
			return "", err
		}
		switch e.Op {
		case "/":
			return "(" + r.d.Divide(l, rt) + ")", nil
		case "||":
			return r.d.Concat(l, rt), nil
		}
		l, rt = bare(e.Op, e.L, l, false), bare(e.Op, e.R, rt, true)
		return "(" + l + " " + strings.ToUpper(e.Op) + " " + rt + ")", nil
	case *model.UnOp:
		render := r.expr
		if e.Op == "not" {
			render = r.pred
		}
		x, err := render(e.X)
		if err != nil {
			return "", err
		}
		if e.Op == "not" {
			return "(NOT " + x + ")", nil
		}
		return "(-" + x + ")", nil
	case *model.Func:
		return r.fn(e)
	case *model.CaseExpr:
		s := "CASE"
		for _, w := range e.Whens {
			c, err := r.pred(w.Cond)
			if err != nil {
				return "", err
			}
			t, err := r.value(w.Then)
			if err != nil {
				return "", err
			}
			s += " WHEN " + c + " THEN " + r.unify(t, e.T)
		}
		if e.Else != nil {
			x, err := r.value(e.Else)
			if err != nil {
				return "", err
			}
			s += " ELSE " + r.unify(x, e.T)
		}
		return s + " END", nil
	case *model.InExpr:
		x, err := r.value(e.X)
		if err != nil {
			return "", err
		}
		list, err := r.list(e.List)
		if err != nil {
			return "", err
		}
		not := ""
		if e.Not {
			not = "NOT "
		}
		return "(" + x + " " + not + "IN (" + list + "))", nil
	case *model.IsNullExpr:
		x, err := r.value(e.X)
		if err != nil {
			return "", err
		}
		if e.Not {
			return "(" + x + " IS NOT NULL)", nil
		}
		return "(" + x + " IS NULL)", nil
	case *plan.Computed:
		return r.computed(e)
	case *plan.ValueRef:
		if r.layer != nil {
			if name, ok := r.layer.values[valueKey(e)]; ok {
				return r.q(name), nil
			}
		}
		if e.Rel.Window != nil {
			return r.window(r.ctx, e.Rel.Window, e.Column)
		}
		s := r.q(e.Column)
		name := r.cte[e.Rel]
		if _, single := r.from(r.ctx); !single {
			s = r.q(name) + "." + s
		}
		if e.ZeroIfMissing && name != r.keyRel[r.ctx] {
			s = "COALESCE(" + s + ", 0)"
		}
		return s, nil
	}
	return "", fmt.Errorf("internal error: cannot render %T", e)
}

// nonZero returns y for nullif(y, 0), and e otherwise.
func nonZero(e model.Expr) model.Expr {
	if f, ok := e.(*model.Func); ok && f.Name == "nullif" && len(f.Args) == 2 {
		if z, ok := f.Args[1].(*model.Lit); ok && z.T != model.TypeNull && z.T != model.TypeText && z.Text == "0" && f.Args[0].Type() == f.T {
			return f.Args[0]
		}
	}
	return e
}

// pred renders e where a predicate is due, value where a value is due;
// they differ only where the dialect has no boolean values (SQL Server).
func (r *renderer) pred(e model.Expr) (string, error) {
	s, err := r.expr(e)
	if err != nil || IsPredicate(e) {
		return s, err
	}
	return r.d.Truth(s), nil
}

// arithmetic ranks the operators bare works with: * and / bind tighter
// than + and -, and all four group from the left, in SQL as in
// arithmetic (common practice; every dialect here agrees). A division is
// spelled `l / NULLIF(r, 0)` (Divide), so as an operand it is a / at its
// top; as an operator it keeps its operands as they are.
// The comma between the arguments of a plain call (coalesce, nullif)
// binds loosest of all.
var arithmetic = map[string]int{",": 0, "+": 1, "-": 1, "*": 2, "/": 2}

// bare drops the parentheses around operand s (x rendered) of an
// operator op (+ - or *) where they change nothing: x is itself + - * or
// /, rendered as "(" ... ")" by expr, and binds at least as tightly as op on the
// left, or more tightly on the right (a - (b - c) keeps them). Layered
// measures nest arithmetic deeply, and every level's parentheses made
// their SQL a few percent longer.
// A value computed once (plan.Computed) is its expression when written
// inline, or a quoted column name, which bare leaves as it is.
func bare(op string, x model.Expr, s string, right bool) string {
	for {
		c, ok := x.(*plan.Computed)
		if !ok {
			break
		}
		x = c.X
	}
	b, ok := x.(*model.BinOp)
	if !ok || !strings.HasPrefix(s, "(") || !strings.HasSuffix(s, ")") {
		return s
	}
	p, ok1 := arithmetic[op]
	c, ok2 := arithmetic[b.Op]
	if !ok1 || !ok2 || c < p || right && c == p {
		return s
	}
	return s[1 : len(s)-1]
}

func (r *renderer) value(e model.Expr) (string, error) {
	s, err := r.expr(e)
	if err != nil || !IsPredicate(e) {
		return s, err
	}
	return r.d.BoolValue(s), nil
}

func (r *renderer) list(es []model.Expr) (string, error) {
	var parts []string
	for _, a := range es {
		x, err := r.value(a)
		if err != nil {
			return "", err
		}
		parts = append(parts, x)
	}
	return strings.Join(parts, ", "), nil
}

func (r *renderer) lit(e *model.Lit) string {
	switch e.T {
	case model.TypeText:
		return r.d.String(e.Text)
	case model.TypeDate:
		return r.d.Date(e.Text)
	case model.TypeTimestamp:
		return r.d.Timestamp(e.Text)
	case model.TypeBoolean:
		return r.d.Bool(strings.EqualFold(e.Text, "true"))
	case model.TypeNull:
		return "NULL"
	}
	return e.Text
}

func (r *renderer) fn(e *model.Func) (string, error) {
	var args []string
	var types []model.Type
	for _, a := range e.Args {
		x, err := r.value(a)
		if err != nil {
			return "", err
		}
		if e.Name == "coalesce" || e.Name == "nullif" { // plain calls in every dialect
			x = bare(",", a, x, false)
		}
		args = append(args, x)
		types = append(types, a.Type())
	}
	switch e.Name {
	case "coalesce", "least", "greatest":
		for i := range args {
			args[i] = r.unify(args[i], e.T)
		}
	}
	switch e.Name {
	case "cast":
		return r.d.Cast(args[0], types[0], e.CastTo), nil
	case "extract":
		return r.d.Extract(e.Unit, args[0]), nil
	case "date_trunc":
		return r.d.DateTrunc(e.Unit, args[0], types[0]), nil
	case "date_move":
		return r.moveDate(e, args[0], types[0]), nil
	}
	return r.call(e.Name, args, types)
}

// unify widens a branch of a decimal-typed union where the dialect needs
// it (unifyDecimal).
func (r *renderer) unify(x string, t model.Type) string {
	if r.d.unifyDecimal != "" && t == model.TypeDecimal {
		return "CAST(" + x + " AS " + r.d.unifyDecimal + ")"
	}
	return x
}
