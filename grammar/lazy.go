package grammar

import (
	"sync"

	"github.com/alecthomas/participle/v2/lexer"
)

// Measures parsed lazily: a large model held as syntax trees all at once
// took some 13 bytes of memory for each byte of source, most of it the
// measures' expressions (issue 17: a valid model near the size cap
// needed 2 GB to check). ParseLazy checks every declaration as Parse does
// but keeps of each measure only its name, options and where it starts;
// Expression parses the expression again when the resolver needs it, and
// the resolver drops the tree once the measure is resolved.

// lazySource is the text of a file parsed by ParseLazy, which its
// measures parse again.
type lazySource struct{ src string }

// ParseLazy is Parse (the same diagnostics, tables and views), except
// that the measures' expressions are not kept: each MeasureDecl's Expr is
// nil, and Expression parses it again from src when asked.
func ParseLazy(filename, src string) (*File, Diagnostics) {
	return parseFile(filename, src, true, &lazySource{src: src}, nil)
}

// reparser is the scratch space of Expression, reused through a pool so
// that parsing a million measures again does not allocate a token buffer
// and an arena for each.
type reparser struct {
	a   arena
	buf []lexer.Token
}

var reparsers = sync.Pool{New: func() any { return &reparser{} }}

// Expression is the measure's expression: Expr, or for a measure of
// ParseLazy its expression parsed again from the file's text (a new tree
// at each call, which the caller need not keep). The declaration parsed
// without error before, so it parses again to the same tree.
func (m *MeasureDecl) Expression() Expr {
	if m.lazy == nil {
		return m.Expr
	}
	rp := reparsers.Get().(*reparser)
	defer func() {
		rp.a.reset()
		reparsers.Put(rp)
	}()
	p := m.Pos
	d := declReader{
		sc:  &scanner{src: m.lazy.src, off: p.Offset, at: lexer.Position{Filename: p.File, Offset: p.Offset, Line: p.Line, Column: p.Col}},
		buf: rp.buf,
	}
	var diags Diagnostics
	chunk, ok := d.next(&diags)
	rp.buf = d.buf[:0]
	if !ok {
		return nil
	}
	if decl, ok := fastDecl(chunk, &rp.a); ok && decl.Measure != nil {
		return decl.Measure.Expr.expr()
	}
	sf, err := parseTokens(parser, chunk)
	if err != nil {
		return nil
	}
	for _, decl := range sf.Decls {
		if decl.Measure != nil {
			return decl.Measure.Expr.expr()
		}
	}
	return nil
}
