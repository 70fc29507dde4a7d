package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/report"
)

// runErr runs the CLI in-process and returns its exit code and stderr.
func runErr(args ...string) (int, string) {
	var out, errb bytes.Buffer
	code := Main(args, strings.NewReader(""), &out, &errb)
	return code, errb.String()
}

// The messages of issue 13, each with what to write instead.
func TestMessagesSayWhatToWrite(t *testing.T) {
	t.Parallel()
	having := filepath.Join(t.TempDir(), "having.roll")
	if err := os.WriteFile(having, []byte("measure h = count(* per customers.id having orders.id > 1)\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name string
		args []string
		want []string
	}{
		{"per-grain over a table the grouping cannot reach", // every_customer iterates over customers; orders links to them
			[]string{"run", pergrainModel, "-m", "every_customer,big_buyers", "-b", "orders.channel"},
			[]string{"hint: orders reaches customers, not the other way: iterate over orders instead, for example count(distinct orders.customer_id)",
				"rollwise: 1 error\n"}}, // printed once, counted once (it was counted twice)
		{"a filter it cannot reach",
			[]string{"run", pergrainModel, "-m", "every_customer", "-w", "orders.channel = 'web'"},
			[]string{"for example count(distinct orders.customer_id) to count the customers rows that pass"}},
		{"a bare word in -w",
			[]string{"run", pergrainModel, "-m", "amount", "-w", "customers.region = East"},
			[]string{"hint: no column is called East: to compare with the text, quote it: 'East'"}},
		{"a bare column name in -w",
			[]string{"run", pergrainModel, "-m", "amount", "-w", "region = 'East'"},
			[]string{"hint: write columns as table.column, for example customers.region"}},
		{"a column inside having",
			[]string{"check", pergrainModel, having},
			[]string{"error: column orders.id is used outside an aggregate",
				"hint: having tests a measure of each group, not a row: write a measure such as max(orders.id) > 1, or add the column to the per columns (per customers.id, orders.id)"}},
	} {
		code, msg := runErr(c.args...)
		if code != exitFindings {
			t.Errorf("%s: exit %d, want %d\n%s", c.name, code, exitFindings, msg)
		}
		for _, w := range c.want {
			if !strings.Contains(msg, w) {
				t.Errorf("%s: missing %q in:\n%s", c.name, w, msg)
			}
		}
		if n := strings.Count(msg, ": error: "); !strings.Contains(msg, "rollwise: "+report.Count(n, "error")+"\n") {
			t.Errorf("%s: %d errors printed, but the summary says otherwise:\n%s", c.name, n, msg)
		}
	}
}
