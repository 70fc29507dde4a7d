package grammar_test

import (
	"flag"
	"go/ast"
	"go/parser"
	"go/token"
	"io/fs"
	"math/rand"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/reference/casegen"
)

var mutations = flag.Int("fastpath-mutations", 2,
	"mutations of each model in TestFastPathMatchesParticiple (a longer campaign: 50, or FuzzFastPath)")

// TestFastPathMatchesParticiple parses every model of the repository
// (the .roll files, the string literals of its Go files that look like
// models, and random models of the differential tests' generator), and
// token-level mutations of them, with the fast path and with participle
// alone: the syntax trees, files and diagnostics must be identical, and
// the fast path must accept every declaration participle accepts.
func TestFastPathMatchesParticiple(t *testing.T) {
	corpus := modelCorpus(t)
	rng := rand.New(rand.NewSource(18))
	decls, inputs := 0, 0
	check := func(label, src string) {
		inputs++
		diff, n, missed := grammar.FastPathDiff(src)
		decls += n
		if diff != "" {
			t.Fatalf("%s: %s\ninput:\n%s", label, diff, src)
		}
		if missed > 0 {
			t.Fatalf("%s: the fast path declined %d declarations participle accepts\ninput:\n%s", label, missed, src)
		}
	}
	for i, src := range corpus {
		check("corpus "+strconv.Itoa(i), src)
		toks := grammar.Tokens("m.roll", src)
		for range min(*mutations, len(toks)) {
			check("mutation of corpus "+strconv.Itoa(i), mutate(rng, toks))
		}
	}
	if len(corpus) < 100 || decls < 1000 {
		t.Fatalf("only %d models and %d declarations", len(corpus), decls)
	}
	t.Logf("%d models, %d inputs, %d declarations", len(corpus), inputs, decls)
}

// TestFastExprMatchesParticiple does the same for ParseExpr.
func TestFastExprMatchesParticiple(t *testing.T) {
	rng := rand.New(rand.NewSource(17))
	for _, src := range exprSeeds {
		toks := grammar.Tokens("e", src)
		for i := range 30 {
			in := src
			if i > 0 {
				in = mutate(rng, toks)
			}
			if diff := grammar.FastExprDiff(in); diff != "" {
				t.Fatalf("%q: %s", in, diff)
			}
		}
	}
}

var exprSeeds = []string{"stores.region = 'North'", "sales.qty >= 2 and not (a.b in (1, 2, null))",
	"case when t.x between 1 and 2 then 'a' else 'b' end", "date_trunc(month, t.d) = date '2026-01-01'",
	"(((t.x)))", "cast(t.x as decimal) || 'x'", "t.x is not null or t.y <> 1e-3",
	"sum(t.x per t.y having count(*) > 1 from t.z) [t.d back 1 month; drop t.k] where t.a not between -1 and 2"}

// FuzzFastPath compares the two ways on arbitrary text.
//
//	go test -run='^$' -fuzz='^FuzzFastPath$' -fuzztime=10m ./grammar
func FuzzFastPath(f *testing.F) {
	paths, _ := filepath.Glob("../testdata/*/*.roll")
	for _, p := range paths {
		if b, err := os.ReadFile(p); err == nil {
			f.Add(string(b))
		}
	}
	for _, s := range exprSeeds {
		f.Add("measure m = " + s)
	}
	f.Fuzz(func(t *testing.T, src string) {
		if diff, _, missed := grammar.FastPathDiff(src); diff != "" || missed > 0 {
			t.Fatalf("%s (%d declined that participle accepts)", diff, missed)
		}
		if diff := grammar.FastExprDiff(src); diff != "" {
			t.Fatal(diff)
		}
	})
}

// vocabulary is what mutations insert: every keyword, operator and kind
// of literal.
var vocabulary = strings.Fields("table at from key link measure view by where with totals format per having " +
	"distinct and or not in between is null case when then else end drop ungroup as true false additive " +
	"nonadditive semiadditive date timestamp required -> || <= >= <> != - + * / = < > ( ) { } [ ] , ; . " +
	"x t.y `q` 'S' \"D\" 1 2.5e3 f( back running")

// mutate rebuilds the text of toks (comments left out) with one token
// deleted, doubled, swapped with the next or replaced, or one inserted.
func mutate(rng *rand.Rand, toks []grammar.Token) string {
	words := make([]string, 0, len(toks)+1)
	for _, t := range toks {
		if t.Kind != "comment" {
			words = append(words, t.Text)
		}
	}
	if len(words) == 0 {
		return vocabulary[rng.Intn(len(vocabulary))]
	}
	i := rng.Intn(len(words))
	w := vocabulary[rng.Intn(len(vocabulary))]
	switch rng.Intn(5) {
	case 0:
		words = append(words[:i], words[i+1:]...)
	case 1:
		words = append(words[:i+1], words[i:]...)
	case 2:
		if i+1 < len(words) {
			words[i], words[i+1] = words[i+1], words[i]
		}
	case 3:
		words[i] = w
	default:
		words = append(words[:i], append([]string{w}, words[i:]...)...)
	}
	return strings.Join(words, " ")
}

// modelCorpus gathers the repository's models: .roll files, string
// literals of Go files that hold a declaration, and 40 generated
// models.
func modelCorpus(t *testing.T) []string {
	var out []string
	err := filepath.WalkDir("..", func(path string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() && strings.HasPrefix(d.Name(), ".") && path != ".." {
			return filepath.SkipDir
		}
		switch {
		case strings.HasSuffix(path, ".roll"):
			b, err := os.ReadFile(path)
			if err != nil {
				return err
			}
			out = append(out, string(b))
		case strings.HasSuffix(path, ".go"):
			f, err := parser.ParseFile(token.NewFileSet(), path, nil, parser.SkipObjectResolution)
			if err != nil {
				return err
			}
			ast.Inspect(f, func(n ast.Node) bool {
				if lit, ok := n.(*ast.BasicLit); ok && lit.Kind == token.STRING {
					if s, err := strconv.Unquote(lit.Value); err == nil && looksLikeModel(s) {
						out = append(out, s)
					}
				}
				return true
			})
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	gen := casegen.Generator(casegen.DefaultOptions)
	for i := range 40 {
		out = append(out, gen.Example(i).Model)
	}
	return out
}

func looksLikeModel(s string) bool {
	return strings.Contains(s, "measure ") || strings.Contains(s, "table ") || strings.Contains(s, "view ")
}
