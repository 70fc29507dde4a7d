package grammar

import "github.com/alecthomas/participle/v2/lexer"

// The fast path's expressions, one method per production of syntax.go,
// from the loosest binding (Expr: narrowing with where) to Primary.

func (p *fastParser) expr() *syntaxExpr {
	e := p.a.exprs.new()
	e.Left = p.or()
	for p.takeKw("where") {
		e.Where = append(e.Where, p.or())
	}
	return e
}

func (p *fastParser) or() *syntaxOr {
	o := p.a.ors.new()
	o.Left = p.and()
	for p.takeKw("or") {
		o.Right = append(o.Right, p.and())
	}
	return o
}

func (p *fastParser) and() *syntaxAnd {
	a := p.a.ands.new()
	a.Left = p.not()
	for p.takeKw("and") {
		a.Right = append(a.Right, p.not())
	}
	return a
}

func (p *fastParser) not() *syntaxNot {
	n := p.a.nots.new()
	t := p.peek()
	n.Pos = t.Pos
	if isKw(t, "not") {
		p.i++
		n.Not = p.not()
	} else {
		n.Cmp = p.cmp()
	}
	return n
}

// cmpOps are the comparison operators of CmpOp.
var cmpOps = map[string]bool{"=": true, "<>": true, "!=": true, "<=": true, ">=": true, "<": true, ">": true}

func (p *fastParser) cmp() *syntaxCmp {
	c := p.a.cmps.new()
	c.Left = p.sum()
	t := p.peek()
	switch {
	case t.Type == tokOp && cmpOps[t.Value]:
		p.i++
		c.Op = &syntaxOp{Pos: t.Pos, Op: t.Value}
		c.Right = p.sum()
	case isKw(t, "is"):
		p.i++
		c.IsNull = &syntaxIsNull{Pos: t.Pos}
		if p.takeKw("not") {
			c.IsNull.Not = true
		}
		p.expectKw("null")
	case isKw(t, "in"):
		c.In = p.in(false)
	case isKw(t, "between"):
		c.Between = p.between(false)
	case isKw(t, "not") && isKw(p.peek2(), "in"):
		c.In = p.in(true)
	case isKw(t, "not") && isKw(p.peek2(), "between"):
		c.Between = p.between(true)
	}
	return c
}

// in parses In, at "not" if not is set, else at "in".
func (p *fastParser) in(not bool) *syntaxIn {
	in := &syntaxIn{Pos: p.peek().Pos, Not: not}
	if not {
		p.i++
	}
	p.i++
	in.Items = p.sumList()
	return in
}

// sumList parses "(" Sum ("," Sum)* ")".
func (p *fastParser) sumList() []*syntaxSum {
	p.expectOp("(")
	out := list(p, p.sum)
	p.expectOp(")")
	return out
}

func (p *fastParser) between(not bool) *syntaxBetween {
	b := &syntaxBetween{Pos: p.peek().Pos, Not: not}
	if not {
		p.i++
	}
	p.i++
	b.Low = p.sum()
	p.expectKw("and")
	b.High = p.sum()
	return b
}

func (p *fastParser) sum() *syntaxSum {
	s := p.a.sums.new()
	s.Left = p.product()
	for {
		t := p.peek()
		if t.Type != tokOp || t.Value != "+" && t.Value != "-" && t.Value != "||" {
			return s
		}
		p.i++
		op := p.a.sumOps.new()
		op.Pos, op.Op, op.Right = t.Pos, t.Value, p.product()
		s.Rest = append(s.Rest, op)
	}
}

func (p *fastParser) product() *syntaxProduct {
	pr := p.a.products.new()
	pr.Left = p.unary()
	for {
		t := p.peek()
		if t.Type != tokOp || t.Value != "*" && t.Value != "/" {
			return pr
		}
		p.i++
		op := p.a.prodOps.new()
		op.Pos, op.Op, op.Right = t.Pos, t.Value, p.unary()
		pr.Rest = append(pr.Rest, op)
	}
}

func (p *fastParser) unary() *syntaxUnary {
	u := p.a.unaries.new()
	t := p.peek()
	u.Pos = t.Pos
	if isOp(t, "-") {
		p.i++
		u.Neg = p.unary()
	} else {
		u.Post = p.postfix()
	}
	return u
}

