// Package modeltest loads model files for tests: parsed and resolved as
// the command reads them (without its size caps), the test failed on the
// first error.
package modeltest

import (
	"os"
	"testing"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
)

// Files parses the model files at paths, each named by its path in
// positions.
func Files(t testing.TB, paths ...string) []*grammar.File {
	t.Helper()
	var files []*grammar.File
	for _, p := range paths {
		src, err := os.ReadFile(p)
		if err != nil {
			t.Fatal(err)
		}
		f, d := grammar.Parse(p, string(src))
		if d.HasErrors() {
			t.Fatalf("%s: %v", p, d.Errors()[0])
		}
		files = append(files, f)
	}
	return files
}

// Load parses and resolves the model files at paths.
func Load(t testing.TB, paths ...string) *model.Model {
	t.Helper()
	m, d := model.Load(Files(t, paths...))
	if d.HasErrors() {
		t.Fatalf("%v: %v", paths, d.Errors()[0])
	}
	return m
}
