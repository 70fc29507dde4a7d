package dialects

import (
	"fmt"
	"math/rand"
	"strconv"
	"strings"
	"testing"
	"unicode/utf8"
)

// The injection suite, part one: every dialect's quoted identifiers and
// string literals are read back by a small lexer written from the engine's
// documented token rules (independently of the quoting code), which checks
// that the text is ONE token that ends exactly where the text ends (so
// nothing after a quote can be read as SQL) and that it means the value
// that was quoted. Part two runs hostile names and values on the live
// engines (cmd/rollwise/injection_test.go).

// hostile are names and values meant to break out of quotes.
var hostile = []string{
	`plain`, `it's`, `''`, `'`, `\`, `\'`, `\\'`, `'\`, `"`, `""`, "`", "``", `[x]`, `]`, `]]`, `a"b`,
	`x'; DROP TABLE t; --`, `x" ; DROP TABLE t; --`, "x`; DROP TABLE t; --", `x]; DROP TABLE t; --`,
	`-- comment`, `/* open`, `*/`, `#hash`, `$$dollar$$`, `$tag$`, `%s %d`, `?`, `$1`, `:name`,
	"line\nbreak", "cr\rlf", "tab\tx", "nul\x00byte", "bell\x07", "del\x7f", `ünïcødé`, `名前`, "emoji 🌱",
	"\u2028sep", "e\u0301", `\n`, `\x41`, `\u0041`, `E'x'`, `N'x'`, `U&'x'`, `r'x'`, `b'x'`, `"'`, `'"`,
	"`'\"[]\\",
}

