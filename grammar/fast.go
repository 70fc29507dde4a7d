package grammar

import (
	"strings"

	"github.com/alecthomas/participle/v2/lexer"
)

// The fast path: a hand-written recursive-descent parser of one
// declaration that builds the very syntax structs participle builds from
// syntax.go's grammar, at a small fraction of the cost (participle tries
// every alternative through reflection and copies its parse context for
// each; on a large model that was over 95% of the time).
//
// It only accepts: at each choice it looks at the next token or two to
// pick the one alternative that can match (the grammar's alternatives
// start with different tokens, or differ in the second: a call's name is
// followed by "("), and if that alternative then fails it declines the
// whole declaration, which participle then parses as before, so that
// every message, position and recovery stays participle's. Where it
// accepts, participle takes the same choices (it tries alternatives in
// order and the earlier ones fail on their first token) and builds the
// same structs: TestFastPathMatchesParticiple and FuzzFastPath check
// this on every model of the repository and on random and mutated ones.

// declined is the panic value with which the fast path gives up.
type declined struct{}

// fastParser parses the tokens of one declaration, ending in EOF.
type fastParser struct {
	toks []lexer.Token
	i    int
	a    *arena
}

// arena allocates the structs of the expression levels in blocks, one
// allocation for many (an operand passes through ten levels), and reuses
// them for the next declaration once the syntax tree has been converted
// (the tree of ast.go keeps no pointer into it).
type arena struct {
	exprs    slab[syntaxExpr]
	ors      slab[syntaxOr]
	ands     slab[syntaxAnd]
	nots     slab[syntaxNot]
	cmps     slab[syntaxCmp]
	sums     slab[syntaxSum]
	sumOps   slab[syntaxSumOp]
	products slab[syntaxProduct]
	prodOps  slab[syntaxProductOp]
	unaries  slab[syntaxUnary]
	postfix  slab[syntaxPostfix]
	primary  slab[syntaxPrimary]
	refs     slab[syntaxRef]
	names    slab[syntaxName]
	members  slab[syntaxMember]
	strs     slab[string]
}

// reset makes every struct handed out free for reuse.
func (a *arena) reset() {
	a.exprs.reset()
	a.ors.reset()
	a.ands.reset()
	a.nots.reset()
	a.cmps.reset()
	a.sums.reset()
	a.sumOps.reset()
	a.products.reset()
	a.prodOps.reset()
	a.unaries.reset()
	a.postfix.reset()
	a.primary.reset()
	a.refs.reset()
	a.names.reset()
	a.members.reset()
	a.strs.reset()
}

// slab hands out pointers into blocks of T.
type slab[T any] struct {
	blocks [][]T
	b, n   int // the block in use and how many of its elements are used
}

func (s *slab[T]) new() *T {
	if s.b < len(s.blocks) && s.n == len(s.blocks[s.b]) {
		s.b, s.n = s.b+1, 0
	}
	if s.b == len(s.blocks) {
		s.blocks = append(s.blocks, make([]T, 64))
	}
	s.n++
	return &s.blocks[s.b][s.n-1]
}

// reset zeroes the elements handed out and starts again at the first.
func (s *slab[T]) reset() {
	for i := 0; i < s.b; i++ {
		clear(s.blocks[i])
	}
	if s.b < len(s.blocks) {
		clear(s.blocks[s.b][:s.n])
	}
	s.b, s.n = 0, 0
}

// fastDecl parses toks (one declaration and EOF) and says whether it
// could; when it could not, nothing is known about the input.
func fastDecl(toks []lexer.Token, a *arena) (*syntaxDecl, bool) {
	p := &fastParser{toks: toks, a: a}
	return attempt(p.decl, p.end)
}

// fastExpr parses toks (one expression and EOF) likewise.
func fastExpr(toks []lexer.Token) (*syntaxExpr, bool) {
	p := &fastParser{toks: toks, a: &arena{}}
	return attempt(p.expr, p.end)
}

// attempt runs parse and then end, and says whether neither declined.
func attempt[T any](parse func() *T, end func()) (v *T, ok bool) {
	defer func() {
		if r := recover(); r != nil {
			if _, is := r.(declined); !is {
				panic(r)
			}
			v, ok = nil, false
		}
	}()
	v = parse()
	end()
	return v, true
}

// list parses item ("," item)*.
func list[T any](p *fastParser, item func() T) []T {
	out := []T{item()}
	for p.op(",") {
		p.i++
		out = append(out, item())
	}
	return out
}

func (p *fastParser) end() {
	if p.peek().Type != lexer.EOF {
		panic(declined{})
	}
}

func (p *fastParser) peek() *lexer.Token { return &p.toks[p.i] }

// peek2 is the token after the next one.
func (p *fastParser) peek2() *lexer.Token {
	if p.i+1 < len(p.toks) {
		return &p.toks[p.i+1]
	}
	return &p.toks[len(p.toks)-1]
}

// take returns the next token and moves past it (never past EOF).
func (p *fastParser) take() *lexer.Token {
	t := &p.toks[p.i]
	if t.Type != lexer.EOF {
		p.i++
	}
	return t
}

// isKw says whether t is the keyword kw (lower case), as participle's
// case-insensitive literal matches it.
func isKw(t *lexer.Token, kw string) bool {
	return t.Type == tokKeyword && strings.EqualFold(t.Value, kw)
}

func isOp(t *lexer.Token, op string) bool { return t.Type == tokOp && t.Value == op }

func isName(t *lexer.Token) bool { return t.Type == tokIdent || t.Type == tokQIdent }

func (p *fastParser) kw(kw string) bool { return isKw(p.peek(), kw) }

