package grammar

import (
	"errors"
	"fmt"
	"io"
	"regexp"
	"strings"
	"unicode/utf8"

	"github.com/alecthomas/participle/v2"
	"github.com/alecthomas/participle/v2/lexer"
)

// Limits that keep hostile input from exhausting the machine.
const (
	// MaxSourceBytes is the largest model file accepted (16 MiB), and
	// the command line's cap on all the files of a model together: a
	// valid model of that size (a quarter of a million measures) is
	// checked within 5 s of CPU and 500 MB (docs/cli.md, "Safety").
	MaxSourceBytes = 16 << 20
	// MaxNesting is the deepest nesting of parentheses and brackets.
	MaxNesting = 64
)

// EBNF returns the grammar in EBNF, as participle prints it.
func EBNF() string { return parser.String() }

// Parse parses one model file. It reports every syntax error it can find:
// after an error it resumes at the next top-level declaration (a line's
// `table`, `measure` or `view`).
//
// The work is linear in the file's size with a small constant, whatever
// it holds: the file is scanned once for characters and quotes the
// language does not accept (if there are any, only those are reported),
// then again, one declaration at a time, each handed to the parser as
// soon as its last token is read; after MaxPrinted-1 errors the rest is
// not parsed. A declaration nesting deeper than
// MaxNesting or longer than MaxDeclTokens is refused before the parser
// sees it, so no more than MaxDeclTokens tokens are held at once.
func Parse(filename, src string) (*File, Diagnostics) {
	return parseFile(filename, src, true, nil, nil)
}

// parseFile is Parse, with the fast path (fast.go) tried on each
// declaration before participle when fast is set, and the measures'
// expressions left to be parsed again from lazy when it is set
// (ParseLazy), counting the tables and views against their limits in
// count when it is not nil (ParseLazyIn).
func parseFile(filename, src string, fast bool, lazy *lazySource, count *Declared) (*File, Diagnostics) {
	f := &File{Name: filename}
	var diags Diagnostics
	if len(src) > MaxSourceBytes {
		diags.Errorf(Pos{File: filename}, "too-large",
			"the file is %d bytes; the largest model file accepted is %d bytes", len(src), MaxSourceBytes)
		return f, diags
	}
	if !scanErrors(filename, src, &diags) {
		return f, diags
	}
	d := declReader{sc: newScanner(filename, src)}
	var a arena
	for {
		if len(diags) >= MaxPrinted-1 && d.started && d.ahead.typ != lexer.EOF {
			diags.Errorf(pos(d.sc.posOf(d.ahead.start)), "too-many",
				"the file is not parsed from here on, after %d syntax errors", len(diags)).Suggestion =
				tooManyHint
			return f, diags
		}
		chunk, ok := d.next(&diags)
		if chunk == nil {
			return f, diags
		}
		if !ok {
			continue
		}
		if fast {
			decl, ok := fastDecl(chunk, &a)
			if ok && !count.admit(decl, chunk, &diags) {
				return f, diags
			}
			if ok {
				decl.addTo(f, lazy)
			}
			a.reset()
			if ok {
				continue
			}
		}
		sf, err := parseTokens(parser, chunk)
		if err != nil {
			diags.Add(syntaxDiag(err, chunk[0].Pos))
			continue
		}
		for _, decl := range sf.Decls {
			if !count.admit(decl, chunk, &diags) {
				return f, diags
			}
			decl.addTo(f, lazy)
		}
	}
}

// tooManyHint is the hint of the diagnostic that stands for the errors
// not listed.
const tooManyHint = "is this a model file? fix the first errors and check again"

// MaxDeclTokens is the most tokens one declaration may have (a table of
// some ten thousand columns has half as many).
const MaxDeclTokens = 1 << 17

