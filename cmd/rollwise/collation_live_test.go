package main

import (
	"bytes"
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/livetest"
)

// On MySQL/MariaDB a group column's collation decides which values are one
// group: under a case-insensitive or PAD SPACE collation 'North', 'north'
// and 'North ' are one group, where DuckDB and the other engines have
// three. run --dsn must then say so (a caution), and must not when the
// column compares bytes exactly. (MySQL reference manual, "Trailing Space
// Handling in Comparisons" and "Collation Naming Conventions", read from
// memory: _ci is case-insensitive; every MariaDB collation but the
// _nopad_ ones is PAD SPACE.)
func TestRunDSNCautionsOnLooseCollation(t *testing.T) {
	t.Parallel()
	e := livetest.Empty(t, "mysql", "collation")
	ctx := context.Background()
	for _, stmt := range []string{
		"CREATE TABLE loose (id INTEGER PRIMARY KEY, aisle VARCHAR(20) COLLATE utf8mb4_general_ci)",
		"CREATE TABLE exact (id INTEGER PRIMARY KEY, aisle VARCHAR(20) COLLATE utf8mb4_nopad_bin)",
		"CREATE TABLE padded (id INTEGER PRIMARY KEY, aisle VARCHAR(20) COLLATE utf8mb4_bin)",
	} {
		if err := e.Live.Exec(ctx, stmt); err != nil {
			t.Fatal(err)
		}
	}
	for _, tbl := range []string{"loose", "exact", "padded"} {
		if err := e.Live.Exec(ctx, "INSERT INTO "+tbl+" VALUES (1, 'North'), (2, 'north'), (3, 'North ')"); err != nil {
			t.Fatal(err)
		}
	}
	dir := t.TempDir()
	model := filepath.Join(dir, "aisles.roll")
	src := ""
	for _, tbl := range []string{"loose", "exact", "padded"} {
		src += "table " + tbl + " {\n  key id\n  id integer\n  aisle text\n}\nmeasure " + tbl + "_lines = count(" + tbl + ".id)\n"
	}
	if err := os.WriteFile(model, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	cases := []struct {
		table   string
		groups  int    // the rows the server returns
		caution string // "" for none
	}{
		{"loose", 1, "ignores case and ignores trailing spaces"},
		{"padded", 2, "has collation utf8mb4_bin, which ignores trailing spaces"},
		{"exact", 3, ""},
	}
	for _, c := range cases {
		t.Run(c.table, func(t *testing.T) {
			var out, errb bytes.Buffer
			code := Main([]string{"run", model, "-m", c.table + "_lines", "-b", c.table + ".aisle", "--dsn", e.DSN, "--format", "json"},
				strings.NewReader(""), &out, &errb)
			if code != 0 {
				t.Fatalf("exit %d: %s", code, errb.String())
			}
			var rows []map[string]any
			if err := json.Unmarshal(out.Bytes(), &rows); err != nil {
				t.Fatal(err)
			}
			if len(rows) != c.groups {
				t.Errorf("%d groups, want %d: %v", len(rows), c.groups, rows)
			}
			got := strings.Contains(errb.String(), "caution: ") && strings.Contains(errb.String(), "group column "+c.table+".aisle")
			if c.caution == "" && got {
				t.Errorf("a caution for a binary NO PAD column:\n%s", errb.String())
			}
			if c.caution != "" && (!got || !strings.Contains(errb.String(), c.caution)) {
				t.Errorf("stderr lacks the caution %q:\n%s", c.caution, errb.String())
			}
		})
	}
}
