package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"testing"
)

// Verify tests: each file in testdata/verify/*.sql is a handwritten query
// whose header says how to run verify on it (against shop.roll, edits.roll
// and testdata/verify/extra.roll) and what must come out:
//
//	-- args: ARGS                       the verify options (quotes allowed)
//	-- exit: N                          the exit code
//	-- differ: M @ ROW : DIAGNOSIS      a value that differs ("none": no diagnosis)
//	-- only: sql|rollwise @ ROW : DIAGNOSIS   a row on one side only
//	-- ambiguous: N                     rows that cannot be told apart
//	-- stdout: TEXT / -- stderr: TEXT   text the output must hold
//
// ROW is ref=value for each --by column, comma-separated: * for a
// rolled-up column, null for a NULL group. The differ and only lines list
// every difference and every one-sided row: anything else is a failure.

const (
	verifyEdits = "../../testdata/exec/edits.roll"
	verifyExtra = "../../testdata/verify/extra.roll"
)

type verifyCase struct {
	args      []string
	exit      int
	differ    []string
	only      []string
	ambiguous int
	stdout    []string
	stderr    []string
}

func readVerifyCase(t *testing.T, path string) verifyCase {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	c := verifyCase{exit: -1}
	for _, line := range strings.Split(string(b), "\n") {
		key, val, ok := strings.Cut(strings.TrimPrefix(line, "-- "), ": ")
		if !strings.HasPrefix(line, "-- ") || !ok {
			continue
		}
		val = strings.TrimSpace(val)
		switch key {
		case "args":
			c.args, err = splitArgs(val)
			if err != nil {
				t.Fatalf("%s: args: %v", path, err)
			}
		case "exit":
			c.exit, err = strconv.Atoi(val)
		case "differ":
			c.differ = append(c.differ, normSpec(val))
		case "only":
			c.only = append(c.only, normSpec(val))
		case "ambiguous":
			c.ambiguous, err = strconv.Atoi(val)
		case "stdout":
			c.stdout = append(c.stdout, val)
		case "stderr":
			c.stderr = append(c.stderr, val)
		}
		if err != nil {
			t.Fatalf("%s: %s: %v", path, key, err)
		}
	}
	if c.args == nil || c.exit < 0 {
		t.Fatalf("%s: the header needs an args line and an exit line", path)
	}
	return c
}

// normSpec removes the spaces around the separators of a differ or only
// line.
func normSpec(s string) string {
	f := strings.Fields(s)
	return strings.Join(f, " ")
}

// splitArgs splits a command line at spaces, keeping double-quoted parts
// together.
func splitArgs(s string) ([]string, error) {
	var out []string
	var cur strings.Builder
	in, has := false, false
	for _, r := range s {
		switch {
		case r == '"':
			in, has = !in, true
		case r == ' ' && !in:
			if has {
				out = append(out, cur.String())
				cur.Reset()
				has = false
			}
		default:
			cur.WriteRune(r)
			has = true
		}
	}
	if in {
		return nil, fmt.Errorf("unclosed quote in %q", s)
	}
	if has {
		out = append(out, cur.String())
	}
	return out, nil
}

// verifyJSON is the part of verify's JSON report the tests read.
type verifyJSON struct {
	OK          bool     `json:"ok"`
	By          []string `json:"by"`
	Differences []struct {
		Row       map[string]any `json:"row"`
		RolledUp  []string       `json:"rolled_up"`
		Measure   string         `json:"measure"`
		Diagnosis *string        `json:"diagnosis"`
	} `json:"differences"`
	SQLOnly      []verifyJSONRow `json:"sql_only"`
	RollwiseOnly []verifyJSONRow `json:"rollwise_only"`
	Ambiguous    []any           `json:"ambiguous"`
}

type verifyJSONRow struct {
	Row       map[string]any `json:"row"`
	RolledUp  []string       `json:"rolled_up"`
	Diagnosis *string        `json:"diagnosis"`
}