func (p *fastParser) postfix() *syntaxPostfix {
	pf := p.a.postfix.new()
	pf.Primary = p.primary()
	for p.op("[") {
		l := &syntaxEditList{Pos: p.take().Pos, Edits: []*syntaxEdit{p.edit()}}
		for p.op(";") {
			p.i++
			l.Edits = append(l.Edits, p.edit())
		}
		p.expectOp("]")
		pf.Edits = append(pf.Edits, l)
	}
	return pf
}

func (p *fastParser) edit() *syntaxEdit {
	t := p.peek()
	e := &syntaxEdit{Pos: t.Pos}
	if isKw(t, "drop") || isKw(t, "ungroup") {
		p.i++
		e.Kind = t.Value
		if isName(p.peek()) {
			e.Target = p.ref()
		}
		return e
	}
	e.Pin = p.ref()
	switch t := p.peek(); {
	case isOp(t, "="):
		p.i++
		e.Value = p.sum()
	case isKw(t, "in"):
		p.i++
		e.In = p.sumList()
	case isName(t):
		te := &syntaxTimeEdit{Pos: t.Pos, Word: p.name()}
		if p.takeKw("date") {
			te.Date = true
		}
		if n := p.peek(); n.Type == tokNumber {
			p.i++
			te.N = &syntaxNum{Pos: n.Pos, Text: n.Value}
		}
		if isName(p.peek()) {
			te.Unit = p.name()
		}
		e.Time = te
	default:
		panic(declined{})
	}
	return e
}

func (p *fastParser) primary() *syntaxPrimary {
	pr := p.a.primary.new()
	t := p.peek()
	pr.Pos = t.Pos
	switch {
	case t.Type == tokNumber:
		p.i++
		pr.Number = p.str(t.Value)
	case t.Type == tokString:
		p.i++
		pr.String = p.str(t.Value)
	case isKw(t, "date"):
		p.i++
		pr.Date = p.str(p.text(tokString))
	case isKw(t, "timestamp"):
		p.i++
		pr.Timestamp = p.str(p.text(tokString))
	case isKw(t, "true") || isKw(t, "false"):
		p.i++
		pr.Bool = p.str(t.Value)
	case isKw(t, "null"):
		p.i++
		pr.Null = true
	case isKw(t, "case"):
		pr.Case = p.caseExpr()
	case isName(t) && isOp(p.peek2(), "("):
		pr.Call = p.call()
	case isOp(t, "("):
		p.i++
		pr.Paren = p.expr()
		p.expectOp(")")
	case isName(t):
		pr.Ref = p.ref()
	default:
		panic(declined{})
	}
	return pr
}

func (p *fastParser) caseExpr() *syntaxCase {
	c := &syntaxCase{Pos: p.take().Pos}
	if !p.kw("when") {
		c.Operand = p.expr()
	}
	for p.kw("when") {
		w := &syntaxWhen{Pos: p.take().Pos, Cond: p.expr()}
		p.expectKw("then")
		w.Then = p.expr()
		c.Whens = append(c.Whens, w)
	}
	if len(c.Whens) == 0 {
		panic(declined{})
	}
	if p.takeKw("else") {
		c.Else = p.expr()
	}
	p.expectKw("end")
	return c
}

// callEnds are the tokens that may follow a call's name and "(" when it
// has no arguments.
func callEnd(t *lexer.Token) bool {
	return isOp(t, ")") || isKw(t, "per") || isKw(t, "as") || isKw(t, "from")
}

func (p *fastParser) call() *syntaxCall {
	c := &syntaxCall{Pos: p.peek().Pos, Func: p.name()}
	p.i++ // "("
	switch {
	case p.op("*"):
		p.i++
		c.Star = true
	case p.kw("distinct"):
		p.i++
		c.Distinct = true
		c.Args = list(p, p.expr)
	case !callEnd(p.peek()):
		c.Args = list(p, p.expr)
	}
	if p.takeKw("per") {
		c.Per = list(p, p.ref)
		if p.takeKw("having") {
			c.Having = p.expr()
		}
	}
	if p.takeKw("as") {
		c.As = p.member()
	}
	if p.takeKw("from") {
		c.From = p.expr()
	}
	p.expectOp(")")
	return c
}
