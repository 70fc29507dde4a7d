package grammar

import (
	"encoding/json"
	"io/fs"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strings"
	"testing"
	"unicode/utf8"
)

// The editor grammar (editor/rollwise.tmLanguage.json) is written in the
// JSON form of the grammars most editors read for highlighting: named
// patterns, tried at once, the leftmost match winning and ties going to
// the first pattern; a begin/end rule spans lines, with inner patterns
// tried before the end where applyEndPatternLast is set. These tests run
// that matching over every model of testdata and check that the grammar
// splits the text into the tokens the lexer makes, of the same kinds.

type editorRule struct {
	Name                string       `json:"name"`
	Match               string       `json:"match"`
	Begin               string       `json:"begin"`
	End                 string       `json:"end"`
	ApplyEndPatternLast bool         `json:"applyEndPatternLast"`
	Patterns            []editorRule `json:"patterns"`
	Include             string       `json:"include"`
}

type editorGrammar struct {
	ScopeName  string                `json:"scopeName"`
	Patterns   []editorRule          `json:"patterns"`
	Repository map[string]editorRule `json:"repository"`
}

func loadEditorGrammar(t *testing.T) ([]editorRule, editorGrammar) {
	t.Helper()
	b, err := os.ReadFile("editor/rollwise.tmLanguage.json")
	if err != nil {
		t.Fatal(err)
	}
	var g editorGrammar
	if err := json.Unmarshal(b, &g); err != nil {
		t.Fatal(err)
	}
	var rules []editorRule
	for _, p := range g.Patterns {
		r, ok := g.Repository[strings.TrimPrefix(p.Include, "#")]
		if !ok {
			t.Fatalf("pattern %q is not in the repository", p.Include)
		}
		rules = append(rules, r)
	}
	return rules, g
}

// kindOfScope maps a scope name to the lexer's token kind.
func kindOfScope(scope string) string {
	for _, k := range []struct{ prefix, kind string }{
		{"comment.", "comment"}, {"keyword.operator.", "operator"}, {"keyword.", "keyword"},
		{"string.quoted.single.", "string"}, {"string.quoted.double.", "text"}, {"constant.numeric.", "number"},
		{"variable.", "name"}, {"invalid.", "bad"},
	} {
		if strings.HasPrefix(scope, k.prefix) {
			return k.kind
		}
	}
	return "unknown scope " + scope
}

// editorTokens runs the editor grammar's matching over src, line by line
// as editors do (a begin/end rule may run on over later lines).
func editorTokens(t *testing.T, rules []editorRule, src string) []Token {
	t.Helper()
	compiled := map[string]*regexp.Regexp{}
	re := func(p string) *regexp.Regexp {
		if r, ok := compiled[p]; ok {
			return r
		}
		r, err := regexp.Compile(p)
		if err != nil {
			t.Fatalf("pattern %q: %v", p, err)
		}
		compiled[p] = r
		return r
	}
	var out []Token
	pos := 0
	counted, line, lineStart := 0, 1, 0 // newlines counted up to offset counted
	for pos < len(src) {
		lineEnd := len(src)
		if i := strings.IndexByte(src[pos:], '\n'); i >= 0 {
			lineEnd = pos + i
		}
		// The leftmost match starts at the first character that is not
		// white space, since the last pattern matches any such character:
		// try each pattern anchored there, the first that matches wins.
		at := pos + len(src[pos:lineEnd]) - len(strings.TrimLeft(src[pos:lineEnd], " \t\r"))
		if at == lineEnd {
			pos = lineEnd + 1
			continue
		}
		best, bestEnd := -1, 0
		for i, r := range rules {
			p := r.Match
			if p == "" {
				p = r.Begin
			}
			if loc := re(`^(?:` + p + `)`).FindStringIndex(src[at:lineEnd]); loc != nil {
				best, bestEnd = i, at+loc[1]
				break
			}
		}
		if best < 0 {
			t.Fatalf("no pattern of the grammar matches %q", src[at:min(at+20, lineEnd)])
		}
		bestAt := at
		r := rules[best]
		end := bestEnd
		if r.Begin != "" {
			end = spanEnd(re, r, src, bestEnd)
		}
		for i := counted; i < bestAt; i++ {
			if src[i] == '\n' {
				line, lineStart = line+1, i+1
			}
		}
		counted = bestAt
		col := utf8.RuneCountInString(src[lineStart:bestAt]) + 1
		out = append(out, Token{Kind: kindOfScope(r.Name), Text: src[bestAt:end], Line: line, Col: col})
		pos = end
	}
	return out
}