// randomText draws texts made mostly of quote-relevant characters.
func randomText(r *rand.Rand) string {
	alphabet := []string{`'`, `"`, "`", `\`, `[`, `]`, `-`, `/`, `*`, `;`, `$`, "\n", "\r", "\x00", "a", "Z", "0", " ", "é", "名", "🌱", "\u2028"}
	var b strings.Builder
	for n := r.Intn(12); n > 0; n-- {
		b.WriteString(alphabet[r.Intn(len(alphabet))])
	}
	return b.String()
}

// lexQuoted reads one token delimited by open and close from the start of
// s. A doubled close stands for one close when doubled is set; a backslash
// escape is decoded by esc when esc is non-nil. It returns the decoded
// text and the rest of s after the token.
func lexQuoted(s, open string, close byte, doubled bool, esc func(s string) (string, int, error)) (string, string, error) {
	if !strings.HasPrefix(s, open) {
		return "", "", fmt.Errorf("does not start with %s", open)
	}
	var b strings.Builder
	i := len(open)
	for i < len(s) {
		c := s[i]
		switch {
		case esc != nil && c == '\\':
			v, n, err := esc(s[i:])
			if err != nil {
				return "", "", err
			}
			b.WriteString(v)
			i += n
		case c == close && doubled && i+1 < len(s) && s[i+1] == close:
			b.WriteByte(close)
			i += 2
		case c == close:
			return b.String(), s[i+1:], nil
		default:
			b.WriteByte(c)
			i++
		}
	}
	return "", "", fmt.Errorf("unterminated")
}

// Backslash escape readers, each accepting only what the engine defines.
func escSimple(pairs map[byte]string) func(string) (string, int, error) {
	return func(s string) (string, int, error) {
		if len(s) < 2 {
			return "", 0, fmt.Errorf("dangling backslash")
		}
		if v, ok := pairs[s[1]]; ok {
			return v, 2, nil
		}
		return "", 0, fmt.Errorf("escape \\%c would not read back as written", s[1])
	}
}

// MySQL and MariaDB (string-literals.html): \0 \' \" \b \n \r \t \Z \\;
// any other \c is c (and \% \_ keep their backslash), so only the ones we
// write are accepted.
var escMySQL = escSimple(map[byte]string{'\\': `\`, '\'': `'`, '0': "\x00"})

// Snowflake and Spark: \\ and \' (and more we never write).
var escBackslashQuote = escSimple(map[byte]string{'\\': `\`, '\'': `'`})

// PostgreSQL E'...': \\ (we write no other escape).
var escPG = escSimple(map[byte]string{'\\': `\`})

// GoogleSQL (zetasql lexical.md): \\ \' \` \n \r \t \uXXXX.
func escBigQuery(s string) (string, int, error) {
	if len(s) >= 6 && s[1] == 'u' {
		n, err := strconv.ParseUint(s[2:6], 16, 32)
		if err != nil {
			return "", 0, err
		}
		return string(rune(n)), 6, nil
	}
	return escSimple(map[byte]string{'\\': `\`, '\'': `'`, '`': "`", 'n': "\n", 'r': "\r", 't': "\t"})(s)
}

// readIdent decodes a quoted identifier by the engine's rules.
func readIdent(dialect, s string) (string, string, error) {
	switch dialect {
	case "duckdb", "postgres", "trino", "snowflake":
		return lexQuoted(s, `"`, '"', true, nil)
	case "sqlite", "mysql", "spark":
		return lexQuoted(s, "`", '`', true, nil)
	case "sqlserver":
		return lexQuoted(s, "[", ']', true, nil)
	case "bigquery":
		if strings.ContainsAny(s, "\n\r") {
			return "", "", fmt.Errorf("a raw line break in a quoted identifier")
		}
		return lexQuoted(s, "`", '`', false, escBigQuery)
	}
	return "", "", fmt.Errorf("no lexer for %s", dialect)
}

// readString decodes a string literal by the engine's rules.
func readString(dialect, s string) (string, string, error) {
	switch dialect {
	case "duckdb", "sqlite", "trino":
		return lexQuoted(s, `'`, '\'', true, nil)
	case "postgres":
		if strings.HasPrefix(s, "E'") {
			return lexQuoted(s, `E'`, '\'', true, escPG)
		}
		// A plain literal must hold no backslash: with
		// standard_conforming_strings off it would be an escape.
		v, rest, err := lexQuoted(s, `'`, '\'', true, nil)
		if err == nil && strings.Contains(v, `\`) {
			return "", "", fmt.Errorf("backslash in a plain literal")
		}
		return v, rest, err
	case "mysql":
		return lexQuoted(s, `'`, '\'', true, escMySQL)
	case "snowflake":
		return lexQuoted(s, `'`, '\'', true, escBackslashQuote)
	case "spark":
		return lexQuoted(s, `'`, '\'', false, escBackslashQuote)
	case "sqlserver":
		return readSQLServerString(s)
	case "bigquery":
		if strings.ContainsAny(s, "\n\r") {
			return "", "", fmt.Errorf("a raw line break in a quoted string")
		}
		return lexQuoted(s, `'`, '\'', false, escBigQuery)
	}
	return "", "", fmt.Errorf("no lexer for %s", dialect)
}

// readSQLServerString reads N'...' or, for a text with line breaks, the
// parenthesised concatenation of N'...' pieces and NCHAR(10) or NCHAR(13)
// (optionally led by a CAST to NVARCHAR(MAX)); a raw line break
// anywhere is refused, since a line of it could be a batch separator.
func readSQLServerString(s string) (string, string, error) {
	if !strings.HasPrefix(s, "(") {
		v, rest, err := lexQuoted(s, `N'`, '\'', true, nil)
		if err == nil && strings.ContainsAny(v, "\n\r") {
			return "", "", fmt.Errorf("a raw line break in a literal")
		}
		return v, rest, err
	}
	var b strings.Builder
	rest := strings.TrimPrefix(s[1:], "CAST(N'' AS NVARCHAR(MAX)) + ")
	for {
		switch {
		case strings.HasPrefix(rest, "NCHAR(10)"):
			b.WriteByte('\n')
			rest = rest[len("NCHAR(10)"):]
		case strings.HasPrefix(rest, "NCHAR(13)"):
			b.WriteByte('\r')
			rest = rest[len("NCHAR(13)"):]
		default:
			v, r, err := lexQuoted(rest, `N'`, '\'', true, nil)
			if err != nil {
				return "", "", err
			}
			if strings.ContainsAny(v, "\n\r") {
				return "", "", fmt.Errorf("a raw line break in a piece")
			}
			b.WriteString(v)
			rest = r
		}
		if strings.HasPrefix(rest, ")") {
			return b.String(), rest[1:], nil
		}
		if !strings.HasPrefix(rest, " + ") {
			return "", "", fmt.Errorf("pieces not joined by +")
		}
		rest = rest[3:]
	}
}

// wantIdent is the name an identifier must read back as: Snowflake's
// quoted upper case for regular lower-case names (see snowflake.Ident).
func wantIdent(dialect, name string) string {
	if dialect == "snowflake" && regularLower.MatchString(name) {
		return strings.ToUpper(name)
	}
	return name
}

func checkToken(t *testing.T, what, dialect, in, out string, read func(string, string) (string, string, error), want string) {
	t.Helper()
	got, rest, err := read(dialect, out)
	switch {
	case err != nil:
		t.Errorf("%s %s(%q) = %s: %v", dialect, what, in, out, err)
	case rest != "":
		t.Errorf("%s %s(%q) = %s: the token ends early; %q would be read as SQL", dialect, what, in, out, rest)
	case got != want:
		t.Errorf("%s %s(%q) = %s reads back as %q", dialect, what, in, out, got)
	}
}

func TestQuotingNeverEscapes(t *testing.T) {
	r := rand.New(rand.NewSource(1))
	inputs := append([]string{}, hostile...)
	for range 3000 {
		inputs = append(inputs, randomText(r))
	}
	for _, name := range Names() {
		d, _ := Get(name)
		for _, in := range inputs {
			if !utf8.ValidString(in) {
				continue
			}
			checkToken(t, "String", name, in, d.String(in), readString, in)
			if in != "" {
				checkToken(t, "Ident", name, in, d.Ident(in), readIdent, wantIdent(name, in))
			}
		}
	}
}

// Date and timestamp literals are validated before they reach a dialect,
// but are still rendered only inside quotes.
func TestDateLiteralsQuoted(t *testing.T) {
	for _, name := range Names() {
		d, _ := Get(name)
		for _, s := range []string{d.Date("2026-03-01"), d.Timestamp("2026-03-01 10:00:00")} {
			if strings.Count(s, "'") != 2 {
				t.Errorf("%s: %s is not one quoted literal", name, s)
			}
		}
	}
}
