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
	// MaxSourceBytes is the largest model file accepted.
	MaxSourceBytes = 64 << 20
	// MaxNesting is the deepest nesting of parentheses and brackets.
	MaxNesting = 64
)

// EBNF returns the grammar in EBNF, as participle prints it.
func EBNF() string { return parser.String() }

var symbols = lexDef.Symbols()

// Parse parses one model file. It reports every syntax error it can find:
// after an error it resumes at the next top-level declaration (a line's
// `table`, `measure` or `view`).
func Parse(filename, src string) (*File, Diagnostics) {
	f := &File{Name: filename}
	var diags Diagnostics
	if len(src) > MaxSourceBytes {
		diags.Errorf(Pos{File: filename}, "too-large",
			"the file is %d bytes; the largest model file accepted is %d bytes", len(src), MaxSourceBytes)
		return f, diags
	}
	toks, ok := lexAll(filename, src, &diags)
	if !ok {
		return f, diags
	}
	for _, chunk := range splitDecls(toks) {
		if !checkChunk(chunk, &diags) {
			continue
		}
		eof := lexer.EOFToken(chunk[len(chunk)-1].Pos)
		eof.Pos.Offset += len(chunk[len(chunk)-1].Value)
		eof.Pos.Column += len(chunk[len(chunk)-1].Value)
		withEOF := append(chunk[:len(chunk):len(chunk)], eof)
		pl, err := lexer.Upgrade(&sliceLexer{toks: withEOF})
		if err != nil {
			diags.Errorf(pos(chunk[0].Pos), "syntax", "%v", err)
			continue
		}
		sf, err := parseChunk(pl)
		if err != nil {
			diags.Add(syntaxDiag(err, chunk[0].Pos))
			continue
		}
		for _, d := range sf.Decls {
			d.addTo(f)
		}
	}
	return f, diags
}

// lexAll tokenises src, dropping white space and comments, and reports
// characters that start no token, unterminated quotes, and NUL bytes or
// invalid UTF-8 inside quotes (which no engine would read as written). A
// UTF-8 byte order mark at the start is skipped. It records at most
// MaxPrinted-1 such errors and then one that counts the rest, and keeps no tokens once
// one is found, so that a file of random bytes costs no more than its
// size.
func lexAll(filename, src string, diags *Diagnostics) ([]lexer.Token, bool) {
	lx, err := lexDef.LexString(filename, src)
	if err != nil {
		diags.Errorf(Pos{File: filename}, "syntax", "%v", err)
		return nil, false
	}
	var toks []lexer.Token
	errs, more := 0, 0
	var morePos Pos
	report := func(p lexer.Position, format string, args ...any) *Diagnostic {
		errs++
		if errs >= MaxPrinted { // the last place is for the count
			if more == 0 {
				morePos = pos(p)
			}
			more++
			return &Diagnostic{} // counted, not kept
		}
		return diags.Errorf(pos(p), "syntax", format, args...)
	}
	for {
		t, err := lx.Next()
		if err != nil {
			diags.Errorf(Pos{File: filename}, "syntax", "%v", err)
			return nil, false
		}
		if t.EOF() {
			break
		}
		switch t.Type {
		case symbols["Whitespace"], symbols["Comment"]:
			continue
		case symbols["Unterminated"]:
			q := t.Value[:1]
			report(t.Pos, "unterminated %s", quoteKind(q)).Suggestion =
				fmt.Sprintf("close it with %s on the same line", q)
			continue
		case symbols["Bad"]:
			if t.Pos.Offset == 0 && t.Value == "\uFEFF" {
				continue // a byte order mark
			}
			report(t.Pos, "unexpected character %q", t.Value).Suggestion =
				"strings are written in single quotes, names with letters, digits and _ (or in backquotes)"
			continue
		case symbols["String"], symbols["QIdent"], symbols["DString"]:
			if at, what := badText(t.Value); at >= 0 {
				p := t.Pos
				p.Advance(t.Value[:at])
				report(p, "%s inside a %s", what, quoteKind(t.Value[:1])).Suggestion =
					"remove it: no warehouse engine reads it as written"
				continue
			}
		}
		if errs == 0 {
			toks = append(toks, t)
		}
	}
	if more > 0 {
		diags.Errorf(morePos, "too-many", "%d more errors like the ones above from here on are not listed", more).Suggestion =
			"is this a model file? fix the first errors and check again"
	}
	if errs > 0 {
		return nil, false
	}
	return toks, true
}