// scanErrors reports characters that start no token, unterminated quotes,
// and NUL bytes or invalid UTF-8 inside quotes (which no engine would read
// as written), and says whether there were none. A UTF-8 byte order mark
// at the start is skipped. It records at most MaxPrinted-1 errors and then
// one that counts the rest, so that a file of random bytes costs no more
// than its size.
func scanErrors(filename, src string, diags *Diagnostics) bool {
	sc := newScanner(filename, src)
	errs, more := 0, 0
	var morePos Pos
	// keep counts an error at offset off and says whether to record it
	// (its message is not even formatted when it is only counted).
	keep := func(off int) bool {
		if errs++; errs < MaxPrinted { // the last place is for the count
			return true
		}
		if more == 0 {
			morePos = pos(sc.posOf(off))
		}
		more++
		return false
	}
	for {
		t := sc.scan()
		text := src[t.start:t.end]
		switch t.typ {
		case lexer.EOF:
			if more > 0 {
				diags.Errorf(morePos, "too-many", "%d more errors like the ones above from here on are not listed", more).Suggestion =
					tooManyHint
			}
			return errs == 0
		case tokUnterminated:
			if keep(t.start) {
				diags.Errorf(pos(sc.posOf(t.start)), "syntax", "unterminated %s", quoteKind(text[:1])).Suggestion =
					fmt.Sprintf("close it with %s on the same line", text[:1])
			}
		case tokBad:
			if t.start == 0 && text == "\uFEFF" {
				continue // a byte order mark
			}
			if keep(t.start) {
				diags.Errorf(pos(sc.posOf(t.start)), "syntax", "unexpected character %q", text).Suggestion =
					"strings are written in single quotes, names with letters, digits and _ (or in backquotes)"
			}
		case tokString, tokQIdent, tokDString:
			if at := badText(text); at >= 0 && keep(t.start+at) {
				p := sc.posOf(t.start)
				p.Advance(text[:at])
				diags.Errorf(pos(p), "syntax", "%s inside a %s", badByte(text[at]), quoteKind(text[:1])).Suggestion =
					"remove it: no warehouse engine reads it as written"
			}
		}
	}
}

// badText is the byte offset of the first NUL byte or invalid UTF-8
// sequence in s, or -1.
func badText(s string) int {
	for i, r := range s {
		if r == 0 {
			return i
		}
		if r == utf8.RuneError {
			if _, size := utf8.DecodeRuneInString(s[i:]); size == 1 {
				return i
			}
		}
	}
	return -1
}

// badByte says what the byte badText found is.
func badByte(c byte) string {
	if c == 0 {
		return "a NUL byte"
	}
	return fmt.Sprintf("invalid UTF-8 (byte 0x%02X)", c)
}

func quoteKind(q string) string {
	switch q {
	case "'":
		return "string"
	case "`":
		return "quoted name"
	}
	return "double-quoted text"
}

// declReader cuts the token stream before each `table`, `measure` and
// `view` keyword (they cannot appear inside a declaration, except after a
// dot), so that one bad declaration does not hide errors in the ones after
// it.
type declReader struct {
	sc      *scanner
	buf     []lexer.Token
	ahead   span // the first token of the next declaration
	started bool
}

// next returns the tokens of the next declaration followed by an EOF
// token, and whether it may be parsed: a declaration nesting deeper than
// MaxNesting or longer than MaxDeclTokens is reported and skipped (the
// rest of it only scanned). It returns nil at the end of the file. The
// tokens are valid until the next call.
func (d *declReader) next(diags *Diagnostics) ([]lexer.Token, bool) {
	if !d.started {
		d.ahead, d.started = d.sc.significant(), true
	}
	if d.ahead.typ == lexer.EOF {
		return nil, false
	}
	d.buf = d.buf[:0]
	first := d.sc.posOf(d.ahead.start)
	var lim limits
	ok, afterDot := true, false
	for i, t := 0, d.ahead; ; i, t = i+1, d.sc.significant() {
		text := d.sc.src[t.start:t.end]
		if t.typ == lexer.EOF || i > 0 && !afterDot && t.typ == tokKeyword && isDeclKeyword(text) {
			d.ahead = t
			break
		}
		afterDot = t.typ == tokOp && text == "."
		if !ok {
			continue
		}
		tok := d.sc.token(t)
		if ok = lim.check(tok, first, diags); ok {
			if len(d.buf) == cap(d.buf) { // doubling (append grows a large slice by a quarter), with room for EOF
				d.buf = append(make([]lexer.Token, 0, min(2*cap(d.buf)+64, MaxDeclTokens+1)), d.buf...)
			}
			d.buf = append(d.buf, tok)
		}
	}
	if !ok {
		return d.buf, false
	}
	return withEOF(d.buf), true
}

