package grammar

import (
	"io"
	"strings"
	"unicode/utf8"

	"github.com/alecthomas/participle/v2/lexer"
)

// The lexer: a hand-written scanner for participle (a lexer.Definition).
// It yields the tokens the regular-expression rules below would, tried in
// this order at each place with the first that matches winning (as
// participle's rule lexer does), with the same positions; the rules are
// kept as a test oracle in scan_test.go, which checks the two agree on
// every model in testdata and on random and hostile text. A scanner costs
// a few nanoseconds a byte where the rules cost over a microsecond, which
// is what let a 64 MiB file take minutes (issue 17).
//
//	Comment      --[^\n]*
//	Whitespace   [ \t\r\n]+
//	QIdent       `[^`\n]+`
//	String       '(?:[^']|'')*'
//	DString      "(?:[^"\n]|"")*"
//	Number       (?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][+-]?[0-9]+)?
//	Keyword      (?i)(?:table|at|...)\b    (the keywords, in their order)
//	Ident        [A-Za-z_][A-Za-z0-9_]*
//	Op           ->|\|\||<=|>=|<>|!=|[-+*/=<>(){}\[\],;.]
//	Unterminated ['"`][^\n]*
//	Bad          .                         (one character, or one byte of invalid UTF-8)

// The token types; their names are those of the rules above.
const (
	tokComment lexer.TokenType = -(iota + 2)
	tokWhitespace
	tokQIdent
	tokString
	tokDString
	tokNumber
	tokKeyword
	tokIdent
	tokOp
	tokUnterminated
	tokBad
)

// scanDef is the lexer definition the parsers use.
type scanDef struct{}

var lexDef scanDef

// Symbols maps each token type's name to its type.
func (scanDef) Symbols() map[string]lexer.TokenType {
	return map[string]lexer.TokenType{
		"EOF": lexer.EOF, "Comment": tokComment, "Whitespace": tokWhitespace, "QIdent": tokQIdent,
		"String": tokString, "DString": tokDString, "Number": tokNumber, "Keyword": tokKeyword,
		"Ident": tokIdent, "Op": tokOp, "Unterminated": tokUnterminated, "Bad": tokBad,
	}
}

// Lex reads all of r and scans it.
func (d scanDef) Lex(filename string, r io.Reader) (lexer.Lexer, error) {
	b, err := io.ReadAll(r)
	if err != nil {
		return nil, err
	}
	return d.LexString(filename, string(b))
}

// LexString scans src.
func (scanDef) LexString(filename, src string) (lexer.Lexer, error) {
	return newScanner(filename, src), nil
}

// scanner yields the tokens of src, white space and comments included.
// It finds where tokens start and end without their positions; a
// position is worked out when asked for, from the last one asked for, so
// text that no one asks about (a declaration being skipped) costs only
// its scanning.
type scanner struct {
	src string
	off int            // where the next token starts
	at  lexer.Position // the position of offset at.Offset, at or before off
}

// span is one token: its type and where its text starts and ends.
type span struct {
	typ        lexer.TokenType
	start, end int
}

func newScanner(filename, src string) *scanner {
	return &scanner{src: src, at: lexer.Position{Filename: filename, Line: 1, Column: 1}}
}

// scan returns the next token, or an EOF span at the end.
func (s *scanner) scan() span {
	start := s.off
	if start >= len(s.src) {
		return span{lexer.EOF, start, start}
	}
	typ, n := scanToken(s.src[start:])
	s.off += n
	return span{typ, start, s.off}
}

// significant returns the next token that is not white space, a comment
// or a bad character (a byte order mark, once scanErrors has found no
// other).
func (s *scanner) significant() span {
	for {
		t := s.scan()
		switch t.typ {
		case tokWhitespace, tokComment, tokBad:
			continue
		}
		return t
	}
}

// posOf is the position of offset off, which must not be before the
// offset asked for last.
func (s *scanner) posOf(off int) lexer.Position {
	advance(&s.at, s.src[s.at.Offset:off])
	return s.at
}

// token is t as participle's token, with its position.
func (s *scanner) token(t span) lexer.Token {
	return lexer.Token{Type: t.typ, Value: s.src[t.start:t.end], Pos: s.posOf(t.start)}
}

// Next returns the next token, or the EOF token at the end. It never fails.
func (s *scanner) Next() (lexer.Token, error) {
	return s.token(s.scan()), nil
}

// advance moves p past text, as lexer.Position.Advance does (the column
// counts characters), in a few passes of the library's fast loops.
func advance(p *lexer.Position, text string) {
	p.Offset += len(text)
	if i := strings.LastIndexByte(text, '\n'); i >= 0 {
		p.Line += strings.Count(text, "\n")
		p.Column = 0 // the newline itself counts, as in Advance
		text = text[i:]
	}
	p.Column += utf8.RuneCountInString(text)
}

