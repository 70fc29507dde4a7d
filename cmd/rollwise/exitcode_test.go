package main

import (
	"bytes"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
)

// TestExitCodes checks the one mapping from kinds of failure to exit
// codes through Main, one case of each kind, as the design's exit codes
// give them (0 ok, 1 findings, 2 usage, 3 internal; common practice of
// command-line tools, and the GitHub CLI's mapping).
func TestExitCodes(t *testing.T) {
	model := "../../testdata/exec/shop.roll"
	for _, c := range []struct {
		args []string
		code int
		want string // in stderr
	}{
		{[]string{"check", model}, exitOK, "ok:"},
		// A flag cobra cannot parse: usage, with the hint to see the help.
		{[]string{"sql", model, "--limit", "many"}, exitUsage, "run 'rollwise --help' for usage"},
		// An unknown command, which only cobra sees.
		{[]string{"compute", model}, exitUsage, "run 'rollwise --help' for usage"},
		// A usage error of rollwise's own code: no help hint.
		{[]string{"sql", model, "-m", "revenue", "--limit", "-1"}, exitUsage, "--limit must be a positive number"},
		// An error in the query: findings.
		{[]string{"sql", model, "-m", "revenu"}, exitFindings, "1 error"},
		// Data that cannot be read: input, exit 1 too.
		{[]string{"run", model, "-m", "revenue", "--data", t.TempDir()}, exitFindings, ""},
	} {
		var out, errb bytes.Buffer
		code := Main(c.args, nil, &out, &errb)
		if code != c.code || !strings.Contains(errb.String(), c.want) {
			t.Errorf("%v: exit %d, want %d and %q in:\n%s", c.args, code, c.code, c.want, errb.String())
		}
		if c.code == exitUsage && strings.Contains(c.want, "--limit must") && strings.Contains(errb.String(), "--help") {
			t.Errorf("%v: a usage error of rollwise's own code names --help:\n%s", c.args, errb.String())
		}
	}
}

// TestExitCodeOfEachKind pins the mapping itself, internal errors
// included, which no command line provokes on purpose.
func TestExitCodeOfEachKind(t *testing.T) {
	for k, want := range map[failure.Kind]int{failure.Usage: exitUsage, failure.Findings: exitFindings,
		failure.Input: exitFindings, failure.Internal: exitInternal} {
		if got := exitCode(k); got != want {
			t.Errorf("kind %d: exit %d, want %d", k, got, want)
		}
	}
}
