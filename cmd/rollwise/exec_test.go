package main

import (
	"bytes"
	"encoding/json"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/planner/reference/expect"
)

// Execution tests: the generated SQL runs on the embedded DuckDB over the
// hand-made tables of testdata/exec, and every value is compared with a
// number worked out by hand (the arithmetic is in the comment beside it;
// the rows are listed in planner/reference/expect/shop.go).

const (
	shopModel  = "../../testdata/exec/shop.roll"
	editsModel = "../../testdata/exec/edits.roll"
)

// row, expectRows, sameValue, dump and none: see package expect.
type row = expect.Row

var (
	expectRows = expect.Rows
	sameValue  = expect.Same
	dump       = expect.Dump
	none       = expect.None
)

// runJSON runs the CLI in-process and decodes its JSON output.
func runJSON(t *testing.T, args ...string) []map[string]any {
	t.Helper()
	var out, errb bytes.Buffer
	code := Main(append(args, "--format", "json"), strings.NewReader(""), &out, &errb)
	if code != 0 {
		t.Fatalf("rollwise %s: exit %d\n%s", strings.Join(args, " "), code, errb.String())
	}
	dec := json.NewDecoder(&out)
	dec.UseNumber()
	var rows []map[string]any
	if err := dec.Decode(&rows); err != nil {
		t.Fatalf("bad JSON: %v\n%s", err, out.String())
	}
	crossCheck(t, args, rows) // the same run on the live engines (live_test.go)
	return rows
}

// TestHandWorked runs every hand-worked case (expect.Cases: the shop,
// its cell edits and per-grain measures, its time edits) through `rollwise
// run` on DuckDB, and through crossCheck on the live engines. The
// reference evaluator's TestHandWorked computes the same rows without
// SQL. A case the SQL path does not plan yet must be refused with the
// error it names.
func TestHandWorked(t *testing.T) {
	t.Parallel()
	for _, c := range expect.Cases {
		t.Run(c.Name, func(t *testing.T) {
			args := c.Args("../..")
			if c.NotInSQL == "" {
				expectRows(t, runJSON(t, args...), c.Rows)
				return
			}
			var out, errb bytes.Buffer
			code := Main(args, strings.NewReader(""), &out, &errb)
			if code == 0 || !strings.Contains(errb.String(), c.NotInSQL) {
				t.Errorf("want the refusal %q, got exit %d:\n%s%s", c.NotInSQL, code, out.String(), errb.String())
			}
		})
	}
}