// rowSpec writes a JSON row as ROW.
func rowSpec(by []string, row map[string]any, rolled []string) string {
	var parts []string
	for _, g := range by {
		v := row[g]
		s := fmt.Sprint(v)
		switch {
		case contains(rolled, g):
			s = "*"
		case v == nil:
			s = "null"
		}
		parts = append(parts, g+"="+s)
	}
	return strings.Join(parts, ",")
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

func diagName(d *string) string {
	if d == nil {
		return "none"
	}
	return *d
}

func TestVerifyCases(t *testing.T) {
	t.Parallel()
	files, _ := filepath.Glob("../../testdata/verify/*.sql")
	if len(files) < 10 {
		t.Fatalf("found %d verify cases", len(files))
	}
	for _, f := range files {
		t.Run(strings.TrimSuffix(filepath.Base(f), ".sql"), func(t *testing.T) {
			c := readVerifyCase(t, f)
			args := append([]string{"verify", shopModel, verifyEdits, verifyExtra, "--sql", f, "--format", "json"}, c.args...)
			var out, errb bytes.Buffer
			code := Main(args, strings.NewReader(""), &out, &errb)
			if code != c.exit {
				t.Fatalf("exit %d, want %d\nstdout:\n%s\nstderr:\n%s", code, c.exit, out.String(), errb.String())
			}
			for _, s := range c.stderr {
				if !strings.Contains(errb.String(), s) {
					t.Errorf("stderr lacks %q:\n%s", s, errb.String())
				}
			}
			if strings.Contains(errb.String(), "panic") || strings.Contains(errb.String(), "goroutine") ||
				strings.Contains(errb.String(), "internal error") {
				t.Errorf("stderr shows an internal failure:\n%s", errb.String())
			}
			if out.Len() == 0 {
				if len(c.differ)+len(c.only)+c.ambiguous+len(c.stdout) > 0 {
					t.Fatalf("no report; stderr:\n%s", errb.String())
				}
				return
			}
			var rep verifyJSON
			if err := json.Unmarshal(out.Bytes(), &rep); err != nil {
				t.Fatalf("bad JSON: %v\n%s", err, out.String())
			}
			if rep.OK != (code == 0) {
				t.Errorf("ok is %v with exit %d", rep.OK, code)
			}
			var differ, only []string
			for _, d := range rep.Differences {
				differ = append(differ, fmt.Sprintf("%s @ %s : %s", d.Measure, rowSpec(rep.By, d.Row, d.RolledUp), diagName(d.Diagnosis)))
			}
			for _, r := range rep.SQLOnly {
				only = append(only, fmt.Sprintf("sql @ %s : %s", rowSpec(rep.By, r.Row, r.RolledUp), diagName(r.Diagnosis)))
			}
			for _, r := range rep.RollwiseOnly {
				only = append(only, fmt.Sprintf("rollwise @ %s : %s", rowSpec(rep.By, r.Row, r.RolledUp), diagName(r.Diagnosis)))
			}
			sameSet(t, "differences", differ, c.differ, out.String())
			sameSet(t, "one-sided rows", only, c.only, out.String())
			if len(rep.Ambiguous) != c.ambiguous {
				t.Errorf("%d ambiguous groups, want %d\n%s", len(rep.Ambiguous), c.ambiguous, out.String())
			}
			if len(c.stdout) > 0 {
				// The table format is for people: check the text there.
				var text bytes.Buffer
				Main(append([]string{"verify", shopModel, verifyEdits, verifyExtra, "--sql", f}, c.args...), strings.NewReader(""), &text, &bytes.Buffer{})
				for _, s := range c.stdout {
					if !strings.Contains(text.String(), s) {
						t.Errorf("stdout lacks %q:\n%s", s, text.String())
					}
				}
			}
		})
	}
}

func sameSet(t *testing.T, what string, got, want []string, report string) {
	t.Helper()
	g := append([]string{}, got...)
	w := append([]string{}, want...)
	sort.Strings(g)
	sort.Strings(w)
	if strings.Join(g, "\n") != strings.Join(w, "\n") {
		t.Errorf("%s:\ngot:\n  %s\nwant:\n  %s\nreport:\n%s", what, strings.Join(g, "\n  "), strings.Join(w, "\n  "), report)
	}
}

// Usage errors found before any SQL runs: exit 2 and a message that says
// what to do.
func TestVerifyUsageErrors(t *testing.T) {
	t.Parallel()
	right := "../../testdata/verify/right_grand.sql"
	cases := []struct {
		args []string
		want string
	}{
		{[]string{"--sql", right, "-m", "revenue", "-b", "sales.item", "--map", "profit=revenue"}, `--map names "profit", which is neither a measure of the query (revenue) nor a --by column (sales.item)`},
		{[]string{"--sql", right, "-m", "revenue", "-b", "sales.item", "--map", "revenue"}, "--map takes MEASURE=COLUMN"},
		{[]string{"--sql", "no/such/file.sql", "-m", "revenue"}, "cannot read the handwritten SQL"},
		{[]string{"-m", "revenue"}, "name the handwritten SQL with --sql FILE.sql"},
		{[]string{"--sql", right, "-m", "revenue", "--format", "csv"}, `unknown format "csv"`},
		{[]string{"--sql", right, "-m", "revenue", "-d", "nosuch"}, "unknown dialect"},
		{[]string{"--sql", right, "-m", "revenue", "-d", "postgres"}, "needs --dsn"},
		{[]string{"--sql", right, "-m", "revenue", "-b", "sales.item", "--tolerance", "-1"}, "--tolerance must be a number of 0 or more"},
	}
	for _, c := range cases {
		var out, errb bytes.Buffer
		code := Main(append([]string{"verify", shopModel}, c.args...), strings.NewReader(""), &out, &errb)
		if code != exitUsage {
			t.Errorf("%v: exit %d, want 2\n%s", c.args, code, errb.String())
		}
		if !strings.Contains(errb.String(), c.want) {
			t.Errorf("%v: stderr lacks %q:\n%s", c.args, c.want, errb.String())
		}
	}
}

// The same file judged at another tolerance: a revenue 10% high agrees
// within a tolerance of 0.2 only where one side is inexact; both sides are
// exact decimals here, so it still differs.
func TestVerifyToleranceKeepsExactValuesExact(t *testing.T) {
	t.Parallel()
	f := "../../testdata/verify/no_known_mistake.sql"
	var out, errb bytes.Buffer
	code := Main([]string{"verify", shopModel, "--sql", f, "-m", "revenue", "-b", "sales.item", "--tolerance", "0.2"},
		strings.NewReader(""), &out, &errb)
	if code != exitFindings || !strings.Contains(out.String(), "3 differ") {
		t.Errorf("exit %d, want 1 with 3 differences:\n%s%s", code, out.String(), errb.String())
	}
}

// Inexact values agree within the relative tolerance: a margin rate
// rounded to three places differs at the default tolerance and agrees at
// 0.01.
func TestVerifyTolerance(t *testing.T) {
	t.Parallel()
	f := filepath.Join(t.TempDir(), "rounded.sql")
	sql := `SELECT s.item, ROUND((SUM(s.price * s.qty) - SUM(s.cost * s.qty)) / SUM(s.price * s.qty), 3) AS margin_rate
FROM shop.sales AS s GROUP BY s.item`
	if err := os.WriteFile(f, []byte(sql), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		tol  string
		exit int
	}{{"1e-9", exitFindings}, {"0.01", exitOK}} {
		var out, errb bytes.Buffer
		code := Main([]string{"verify", shopModel, "--sql", f, "-m", "margin_rate", "-b", "sales.item", "--tolerance", c.tol},
			strings.NewReader(""), &out, &errb)
		if code != c.exit {
			t.Errorf("--tolerance %s: exit %d, want %d\n%s%s", c.tol, code, c.exit, out.String(), errb.String())
		}
	}
}
