package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestCountsAreSpelledForPeople: a count of one takes the singular
// ("1 measure", not "1 measures") in the summaries of check.
func TestCountsAreSpelledForPeople(t *testing.T) {
	t.Parallel()
	model := filepath.Join(t.TempDir(), "one.roll")
	src := "table t at \"t\" from \"t.csv\" {\n  key id\n  id integer\n}\nmeasure n = count(*)\n"
	if err := os.WriteFile(model, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	var out bytes.Buffer
	if code := Main([]string{"check", model}, nil, &out, &out); code != 0 {
		t.Fatalf("check exited %d: %s", code, out.String())
	}
	if got, want := out.String(), "ok: 1 table, 1 measure, 0 views\n"; got != want {
		t.Errorf("check printed %q, want %q", got, want)
	}
}

// TestRunDialectWithoutDSNSaysWhatToDo: `run -d postgres` without --dsn
// is a usage error that points at --dsn and at `sql -d`, and no longer
// speaks of live databases as a thing to come.
func TestRunDialectWithoutDSNSaysWhatToDo(t *testing.T) {
	t.Parallel()
	var out bytes.Buffer
	code := Main([]string{"run", "../../testdata/exec/shop.roll", "-m", "revenue", "-d", "postgres"}, nil, &out, &out)
	msg := out.String()
	if code != exitUsage || !strings.Contains(msg, "--dsn URL") || !strings.Contains(msg, "rollwise sql -d postgres") ||
		strings.Contains(msg, "until") {
		t.Errorf("exit %d, message %q", code, msg)
	}
}