// withEOF appends an EOF token just after the last of toks (not empty).
func withEOF(toks []lexer.Token) []lexer.Token {
	last := toks[len(toks)-1]
	eof := lexer.EOFToken(last.Pos)
	eof.Pos.Offset += len(last.Value)
	eof.Pos.Column += len(last.Value)
	return append(toks, eof)
}

// limits follows the depth of parentheses and brackets and the number of
// tokens of one declaration or expression, so that nesting deeper than
// MaxNesting and more than MaxDeclTokens tokens are refused before the
// recursive parser sees them.
type limits struct{ depth, tokens int }

// check counts t, the next token after first, and reports an error and
// returns false when it goes past a limit.
func (l *limits) check(t lexer.Token, first lexer.Position, diags *Diagnostics) bool {
	if l.tokens++; l.tokens > MaxDeclTokens {
		diags.Errorf(pos(first), "too-long", "this declaration has more than %d tokens", MaxDeclTokens).Suggestion =
			"split it into several declarations"
		return false
	}
	if t.Type != tokOp {
		return true
	}
	switch t.Value {
	case "(", "[", "{":
		if l.depth++; l.depth > MaxNesting {
			diags.Errorf(pos(t.Pos), "too-deep",
				"expressions nest more than %d levels deep here", MaxNesting).Suggestion =
				"split the expression into several measures or derived columns"
			return false
		}
	case ")", "]", "}":
		l.depth--
	}
	return true
}

func isDeclKeyword(v string) bool {
	return strings.EqualFold(v, "table") || strings.EqualFold(v, "measure") || strings.EqualFold(v, "view")
}

// parseTokens parses tokens (ending in EOF) with p; a panic inside the
// parser library becomes an error at the tokens' start rather than a
// crash.
func parseTokens[T any](p *participle.Parser[T], toks []lexer.Token) (v *T, err error) {
	defer func() {
		if r := recover(); r != nil {
			err = fmt.Errorf("the parser failed here (%v)", r)
		}
	}()
	pl, err := lexer.Upgrade(&sliceLexer{toks: toks})
	if err != nil {
		return nil, err
	}
	return p.ParseFromLexer(pl)
}

// sliceLexer hands tokens already scanned to the parser.
type sliceLexer struct {
	toks []lexer.Token
	i    int
}

func (s *sliceLexer) Next() (lexer.Token, error) {
	if s.i >= len(s.toks) {
		return s.toks[len(s.toks)-1], nil
	}
	t := s.toks[s.i]
	s.i++
	return t, nil
}

var productionNames = strings.NewReplacer(
	"SyntaxExpr", "an expression", "SyntaxOr", "an expression", "SyntaxAnd", "an expression",
	"SyntaxNot", "an expression", "SyntaxCmp", "an expression", "SyntaxSum", "a value",
	"SyntaxProduct", "a value", "SyntaxUnary", "a value", "SyntaxPostfix", "a value",
	"SyntaxPrimary", "a value", "SyntaxName", "a name", "SyntaxMember", "a name",
	"SyntaxRef", "table.column", "SyntaxString", `a "double-quoted" text`,
	"SyntaxItem", "a column, key or link", "SyntaxEdit", "a cell edit",
	"SyntaxDecl", "table, measure or view", "SyntaxOption", "a column option",
	"<ident>", "a name", "<qident>", "a name", "<keyword>", "a keyword", "<dstring>", `a "double-quoted" text`,
	"<string>", "a 'string'", "<number>", "a number", "<eof>", "the end of the declaration",
)

