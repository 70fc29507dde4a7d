package reference_test

import (
	"go/parser"
	"go/token"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"
)

const module = "github.com/rollwise/rollwise/"

// TestReferenceImportsOnlyTheModel checks the evaluator's independence
// from the SQL path: the packages of this module that the evaluator's own
// files import, directly or through others, are the grammar and
// planner/model, never planner/plan or dialects. The compiler then keeps
// the boundary: a plan type cannot reach the evaluator by accident.
func TestReferenceImportsOnlyTheModel(t *testing.T) {
	root, err := filepath.Abs("../..")
	if err != nil {
		t.Fatal(err)
	}
	seen := map[string]bool{}
	var visit func(pkg string)
	visit = func(pkg string) {
		for _, imp := range packageImports(t, filepath.Join(root, filepath.FromSlash(pkg))) {
			dep, ok := strings.CutPrefix(imp, module)
			if !ok || seen[dep] {
				continue
			}
			seen[dep] = true
			visit(dep)
		}
	}
	visit("planner/reference")
	var got []string
	for dep := range seen {
		got = append(got, dep)
	}
	slices.Sort(got)
	if want := []string{"grammar", "planner/model"}; !slices.Equal(got, want) {
		t.Errorf("planner/reference depends on the module's packages %q; want only %q (the evaluator must not share planning code with the SQL path)", got, want)
	}
}

// packageImports lists the import paths of the non-test Go files in dir.
func packageImports(t *testing.T, dir string) []string {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	fset := token.NewFileSet()
	for _, e := range entries {
		name := e.Name()
		if e.IsDir() || !strings.HasSuffix(name, ".go") || strings.HasSuffix(name, "_test.go") {
			continue
		}
		f, err := parser.ParseFile(fset, filepath.Join(dir, name), nil, parser.ImportsOnly)
		if err != nil {
			t.Fatal(err)
		}
		for _, imp := range f.Imports {
			p, err := strconv.Unquote(imp.Path.Value)
			if err != nil {
				t.Fatal(err)
			}
			out = append(out, p)
		}
	}
	return out
}
