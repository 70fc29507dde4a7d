package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// The cases of the golden SQL (testdata/sql, testdata/dialects/{lab,
// hostile,time}): the dialects package compares their SQL text with the
// golden files (dialects/golden_test.go, no engine); here the execution
// suite runs each of them (TestCasesRunOnEveryEngine), on DuckDB and,
// through runJSON's cross-check, on the live engines.

const (
	labModel     = "../../testdata/dialects/lab.roll"
	hostileModel = "../../testdata/dialects/hostile.roll"
)

// goldenSets are the case folders and the models their cases run on.
var goldenSets = []struct {
	name, dir string
	models    []string
}{
	{"shop", "../../testdata/sql", []string{shopModel, editsModel}},
	{"lab", "../../testdata/dialects/lab", []string{labModel}},
	{"hostile", "../../testdata/dialects/hostile", []string{hostileModel}},
	{"time", "../../testdata/dialects/time", []string{timeModel}},
}

// goldenCase is one case: its set, name, models and arguments.
type goldenCase struct {
	set, name string
	models    []string
	args      []string
}

func goldenCases(t *testing.T) []goldenCase {
	t.Helper()
	var out []goldenCase
	for _, s := range goldenSets {
		files, _ := filepath.Glob(filepath.Join(s.dir, "*.test"))
		if len(files) == 0 {
			t.Fatalf("no cases in %s", s.dir)
		}
		for _, f := range files {
			b, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			head, _, _ := strings.Cut(string(b), "----\n")
			var args []string
			if err := json.Unmarshal([]byte(head), &args); err != nil {
				t.Fatalf("%s: the first line must be a JSON array of arguments: %v", f, err)
			}
			out = append(out, goldenCase{set: s.name, name: strings.TrimSuffix(filepath.Base(f), ".test"), models: s.models, args: args})
		}
	}
	return out
}

func lastLine(s string) string {
	lines := strings.Split(strings.TrimSpace(s), "\n")
	return strings.TrimPrefix(lines[len(lines)-1], "rollwise: ")
}
