package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestReadmeBadRollExample replays the README's "mistakes are caught"
// example as a reader would: the demo's model written by `rollwise demo`,
// bad.roll exactly as the README shows it, and `rollwise check` run from the
// same folder. The output and the exit code must be the ones the README
// prints, so the position it shows can always be reproduced.
func TestReadmeBadRollExample(t *testing.T) {
	readme, err := os.ReadFile("../../README.md")
	if err != nil {
		t.Fatal(err)
	}
	file, command, want := readmeCheckExample(t, string(readme))
	dir := t.TempDir()
	t.Chdir(dir)
	if code := Main([]string{"demo", "--dir", "garden"}, nil, &bytes.Buffer{}, &bytes.Buffer{}); code != 0 {
		t.Fatalf("demo --dir garden exited %d", code)
	}
	if err := os.WriteFile(filepath.Join(dir, "bad.roll"), []byte(file), 0o644); err != nil {
		t.Fatal(err)
	}
	var out bytes.Buffer
	code := Main(strings.Fields(command)[1:], nil, &out, &out)
	if code != 1 {
		t.Errorf("%s exited %d, the README says a model error exits 1", command, code)
	}
	if got := out.String(); got != want {
		t.Errorf("%s printed\n%s\nthe README shows\n%s", command, got, want)
	}
}

// readmeCheckExample finds the code block that starts with `$ cat bad.roll`
// and returns the file's text, the `rollwise check` command line and the
// output shown after it.
func readmeCheckExample(t *testing.T, readme string) (file, command, output string) {
	t.Helper()
	start := strings.Index(readme, "```\n$ cat bad.roll\n")
	if start < 0 {
		t.Fatal("the README has no block starting with `$ cat bad.roll`")
	}
	block := readme[start+len("```\n$ cat bad.roll\n"):]
	block = block[:strings.Index(block, "```")]
	i := strings.Index(block, "$ rollwise check ")
	if i < 0 {
		t.Fatal("the bad.roll block runs no `rollwise check`")
	}
	rest := block[i+2:]
	nl := strings.IndexByte(rest, '\n')
	return block[:i], rest[:nl], rest[nl+1:]
}