// takeKw moves past the keyword kw if it is next, and says whether it was.
func (p *fastParser) takeKw(kw string) bool {
	if p.kw(kw) {
		p.i++
		return true
	}
	return false
}

func (p *fastParser) op(op string) bool { return isOp(p.peek(), op) }

// expectKw and expectOp move past the keyword or operator, or decline.
func (p *fastParser) expectKw(kw string) {
	if !p.takeKw(kw) {
		panic(declined{})
	}
}

func (p *fastParser) expectOp(op string) {
	if !p.op(op) {
		panic(declined{})
	}
	p.i++
}

// text returns the next token's text if it has type typ, or declines.
func (p *fastParser) text(typ lexer.TokenType) string {
	t := p.peek()
	if t.Type != typ {
		panic(declined{})
	}
	p.i++
	return t.Value
}

func (p *fastParser) str(s string) *string {
	v := p.a.strs.new()
	*v = s
	return v
}

// word moves past the next token if it is a name (or a keyword, if
// keyword is set) and returns it, or declines.
func (p *fastParser) word(keyword bool) *lexer.Token {
	t := p.peek()
	if !isName(t) && (!keyword || t.Type != tokKeyword) {
		panic(declined{})
	}
	p.i++
	return t
}

func (p *fastParser) name() *syntaxName {
	t := p.word(false)
	n := p.a.names.new()
	n.Pos, n.Text = t.Pos, t.Value
	return n
}

func (p *fastParser) member() *syntaxMember {
	t := p.word(true)
	m := p.a.members.new()
	m.Pos, m.Text = t.Pos, t.Value
	return m
}

func (p *fastParser) ref() *syntaxRef {
	r := p.a.refs.new()
	r.Pos = p.peek().Pos
	r.First = p.name()
	if p.op(".") {
		p.i++
		r.Second = p.member()
	}
	return r
}

func (p *fastParser) dstring() *syntaxString {
	pos := p.peek().Pos
	return &syntaxString{Pos: pos, Text: p.text(tokDString)}
}

func (p *fastParser) decl() *syntaxDecl {
	switch t := p.peek(); {
	case isKw(t, "table"):
		return &syntaxDecl{Table: p.table()}
	case isKw(t, "measure"):
		return &syntaxDecl{Measure: p.measure()}
	case isKw(t, "view"):
		return &syntaxDecl{View: p.view()}
	}
	panic(declined{})
}

func (p *fastParser) table() *syntaxTable {
	t := &syntaxTable{Pos: p.take().Pos, Name: p.name()}
	if p.takeKw("at") {
		t.At = p.dstring()
	}
	if p.takeKw("from") {
		t.From = p.dstring()
	}
	if p.takeKw("with") {
		p.expectKw("null")
		t.Nulls = list(p, p.dstring)
	}
	p.expectOp("{")
	for !p.op("}") {
		t.Items = append(t.Items, p.item())
	}
	p.i++
	return t
}

func (p *fastParser) item() *syntaxItem {
	t := p.peek()
	it := &syntaxItem{Pos: t.Pos}
	switch {
	case isKw(t, "key"):
		p.i++
		it.Key = list(p, p.name)
	case isKw(t, "link"):
		it.Link = p.link()
	case isName(t):
		it.Column = p.column()
	default:
		panic(declined{})
	}
	return it
}

func (p *fastParser) link() *syntaxLink {
	l := &syntaxLink{Pos: p.take().Pos}
	p.expectOp("(")
	l.From = list(p, p.name)
	p.expectOp(")")
	p.expectOp("->")
	l.Table = p.name()
	p.expectOp("(")
	l.To = list(p, p.name)
	p.expectOp(")")
	if p.takeKw("required") {
		l.Required = true
	}
	return l
}

func (p *fastParser) column() *syntaxColumn {
	c := &syntaxColumn{Pos: p.peek().Pos, Name: p.name()}
	if p.op("=") {
		p.i++
		c.Expr = p.expr()
	} else {
		c.Type = p.member()
	}
	for {
		t := p.peek()
		o := &syntaxOption{Pos: t.Pos}
		switch {
		case isOp(t, "->"):
			p.i++
			o.Link = &syntaxLinkOption{Pos: t.Pos, Target: p.ref()}
			if p.takeKw("required") {
				o.Link.Required = true
			}
		case isKw(t, "additive"):
			p.i++
			o.Additive = true
		case isKw(t, "nonadditive"):
			p.i++
			o.Nonadditive = true
		case isKw(t, "semiadditive"):
			p.i++
			p.expectOp("(")
			o.Semi = p.ref()
			p.expectOp(")")
		default:
			return c
		}
		c.Options = append(c.Options, o)
	}
}

func (p *fastParser) measure() *syntaxMeasure {
	m := &syntaxMeasure{Pos: p.take().Pos, Name: p.name()}
	p.expectOp("=")
	m.Expr = p.expr()
	if p.takeKw("format") {
		m.Format = p.name()
	}
	if p.peek().Type == tokDString {
		m.Doc = p.dstring()
	}
	return m
}

func (p *fastParser) view() *syntaxView {
	v := &syntaxView{Pos: p.take().Pos, Name: p.name()}
	p.expectOp("=")
	v.Measures = list(p, p.name)
	p.expectKw("by")
	v.By = list(p, p.ref)
	if p.takeKw("where") {
		v.Where = p.expr()
	}
	if p.kw("with") {
		v.Totals = &syntaxTotals{Pos: p.take().Pos, With: true}
		p.expectKw("totals")
		if isName(p.peek()) {
			v.Totals.Mode = p.name()
		}
	}
	return v
}
