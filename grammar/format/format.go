// Package format lays a model file out in rollwise's one canonical way,
// the layout `rollwise fmt` writes and the language server's formatting
// returns:
//
//   - every declaration starts a line of its own; a table is set off by a
//     blank line from what comes before and after it, and so is a change
//     from measures to views; consecutive measures (or views) keep at most
//     one of the blank lines written between them, which group them;
//   - a table's items (key, links, columns) have a line each, indented by
//     two spaces, and the closing brace a line of its own;
//   - consecutive one-line columns, measures and views are aligned in
//     column blocks (name, type or "= expression", options or format and
//     description, trailing comment), as a block of a tab writer is: a
//     blank line or an entry that spans lines ends the block;
//   - tokens are separated by one space, except around "." and inside
//     parentheses and brackets, before "," and ";", between a function and
//     its "(" and after a unary minus;
//   - keywords are lower case (a keyword after a dot is a column's name
//     and is kept as written);
//   - comments stay where they were: at the end of their line, or on a
//     line of their own before what they preceded;
//   - line breaks written inside a declaration are kept (at most one blank
//     line in a row), and the continuation lines are indented two spaces
//     past the declaration, plus two for each parenthesis, bracket or case
//     they are inside.
//
// The formatter changes only white space and the case of keywords: the
// tokens of the file, comments included, stay the same and in the same
// order, so the model means what it meant. Formatting is idempotent.
package format

import (
	"strings"
	"unicode/utf8"

	"github.com/rollwise/rollwise/grammar"
)

// Source formats one model file. When src does not parse it returns the
// parse errors (with their file:line:col) and no text.
func Source(filename, src string) (string, grammar.Diagnostics) {
	f, diags := grammar.Parse(filename, src)
	if diags.HasErrors() {
		return "", diags.Errors()
	}
	p := &printer{toks: lex(filename, src)}
	p.segment(f)
	return p.print(), nil
}

// tok is a token with where it ends and how it reads.
type tok struct {
	grammar.Token
	off     int  // byte offset of its first character
	endLine int  // the line of its last character
	member  bool // a keyword after a dot: a name
	blank   bool // a blank line before it
}

// lex returns the file's tokens, comments included, with their byte
// offsets. A byte order mark is dropped.
func lex(filename, src string) []tok {
	lineStart := []int{0}
	for i := 0; i < len(src); i++ {
		if src[i] == '\n' {
			lineStart = append(lineStart, i+1)
		}
	}
	toks := grammar.Tokens(filename, src)
	out := make([]tok, 0, len(toks))
	off, line, col := 0, 1, 1 // walks forward, token by token
	afterDot := false         // the last token other than a comment is "."
	for _, t := range toks {
		if t.Line != line {
			off, line, col = lineStart[t.Line-1], t.Line, 1
		}
		for ; col < t.Col && off < len(src); col++ {
			_, n := utf8.DecodeRuneInString(src[off:])
			off += n
		}
		if t.Kind == "bad" && t.Text == "\uFEFF" {
			continue
		}
		k := tok{Token: t, off: off, endLine: t.Line + strings.Count(t.Text, "\n")}
		// A comment may stand between the dot and the name (`s. -- x` then
		// `DATE` on the next line): the name is still a member.
		if t.Kind == "keyword" && afterDot {
			k.member = true
		}
		if t.Kind != "comment" {
			afterDot = t.Kind == "operator" && t.Text == "."
		}
		out = append(out, k)
	}
	return out
}

// is reports whether t is the operator or keyword word (a keyword read
// as a name after a dot is neither).
func (t *tok) is(word string) bool {
	switch t.Kind {
	case "operator":
		return t.Text == word
	case "keyword":
		return !t.member && strings.EqualFold(t.Text, word)
	}
	return false
}

// text is t as printed: keywords in lower case, comments without the
// white space at their end.
func (t *tok) text() string {
	switch {
	case t.Kind == "keyword" && !t.member:
		return strings.ToLower(t.Text)
	case t.Kind == "comment":
		return strings.TrimRight(t.Text, " \t\r")
	}
	return t.Text
}

// endsOperand reports whether t can end an operand, so that a "-" after
// it subtracts rather than negates.
func (t *tok) endsOperand() bool {
	switch t.Kind {
	case "name", "number", "string", "text":
		return true
	case "keyword":
		return t.member || t.is("null") || t.is("true") || t.is("false") || t.is("end")
	case "operator":
		return t.Text == ")" || t.Text == "]"
	}
	return false
}

// opens and closes say how t changes the nesting that indents
// continuation lines.
func (t *tok) opens() bool  { return t.is("(") || t.is("[") || t.is("case") }
func (t *tok) closes() bool { return t.is(")") || t.is("]") || t.is("end") }

// space reports whether one space separates b from a, the token before
// it; before is the token before a (nil at the start).
func space(before, a, b *tok) bool {
	switch {
	case b.is(",") || b.is(";") || b.is(")") || b.is("]") || b.is(".") || b.is("["):
		return false
	case a.is("(") || a.is("[") || a.is("."):
		return false
	case a.is("-") && (before == nil || !before.endsOperand()): // a unary minus
		return strings.HasPrefix(b.Text, "-") // never "--", which starts a comment
	case b.is("("):
		// A call's name and semiadditive take their "(" directly; a
		// link's target table (after "->") does not.
		return !(a.Kind == "name" && (before == nil || !before.is("->")) || a.is("semiadditive"))
	}
	return true
}

// joinLine prints toks[from:to] on one line; the tokens before from
// decide how the first ones are spaced.
func joinLine(toks []*tok, from, to int) string {
	var b strings.Builder
	for i := from; i < to; i++ {
		if i > from && space(at(toks, i-2), toks[i-1], toks[i]) {
			b.WriteByte(' ')
		}
		b.WriteString(toks[i].text())
	}
	return b.String()
}

// at is toks[i], or nil before the start.
func at(toks []*tok, i int) *tok {
	if i < 0 {
		return nil
	}
	return toks[i]
}

func width(s string) int { return utf8.RuneCountInString(s) }
