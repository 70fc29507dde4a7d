package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/livetest"
)

// derivedChainModel is issue 17.4's model: derived columns that each read
// the one before twice, c{i} = c{i-1} + c{i-1}, so that c40 is 2^40 times
// c0, and written out inline it would be 2^40 copies of it.
func derivedChainModel(n int) string {
	var b strings.Builder
	b.WriteString("table g from \"g.csv\" {\n  key name\n  name text\n  label text\n}\n\n")
	b.WriteString("table t from \"t.csv\" {\n  key id\n  id integer\n  v integer\n  grp text -> g.name\n  c0 = v\n")
	for i := 1; i <= n; i++ {
		fmt.Fprintf(&b, "  c%d = c%d + c%d\n", i, i-1, i-1)
	}
	fmt.Fprintf(&b, "}\n\nmeasure total = sum(t.c%d)\nmeasure top = max(t.c%d)\n", n, n)
	return b.String()
}

// TestDerivedChainOncePerRow compiles the 40-deep chain of doubling
// derived columns to small SQL (each column computed once per row and
// read by name) and runs it on DuckDB and SQLite: the values must be
// exactly 2^40 times the base, by group and in total, with a filter on the
// deepest column and a joined table (whose join the planner decides by
// asking whether the filter rejects NULLs: once per column, too).
func TestDerivedChainOncePerRow(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	model := filepath.Join(dir, "chain.roll")
	if err := os.WriteFile(model, []byte(derivedChainModel(40)), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "g.csv"), []byte("name,label\na,A\nb,B\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "t.csv"), []byte("id,v,grp\n1,1,a\n2,2,a\n3,3,b\n4,-5,b\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	args := []string{model, "-m", "total,top", "-b", "t.grp", "--totals", "grand", "-w", "t.c40 > 0 and g.label <> 'x'"}
	for _, d := range []string{"duckdb", "postgres", "sqlite", "mysql", "sqlserver"} {
		var out, errb bytes.Buffer
		if code := Main(append([]string{"sql", "-d", d}, args...), nil, &out, &errb); code != 0 {
			t.Fatalf("%s: exit %d: %s", d, code, errb.String())
		}
		if out.Len() > 20<<10 {
			t.Errorf("%s: %d bytes of SQL, want under 20 KiB", d, out.Len())
		}
	}
	// 2^40 = 1099511627776; the filter keeps the rows with v > 0.
	const p = 1099511627776
	want := fmt.Sprintf(`[{"rolled_up":[],"t.grp":"a","top":%d,"total":%d},{"rolled_up":[],"t.grp":"b","top":%d,"total":%d},{"rolled_up":["t.grp"],"t.grp":null,"top":%d,"total":%d}]`,
		2*p, 3*p, 3*p, 3*p, 3*p, 6*p)
	check := func(name string, rows []map[string]any) {
		t.Helper()
		got, _ := json.Marshal(rows)
		if string(got) != want {
			t.Errorf("%s:\n got %s\nwant %s", name, got, want)
		}
	}
	check("duckdb", runJSON(t, append([]string{"run", "--data", dir}, args...)...))
	m, err := diffLoadModel(model)
	if err != nil {
		t.Fatal(err)
	}
	e := livetest.Open(t, "sqlite", "derived_chain", m, dir)
	defer e.Close()
	check("sqlite", runJSON(t, append([]string{"run", "--dsn", e.DSN}, args...)...))
}
