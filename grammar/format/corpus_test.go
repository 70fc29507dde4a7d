package format_test

import (
	"go/ast"
	"go/parser"
	"go/token"
	"io/fs"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"testing"

	"pgregory.net/rapid"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/grammar/format"
)

// corpus is every model of the repository that parses: the .roll files
// (testdata, the demo, the editor grammar's samples) and the models
// written as string literals in the Go tests, keyed by where they are.
func corpus(t testing.TB) map[string]string {
	models, err := loadCorpus()
	if err != nil {
		t.Fatal(err)
	}
	files := 0
	for name := range models {
		if strings.HasSuffix(name, ".roll") {
			files++
		}
	}
	if files < 40 || len(models)-files < 50 { // 59 and 84 when written
		t.Fatalf("only %d model files and %d models in Go tests found; is the walk looking in the right place?", files, len(models)-files)
	}
	return models
}

var loadCorpus = sync.OnceValues(func() (map[string]string, error) {
	out := map[string]string{}
	err := filepath.WalkDir("../..", func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() && (d.Name() == ".git" || d.Name() == "node_modules") {
			return filepath.SkipDir
		}
		switch {
		case strings.HasSuffix(p, ".roll"):
			b, err := os.ReadFile(p)
			if err != nil {
				return err
			}
			out[p] = string(b)
		case strings.HasSuffix(p, "_test.go"):
			models, err := goModels(p)
			if err != nil {
				return err
			}
			for at, s := range models {
				out[at] = s
			}
		}
		return nil
	})
	for name, src := range out {
		f, diags := grammar.Parse(name, src)
		if diags.HasErrors() || len(f.Tables)+len(f.Measures)+len(f.Views) == 0 {
			delete(out, name)
		}
	}
	return out, err
})

// goModels are the string constants of a Go file (literals and sums of
// literals) that look like models: they declare a table or a measure.
func goModels(path string) (map[string]string, error) {
	fset := token.NewFileSet()
	f, err := parser.ParseFile(fset, path, nil, 0)
	if err != nil {
		return nil, err
	}
	out := map[string]string{}
	ast.Inspect(f, func(n ast.Node) bool {
		e, ok := n.(ast.Expr)
		if !ok {
			return true
		}
		s, ok := constString(e)
		if !ok {
			return true
		}
		if strings.Contains(s, "table ") || strings.Contains(s, "measure ") {
			out[fset.Position(e.Pos()).String()] = s
		}
		return false
	})
	return out, nil
}

func constString(e ast.Expr) (string, bool) {
	switch e := e.(type) {
	case *ast.BasicLit:
		if e.Kind == token.STRING {
			s, err := strconv.Unquote(e.Value)
			return s, err == nil
		}
	case *ast.BinaryExpr:
		if e.Op == token.ADD {
			l, ok1 := constString(e.X)
			r, ok2 := constString(e.Y)
			return l + r, ok1 && ok2
		}
	case *ast.ParenExpr:
		return constString(e.X)
	}
	return "", false
}

// TestCorpus: every model of the repository formats to a text with the
// same tokens and syntax tree, which formatting leaves as it is.
func TestCorpus(t *testing.T) {
	for name, src := range corpus(t) {
		checkFormatted(t, name, src, formatOK(t, name, src))
	}
}

// TestRandomLayouts rewrites the corpus's models with random white space
// between their tokens, random case in their keywords and random
// comments, and checks each: formatting keeps every token and comment
// and the syntax tree, and is idempotent. A rewrite that changes only
// the spaces within lines and the case of keywords formats to exactly
// what the original formats to: the layout is canonical.
func TestRandomLayouts(t *testing.T) {
	models := corpus(t)
	names := make([]string, 0, len(models))
	for n := range models {
		names = append(names, n)
	}
	rapid.Check(t, func(rt *rapid.T) {
		name := rapid.SampledFrom(names).Draw(rt, "model")
		src := models[name]
		lines := rapid.Bool().Draw(rt, "line breaks and comments")
		var b strings.Builder
		prevLine, prevText := 1, ""
		for i, tk := range grammar.Tokens(name, src) {
			if tk.Kind == "bad" {
				continue // a byte order mark
			}
			switch {
			case i == 0:
			case lines:
				b.WriteString(rapid.SampledFrom([]string{" ", "\t", "\n", "\n\n\n  ", " -- noise\n"}).Draw(rt, "space"))
			case tk.Line > prevLine:
				b.WriteString(strings.Repeat("\n", tk.Line-prevLine) + rapid.SampledFrom([]string{"", " ", "\t  "}).Draw(rt, "indent"))
			default:
				b.WriteString(rapid.SampledFrom([]string{" ", "  ", "\t"}).Draw(rt, "space"))
			}
			text := tk.Text
			if tk.Kind == "keyword" && rapid.Bool().Draw(rt, "upper") && prevText != "." {
				text = strings.ToUpper(text)
			}
			if tk.Kind == "comment" {
				text += "\n"
			}
			b.WriteString(text)
			prevText = tk.Text
			prevLine = tk.Line + strings.Count(tk.Text, "\n")
			if tk.Kind == "comment" {
				prevLine++
			}
		}
		messy := b.String()
		out, diags := format.Source(name, messy)
		if diags != nil {
			rt.Fatalf("the rewrite does not format: %v\n%s", diags, messy)
		}
		checkFormatted(rt, name, messy, out)
		if err := sameTree(name, src, out); err != nil {
			rt.Fatalf("%v", err)
		}
		if !lines {
			if want := formatOK(rt, name, src); out != want {
				rt.Fatalf("the same lines with other spaces format differently:\n%s\nthe original formats to:\n%s", out, want)
			}
		}
	})
}

// FuzzFormat: whatever parses formats to the same tokens and tree, and
// formatting is idempotent (`go test -fuzz FuzzFormat`; the seeds are
// the corpus's model files up to 16 KiB, which TestCorpus checks
// already; the larger ones make the fuzzing workers too slow to answer).
func FuzzFormat(f *testing.F) {
	for name, src := range corpus(f) {
		if strings.HasSuffix(name, ".roll") && len(src) <= 16<<10 {
			f.Add(src)
		}
	}
	f.Fuzz(func(t *testing.T, src string) {
		out, diags := format.Source("fuzz.roll", src)
		if diags != nil {
			return
		}
		checkFormatted(t, "fuzz.roll", src, out)
	})
}
