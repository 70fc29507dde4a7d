package main

import (
	"bytes"
	"encoding/json"
	"flag"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

var update = flag.Bool("update", false, "rewrite the golden SQL files")

// TestGoldenSQL prints the SQL of each case in testdata/sql (one case per
// file: the arguments as a JSON array, a ---- line, then the statement) and
// compares it with the file. go test ./cmd/rollwise -update rewrites them;
// read the diff before committing. TestGoldenSQLRuns runs every statement.
func TestGoldenSQL(t *testing.T) {
	files, _ := filepath.Glob("../../testdata/sql/*.test")
	if len(files) == 0 {
		t.Fatal("no golden cases")
	}
	for _, f := range files {
		t.Run(strings.TrimSuffix(filepath.Base(f), ".test"), func(t *testing.T) {
			b, err := os.ReadFile(f)
			if err != nil {
				t.Fatal(err)
			}
			head, want, ok := strings.Cut(string(b), "----\n")
			if !ok {
				t.Fatalf("%s: no ---- line", f)
			}
			var args []string
			if err := json.Unmarshal([]byte(head), &args); err != nil {
				t.Fatalf("%s: the first line must be a JSON array of arguments: %v", f, err)
			}
			var out, errb bytes.Buffer
			if code := Main(append([]string{"sql", shopModel, editsModel}, args...), nil, &out, &errb); code != 0 {
				t.Fatalf("exit %d: %s", code, errb.String())
			}
			if *update {
				if err := os.WriteFile(f, []byte(head+"----\n"+out.String()), 0o644); err != nil {
					t.Fatal(err)
				}
				return
			}
			if out.String() != want {
				t.Errorf("SQL changed (review, then go test ./cmd/rollwise -run TestGoldenSQL -update):\n%s", lineDiff(want, out.String()))
			}
			// The same SQL must run: the golden text is never the only check.
			rows := runJSON(t, append([]string{"run", shopModel, editsModel}, args...)...)
			if rows == nil {
				t.Errorf("no rows")
			}
		})
	}
}

// lineDiff shows the first lines where two texts differ.
func lineDiff(want, got string) string {
	w, g := strings.Split(want, "\n"), strings.Split(got, "\n")
	var b strings.Builder
	for i := 0; i < max(len(w), len(g)); i++ {
		var a, c string
		if i < len(w) {
			a = w[i]
		}
		if i < len(g) {
			c = g[i]
		}
		if a != c {
			b.WriteString("- " + a + "\n+ " + c + "\n")
		}
	}
	return b.String()
}
