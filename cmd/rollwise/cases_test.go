package main

import (
	"path/filepath"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/dialects/goldencases"
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

// goldenCases are the cases, as goldencases lists them, with their
// model files' paths from this folder.
func goldenCases(t *testing.T) []goldencases.Case {
	t.Helper()
	cs, err := goldencases.Read("../..")
	if err != nil {
		t.Fatal(err)
	}
	for i := range cs {
		models := make([]string, len(cs[i].Models))
		for j, m := range cs[i].Models {
			models[j] = filepath.Join("../..", m)
		}
		cs[i].Models = models
	}
	return cs
}

func lastLine(s string) string {
	lines := strings.Split(strings.TrimSpace(s), "\n")
	return strings.TrimPrefix(lines[len(lines)-1], "rollwise: ")
}