// scanToken is the type and length of the token at the start of s (not
// empty), by the rules above.
func scanToken(s string) (lexer.TokenType, int) {
	c := s[0]
	switch {
	case c == '-' && len(s) > 1 && s[1] == '-':
		return tokComment, lineEnd(s)
	case isSpace(c):
		n := 1
		for n < len(s) && isSpace(s[n]) {
			n++
		}
		return tokWhitespace, n
	case c == '`':
		n := 1
		for n < len(s) && s[n] != '`' && s[n] != '\n' {
			n++
		}
		if n > 1 && n < len(s) && s[n] == '`' {
			return tokQIdent, n + 1
		}
		return tokUnterminated, lineEnd(s)
	case c == '\'' || c == '"':
		if n := quoted(s, c == '"'); n > 0 {
			if c == '"' {
				return tokDString, n
			}
			return tokString, n
		}
		return tokUnterminated, lineEnd(s)
	case isDigit(c) || c == '.' && len(s) > 1 && isDigit(s[1]):
		return tokNumber, number(s)
	}
	if c == '_' || isLetter(c) {
		n := 1
		for n < len(s) && isWordByte(s[n]) {
			n++
		}
		// A word followed by ASCII (or nothing) is a keyword only as a
		// whole; otherwise the Kelvin sign or long s may make one.
		if n == len(s) || s[n] < utf8.RuneSelf {
			if isKeyword(s[:n]) {
				return tokKeyword, n
			}
			return tokIdent, n
		}
		if k := keyword(s); k > 0 {
			return tokKeyword, k
		}
		return tokIdent, n
	}
	if n := keyword(s); n > 0 {
		return tokKeyword, n
	}
	if n := operator(s); n > 0 {
		return tokOp, n
	}
	if c < utf8.RuneSelf {
		return tokBad, 1
	}
	_, n := utf8.DecodeRuneInString(s)
	return tokBad, n
}

func isSpace(c byte) bool    { return c == ' ' || c == '\t' || c == '\r' || c == '\n' }
func isDigit(c byte) bool    { return '0' <= c && c <= '9' }
func isLetter(c byte) bool   { return 'a' <= c|0x20 && c|0x20 <= 'z' }
func isWordByte(c byte) bool { return c == '_' || isDigit(c) || isLetter(c) }

// lineEnd is the length of s up to its first newline.
func lineEnd(s string) int {
	if n := strings.IndexByte(s, '\n'); n >= 0 {
		return n
	}
	return len(s)
}

// quoted is the length of the quoted text at the start of s (its quote
// doubled inside stands for itself; double quotes end at a newline), or 0
// when it is not closed. As the rules' backtracking does, an unclosed text
// that holds a doubled quote ends at the first quote of the last pair.
func quoted(s string, stopAtNewline bool) int {
	q := s[0]
	lastPair := -1
	for i := 1; i < len(s); i++ {
		switch c := s[i]; {
		case c == q && i+1 < len(s) && s[i+1] == q:
			lastPair = i
			i++
		case c == q:
			return i + 1
		case c == '\n' && stopAtNewline:
			return lastPair + 1
		}
	}
	return lastPair + 1
}

// number is the length of the number at the start of s.
func number(s string) int {
	i := 1
	for i < len(s) && isDigit(s[i]) {
		i++
	}
	if s[0] != '.' && i < len(s) && s[i] == '.' {
		i++
		for i < len(s) && isDigit(s[i]) {
			i++
		}
	}
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		j := i + 1
		if j < len(s) && (s[j] == '+' || s[j] == '-') {
			j++
		}
		k := j
		for k < len(s) && isDigit(s[k]) {
			k++
		}
		if k > j {
			i = k
		}
	}
	return i
}

// keywordsByLetter lists the keywords by their first letter, in the order
// of keywords (the order the rule's alternatives are tried in).
var keywordsByLetter = func() [26][]string {
	var by [26][]string
	for _, k := range keywords {
		by[k[0]-'a'] = append(by[k[0]-'a'], k)
	}
	return by
}()

// keyword is the length of the keyword at the start of s, or 0. Letters
// match in either case, as the rule's (?i) matches them: besides the
// ASCII letters, the Kelvin sign folds to k and the long s to s. The
// keyword must end at a word boundary (\b: an ASCII letter, digit or _ on
// exactly one side).
func keyword(s string) int {
	r, _ := utf8.DecodeRuneInString(s)
	first := foldLetter(r)
	if first == 0 {
		return 0
	}
next:
	for _, k := range keywordsByLetter[first-'a'] {
		j := 0
		var last rune
		for i := 0; i < len(k); i++ {
			if j >= len(s) {
				continue next
			}
			r, size := rune(s[j]), 1
			if r >= utf8.RuneSelf {
				r, size = utf8.DecodeRuneInString(s[j:])
			}
			if foldLetter(r) != k[i] {
				continue next
			}
			last, j = r, j+size
		}
		lastWord := last < utf8.RuneSelf && isWordByte(byte(last))
		if lastWord != (j < len(s) && isWordByte(s[j])) {
			return j
		}
	}
	return 0
}

// isKeyword says whether the ASCII word w is a keyword, in any case.
func isKeyword(w string) bool {
	if !isLetter(w[0]) {
		return false
	}
	for _, k := range keywordsByLetter[w[0]|0x20-'a'] {
		if len(k) == len(w) && strings.EqualFold(k, w) {
			return true
		}
	}
	return false
}

// foldLetter is the lower-case ASCII letter r folds to, or 0.
func foldLetter(r rune) byte {
	switch {
	case r < utf8.RuneSelf && isLetter(byte(r)):
		return byte(r) | 0x20
	case r == '\u212A': // Kelvin sign
		return 'k'
	case r == '\u017F': // long s
		return 's'
	}
	return 0
}

// operator is the length of the operator at the start of s, or 0.
func operator(s string) int {
	if len(s) >= 2 {
		switch s[:2] {
		case "->", "||", "<=", ">=", "<>", "!=":
			return 2
		}
	}
	switch s[0] {
	case '-', '+', '*', '/', '=', '<', '>', '(', ')', '{', '}', '[', ']', ',', ';', '.':
		return 1
	}
	return 0
}