var (
	tokenRe    = regexp.MustCompile(`unexpected token "([^"]*)"`)
	expectedRe = regexp.MustCompile(`^(.*?) \(expected (.*)\)$`)
	// firstExpected keeps the first thing participle expected, not the
	// whole rest of the production.
	firstExpected = regexp.MustCompile(`^("[^"]*"|a "double-quoted" text|table\.column|a 'string'|(an? |the )?[a-z, ]+[a-z])`)
)

func syntaxDiag(err error, start lexer.Position) *Diagnostic {
	var perr participle.Error
	p := start
	msg := err.Error()
	if errors.As(err, &perr) {
		p = perr.Position()
		msg = perr.Message()
	}
	msg = productionNames.Replace(msg)
	if m := tokenRe.FindStringSubmatch(msg); m != nil && m[1] == "<EOF>" {
		msg = strings.Replace(msg, `unexpected token "<EOF>"`, "unexpected end of declaration", 1)
	}
	if m := expectedRe.FindStringSubmatch(msg); m != nil {
		if first := firstExpected.FindString(m[2]); first != "" {
			msg = m[1] + " (expected " + first + ")"
		}
	}
	d := &Diagnostic{Pos: pos(p), Severity: Error, Code: "syntax", Message: "syntax error: " + msg}
	if strings.Contains(msg, `"`) && keywordToken(msg) {
		d.Suggestion = "a keyword cannot be a name; write it in backquotes, for example `order`"
	}
	return d
}

func keywordToken(msg string) bool {
	m := tokenRe.FindStringSubmatch(msg)
	if m == nil {
		return false
	}
	for _, k := range keywords {
		if strings.EqualFold(k, m[1]) && strings.Contains(msg, "a name") {
			return true
		}
	}
	return false
}

// ParseReader reads and parses one model file.
func ParseReader(filename string, r io.Reader) (*File, Diagnostics) {
	b, err := io.ReadAll(io.LimitReader(r, MaxSourceBytes+1))
	if err != nil {
		var d Diagnostics
		d.Errorf(Pos{File: filename}, "read", "cannot read the file: %v", err)
		return &File{Name: filename}, d
	}
	return Parse(filename, string(b))
}

var exprParser = participle.MustBuild[syntaxExpr](
	participle.Lexer(lexDef),
	participle.CaseInsensitive("Keyword"),
	participle.Elide("Comment", "Whitespace"),
	participle.UseLookahead(3),
)

// ParseExpr parses one expression given outside a model file (a --where
// filter on the command line, say). name labels positions in messages.
func ParseExpr(name, src string) (Expr, Diagnostics) { return parseExpr(name, src, true) }

// parseExpr is ParseExpr, with the fast path tried first when fast is set.
func parseExpr(name, src string, fast bool) (Expr, Diagnostics) {
	var diags Diagnostics
	if len(src) > MaxSourceBytes {
		diags.Errorf(Pos{File: name}, "too-large", "the expression is too long")
		return nil, diags
	}
	if !scanErrors(name, src, &diags) {
		return nil, diags
	}
	sc := newScanner(name, src)
	var toks []lexer.Token
	var lim limits
	var first lexer.Position
	for t := sc.significant(); t.typ != lexer.EOF; t = sc.significant() {
		tok := sc.token(t)
		if len(toks) == 0 {
			first = tok.Pos
		}
		if !lim.check(tok, first, &diags) {
			return nil, diags
		}
		toks = append(toks, tok)
	}
	if len(toks) == 0 {
		diags.Errorf(Pos{File: name, Line: 1, Col: 1}, "syntax", "empty expression")
		return nil, diags
	}
	toks = withEOF(toks)
	if fast {
		if se, ok := fastExpr(toks); ok {
			return se.expr(), nil
		}
	}
	se, err := parseTokens(exprParser, toks)
	if err == nil {
		return se.expr(), nil
	}
	diags.Add(syntaxDiag(err, toks[0].Pos))
	return nil, diags
}