// spanEnd finds where a begin/end rule that began before from ends: the
// end pattern's leftmost match, skipping inner patterns' matches, which
// win ties when applyEndPatternLast is set (the end of the text if never).
func spanEnd(re func(string) *regexp.Regexp, r editorRule, src string, from int) int {
	endRe := re(r.End)
	for from < len(src) {
		e := endRe.FindStringIndex(src[from:])
		innerAt, innerEnd := len(src), 0
		for _, in := range r.Patterns {
			if loc := re(in.Match).FindStringIndex(src[from:]); loc != nil && from+loc[0] < innerAt {
				innerAt, innerEnd = from+loc[0], from+loc[1]
			}
		}
		switch {
		case e == nil && innerAt == len(src):
			return len(src)
		case e == nil || innerAt < from+e[0] || innerAt == from+e[0] && r.ApplyEndPatternLast:
			from = innerEnd
		default:
			return from + e[1]
		}
	}
	return len(src)
}

// TestEditorGrammarAgreesWithTheLexer: on every model of testdata, the
// editor grammar makes the lexer's tokens, of the same kinds, on the lines
// before the first token the lexer cannot accept (an unterminated quote
// is read to the end of its line by the lexer, to the closing quote by an
// editor).
func TestEditorGrammarAgreesWithTheLexer(t *testing.T) {
	rules, _ := loadEditorGrammar(t)
	var files []string
	_ = filepath.WalkDir("../testdata", func(p string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() && strings.HasSuffix(p, ".roll") {
			files = append(files, p)
		}
		return nil
	})
	if len(files) < 20 {
		t.Fatalf("found %d models in testdata", len(files))
	}
	kinds := map[string]int{}
	for _, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		src := string(b)
		lexed := Tokens(f, src)
		for i, tok := range lexed {
			if tok.Kind == "bad" {
				// Compare the lines before the first bad token only.
				lexed = lexed[:i]
				if cut := strings.SplitAfterN(src, "\n", tok.Line); len(cut) == tok.Line {
					src = strings.Join(cut[:tok.Line-1], "")
				}
				for len(lexed) > 0 && lexed[len(lexed)-1].Line >= tok.Line {
					lexed = lexed[:len(lexed)-1]
				}
				break
			}
		}
		edited := editorTokens(t, rules, src)
		for i, want := range lexed {
			if i >= len(edited) || edited[i] != want {
				got := "nothing"
				if i < len(edited) {
					got = strings.Join([]string{edited[i].Kind, edited[i].Text}, " ")
				}
				t.Errorf("%s:%d:%d: the lexer reads %s %q, the editor grammar %s", f, want.Line, want.Col, want.Kind, want.Text, got)
				break
			}
			kinds[want.Kind]++
		}
	}
	for _, k := range []string{"comment", "name", "keyword", "string", "text", "number", "operator"} {
		if kinds[k] == 0 {
			t.Errorf("no %s token in the models compared", k)
		}
	}
}

// TestEditorGrammarKnowsEveryKeyword: the keyword pattern lists exactly
// the lexer's keywords, including those no test model uses.
func TestEditorGrammarKnowsEveryKeyword(t *testing.T) {
	_, g := loadEditorGrammar(t)
	p := g.Repository["keyword"].Match
	inner := strings.TrimSuffix(strings.TrimPrefix(p, "(?i)(?:"), `)\b`)
	got := strings.Split(inner, "|")
	want := slices.Clone(keywords)
	slices.Sort(got)
	slices.Sort(want)
	if !slices.Equal(got, want) {
		t.Errorf("the editor grammar's keywords %v\ndiffer from the lexer's %v (edit grammar/editor/rollwise.tmLanguage.json)", got, want)
	}
	if g.ScopeName != "source.rollwise" {
		t.Errorf("scopeName %q", g.ScopeName)
	}
}