// badText finds the first NUL byte or invalid UTF-8 sequence in s: its
// byte offset and what it is, or -1.
func badText(s string) (int, string) {
	for i, r := range s {
		switch {
		case r == 0:
			return i, "a NUL byte"
		case r == utf8.RuneError:
			if _, size := utf8.DecodeRuneInString(s[i:]); size == 1 {
				return i, fmt.Sprintf("invalid UTF-8 (byte 0x%02X)", s[i])
			}
		}
	}
	return -1, ""
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

// splitDecls cuts the token stream before each `table`, `measure` and
// `view` keyword (they cannot appear inside a declaration, except after a
// dot), so that one bad declaration does not hide errors in the ones after
// it.
func splitDecls(toks []lexer.Token) [][]lexer.Token {
	var chunks [][]lexer.Token
	start := 0
	for i, t := range toks {
		if i > start && t.Type == symbols["Keyword"] && isDeclKeyword(t.Value) &&
			!(toks[i-1].Type == symbols["Op"] && toks[i-1].Value == ".") {
			chunks = append(chunks, toks[start:i])
			start = i
		}
	}
	if start < len(toks) {
		chunks = append(chunks, toks[start:])
	}
	return chunks
}

func isDeclKeyword(v string) bool {
	return strings.EqualFold(v, "table") || strings.EqualFold(v, "measure") || strings.EqualFold(v, "view")
}

// checkChunk rejects nesting deeper than MaxNesting before the recursive
// parser sees it.
func checkChunk(chunk []lexer.Token, diags *Diagnostics) bool {
	depth := 0
	for _, t := range chunk {
		if t.Type != symbols["Op"] {
			continue
		}
		switch t.Value {
		case "(", "[", "{":
			depth++
			if depth > MaxNesting {
				diags.Errorf(pos(t.Pos), "too-deep",
					"expressions nest more than %d levels deep here", MaxNesting).Suggestion =
					"split the expression into several measures or derived columns"
				return false
			}
		case ")", "]", "}":
			depth--
		}
	}
	return true
}

// parseChunk parses one declaration; a panic inside the parser library
// becomes an error at the declaration rather than a crash.
func parseChunk(pl *lexer.PeekingLexer) (sf *syntaxFile, err error) {
	defer func() {
		if r := recover(); r != nil {
			err = fmt.Errorf("the parser failed on this declaration (%v)", r)
		}
	}()
	return parser.ParseFromLexer(pl)
}

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
func ParseExpr(name, src string) (Expr, Diagnostics) {
	var diags Diagnostics
	if len(src) > MaxSourceBytes {
		diags.Errorf(Pos{File: name}, "too-large", "the expression is too long")
		return nil, diags
	}
	toks, ok := lexAll(name, src, &diags)
	if !ok {
		return nil, diags
	}
	if len(toks) == 0 {
		diags.Errorf(Pos{File: name, Line: 1, Col: 1}, "syntax", "empty expression")
		return nil, diags
	}
	if !checkChunk(toks, &diags) {
		return nil, diags
	}
	last := toks[len(toks)-1]
	eof := lexer.EOFToken(last.Pos)
	eof.Pos.Offset += len(last.Value)
	eof.Pos.Column += len(last.Value)
	pl, err := lexer.Upgrade(&sliceLexer{toks: append(toks, eof)})
	if err == nil {
		var se *syntaxExpr
		if se, err = parseExprSafely(pl); err == nil {
			return se.expr(), nil
		}
	}
	diags.Add(syntaxDiag(err, toks[0].Pos))
	return nil, diags
}

func parseExprSafely(pl *lexer.PeekingLexer) (se *syntaxExpr, err error) {
	defer func() {
		if r := recover(); r != nil {
			err = fmt.Errorf("the parser failed on this expression (%v)", r)
		}
	}()
	return exprParser.ParseFromLexer(pl)
}
