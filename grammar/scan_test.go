package grammar

import (
	"io/fs"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/alecthomas/participle/v2/lexer"
)

// ruleLexer is the lexer the scanner replaced: participle's rule lexer
// with the regular expressions listed in scan.go. It stays as the
// scanner's oracle.
var ruleLexer = lexer.MustSimple([]lexer.SimpleRule{
	{Name: "Comment", Pattern: `--[^\n]*`},
	{Name: "Whitespace", Pattern: `[ \t\r\n]+`},
	{Name: "QIdent", Pattern: "`[^`\n]+`"},
	{Name: "String", Pattern: `'(?:[^']|'')*'`},
	{Name: "DString", Pattern: `"(?:[^"\n]|"")*"`},
	{Name: "Number", Pattern: `(?:[0-9]+(?:\.[0-9]*)?|\.[0-9]+)(?:[eE][+-]?[0-9]+)?`},
	{Name: "Keyword", Pattern: `(?i)(?:` + strings.Join(keywords, "|") + `)\b`},
	{Name: "Ident", Pattern: `[A-Za-z_][A-Za-z0-9_]*`},
	{Name: "Op", Pattern: `->|\|\||<=|>=|<>|!=|[-+*/=<>(){}\[\],;.]`},
	{Name: "Unterminated", Pattern: "['\"`][^\n]*"},
	{Name: "Bad", Pattern: `.`},
})

// sameTokens fails t when the scanner and the rule lexer differ on src:
// in a token's type (by name), text or position.
func sameTokens(t *testing.T, name, src string) {
	t.Helper()
	ruleNames := lexer.SymbolsByRune(ruleLexer)
	scanNames := lexer.SymbolsByRune(lexDef)
	want, err := ruleLexer.LexString(name, src)
	if err != nil {
		t.Fatal(err)
	}
	got := newScanner(name, src)
	for i := 0; ; i++ {
		w, werr := want.Next()
		g, gerr := got.Next()
		if werr != nil || gerr != nil {
			t.Fatalf("%s: token %d: errors %v and %v", name, i, werr, gerr)
		}
		if ruleNames[w.Type] != scanNames[g.Type] || w.Value != g.Value || w.Pos != g.Pos {
			t.Fatalf("%s: token %d: the rules give %s %q at %v, the scanner %s %q at %v",
				name, i, ruleNames[w.Type], w.Value, w.Pos, scanNames[g.Type], g.Value, g.Pos)
		}
		if w.EOF() {
			return
		}
	}
}

// TestScannerMatchesRules: the scanner and the rule lexer agree on every
// model and text file in testdata, on the fuzz corpora, and on tricky
// pieces (unclosed quotes holding doubled quotes, keywords in odd case,
// the Kelvin sign and long s that (?i) folds to k and s, invalid UTF-8).
func TestScannerMatchesRules(t *testing.T) {
	for _, root := range []string{"../testdata", "testdata", "../cmd/rollwise/demo"} {
		err := filepath.WalkDir(root, func(path string, d fs.DirEntry, err error) error {
			if err != nil || d.IsDir() {
				return err
			}
			if info, err := d.Info(); err != nil || info.Size() > 1<<20 {
				return err
			}
			b, err := os.ReadFile(path)
			if err != nil {
				return err
			}
			sameTokens(t, path, string(b))
			return nil
		})
		if err != nil && !os.IsNotExist(err) {
			t.Fatal(err)
		}
	}
	for _, src := range []string{
		"", "'", "''", "'a''", "'a'''", "'a''b", "'a''b''c\nd", "\"a\"\"b\n\"", "\"\"\"\n", "``", "`a`", "`a\n`",
		"1.", "1.e5", "1e", "1e+", ".5e-3x", "..5", "1..2", "a.b.c", "TaBlE", "tablex", "table_", "table1",
		"\u212Aey", "\u212Aeyx", "a\u017F", "a\u017Fx", "i\u017F", "tota\u017F", "\u017Femiadditive",
		"--", "-", "->", "-->", "||", "|", "!", "!=", "<>=", "\xff\xfe", "\xc3", "é", "\uFEFFtable",
		"\r\n\t x", "a--b\nc", "measure m = 'x''", "with totals", "nUlL", "not\u00a0null",
	} {
		sameTokens(t, "piece", src)
	}
}

// TestScannerMatchesRulesRandom: the two agree on random text made of the
// pieces tokens are built from, and on random bytes.
func TestScannerMatchesRulesRandom(t *testing.T) {
	pieces := append([]string{
		"'", "''", "\"", "\"\"", "`", "\n", " ", "\t", "\r", "-", "--", ">", "<", "=", "!", "|", ".", "e", "E", "+",
		"0", "9", "_", "x", "K", "\u212A", "\u017F", "s", "\xff", "\xc3", "é", "(", ")", "[", "]", ";", ",", "#", "@",
	}, keywords...)
	for _, k := range keywords[:10] {
		pieces = append(pieces, strings.ToUpper(k))
	}
	r := rand.New(rand.NewPCG(18, 1))
	n := 3000
	if testing.Short() {
		n = 300
	}
	for range n {
		var b strings.Builder
		for range r.IntN(40) {
			b.WriteString(pieces[r.IntN(len(pieces))])
		}
		sameTokens(t, "random", b.String())
		raw := make([]byte, r.IntN(200))
		for i := range raw {
			raw[i] = byte(r.Uint32())
		}
		sameTokens(t, "bytes", string(raw))
	}
}

// FuzzScanner looks for text the scanner and the rule lexer tokenise
// differently:
//
//	go test -run='^$' -fuzz='^FuzzScanner$' -fuzztime=5m ./grammar
func FuzzScanner(f *testing.F) {
	for _, s := range []string{"measure m = sum(t.x) where t.y <> 'a''b' -- c", "`a` \"b\"\"c\" 1.5e3 \u212Aey"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, src string) { sameTokens(t, "fuzz", src) })
}
