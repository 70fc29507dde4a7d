package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// Smaller points of issue 17 (item 10): each is a clean refusal with the
// right exit code, or a name that now reaches the model as written.

// oddModel has measures whose names hold a comma, a double quote, and a
// dot that makes them look like a group column.
const oddModel = "table sales from \"s.csv\" {\n  key id\n  id integer\n  store_id integer -> stores.id\n  qty integer\n  dbl = qty * 2\n}\n" +
	"table stores from \"st.csv\" {\n  key id\n  id integer\n  region text\n}\n" +
	"measure `stores.region` = sum(sales.qty)\nmeasure `a,b` = count(sales.qty)\nmeasure `q\"x` = max(sales.qty)\n"

// runIn runs the CLI with the model written to dir and returns the exit
// code, stdout and stderr.
func runIn(t *testing.T, dir, model string, args ...string) (int, string, string) {
	t.Helper()
	path := filepath.Join(dir, "m.roll")
	if err := os.WriteFile(path, []byte(model), 0o644); err != nil {
		t.Fatal(err)
	}
	for i, a := range args {
		if a == "MODEL" {
			args[i] = path
		}
	}
	var out, errb bytes.Buffer
	code := Main(args, nil, &out, &errb)
	if strings.Contains(errb.String(), "goroutine ") || strings.Contains(errb.String(), "panic") {
		t.Errorf("a stack trace on stderr:\n%s", errb.String())
	}
	return code, out.String(), errb.String()
}

// TestListFlagsReadBackquotes: -m and -b split at commas outside
// backquotes and take a double quote as it is (pflag's CSV reading split
// `a,b` in two and refused q"x).
func TestListFlagsReadBackquotes(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	code, out, errb := runIn(t, dir, oddModel, "sql", "MODEL", "-m", "`a,b`", "-m", "q\"x", "-b", "stores.region")
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errb)
	}
	for _, want := range []string{`AS "a,b"`, `"q""x"`, `"stores.region"`} {
		if !strings.Contains(out, want) {
			t.Errorf("the SQL has no %s:\n%s", want, out)
		}
	}
}

// TestMeasureNamedLikeGroupColumnIsRefused: sql exits 1 with the clash
// named, instead of printing SQL with two columns of one name.
func TestMeasureNamedLikeGroupColumnIsRefused(t *testing.T) {
	t.Parallel()
	code, out, errb := runIn(t, t.TempDir(), oddModel, "sql", "MODEL", "-m", "`stores.region`", "-b", "stores.region")
	if code != exitFindings || out != "" || !strings.Contains(errb, "would both be output columns") {
		t.Errorf("exit %d, stdout %q, stderr %q", code, out, errb)
	}
}

// TestViewsFolderArguments: --out "" and --check on a file are usage
// errors (they printed to stdout and exited 3); a view whose file name
// no file system holds is refused before anything is written, and a
// refused --out a/b/c leaves no a/b behind.
func TestViewsFolderArguments(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	file := filepath.Join(dir, "f.txt")
	if err := os.WriteFile(file, []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, args := range [][]string{{"--out", ""}, {"--check", ""}, {"--check", file}} {
		code, out, errb := runIn(t, dir, oddModel, append([]string{"views", "MODEL"}, args...)...)
		if code != exitUsage || out != "" || errb == "" {
			t.Errorf("views %q: exit %d, stdout %q, stderr %q; want exit %d", args, code, out, errb, exitUsage)
		}
	}
	long := oddModel + "view " + strings.Repeat("v", 300) + " = units by sales.qty\nmeasure units = sum(sales.qty)\n"
	nested := filepath.Join(dir, "a", "b", "c")
	code, _, errb := runIn(t, dir, long, "views", "MODEL", "--out", nested)
	if code != exitFindings || !strings.Contains(errb, "file systems take at most 255") {
		t.Errorf("long view name: exit %d, stderr %q", code, errb)
	}
	if _, err := os.Stat(filepath.Join(dir, "a")); !os.IsNotExist(err) {
		t.Errorf("a refused --out left %s behind (%v)", filepath.Join(dir, "a"), err)
	}
}

// TestCheckDialectNameLimits: `check -d` refuses names longer than the
// engine keeps (PostgreSQL: 63 bytes, truncated silently, so a UTF-8
// name of 40 two-byte letters is too long; MySQL: 64 characters, so the
// same name fits), and a dialect without a documented limit checks none.
func TestCheckDialectNameLimits(t *testing.T) {
	t.Parallel()
	model := "table sales at \"s." + strings.Repeat("r", 70) + "\" from \"s.csv\" {\n  key id\n  id integer\n  qty integer\n}\n" +
		"measure " + strings.Repeat("m", 64) + " = sum(sales.qty)\nmeasure `" + strings.Repeat("é", 40) + "` = count(sales.qty)\n"
	cases := []struct {
		dialect string
		code    int
		errors  int
	}{{"postgres", exitFindings, 3}, {"mysql", exitFindings, 1}, {"sqlserver", 0, 0}, {"duckdb", 0, 0}, {"", 0, 0}}
	for _, c := range cases {
		args := []string{"check", "MODEL"}
		if c.dialect != "" {
			args = append(args, "-d", c.dialect)
		}
		code, _, errb := runIn(t, t.TempDir(), model, args...)
		if code != c.code || strings.Count(errb, "error: ") != c.errors {
			t.Errorf("check -d %q: exit %d with %d errors, want %d and %d:\n%s", c.dialect, code, strings.Count(errb, "error: "), c.code, c.errors, errb)
		}
	}
}

// TestCheckDialectRendersViews: `check -d` renders every view for the
// dialect, so a construct the engine cannot express exactly (a sample
// variance on SQLite, which has no such aggregate: docs/dialects.md) is
// an error at the view's line, not a surprise in `views`; on DuckDB the
// same model is fine, and a view that does not use it passes on SQLite.
func TestCheckDialectRendersViews(t *testing.T) {
	t.Parallel()
	model := "table sales at \"sales\" from \"sales.csv\" {\n  key id\n  id integer\n  qty integer\n}\n" +
		"measure spread = variance(sales.qty)\nmeasure units = sum(sales.qty)\n" +
		"view plain = units by sales.id\nview spreads = spread, units by sales.id\n"
	for _, c := range []struct {
		dialect string
		code    int
		want    string
	}{{"sqlite", exitFindings, "m.roll:9:6: error: view spreads: sqlite cannot express the sample variance exactly"}, {"duckdb", 0, "ok: 1 table, 2 measures, 2 views"}} {
		code, _, errb := runIn(t, t.TempDir(), model, "check", "MODEL", "-d", c.dialect)
		if code != c.code || !strings.Contains(errb, c.want) || strings.Count(errb, "error: ") > 1 {
			t.Errorf("check -d %s: exit %d, want %d and %q:\n%s", c.dialect, code, c.code, c.want, errb)
		}
	}
}
