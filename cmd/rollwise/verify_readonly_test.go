package main

import (
	"bytes"
	"context"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/livetest"
)

// verify --sql runs SQL that arrives in pull requests (issue 17, item 1):
// the probe's statements that emptied a table, dropped it, created one or
// ran a shell command through verify --dsn must be refused with a clear
// error (the file, line and column; what to write instead) before they
// reach the server, and leave the data as it was. Each engine gets its
// own test database (tag verify_readonly), loaded with the shop data.
func TestVerifyRefusesWritesOnLive(t *testing.T) {
	m, err := loadModel(&env{stdout: io.Discard, stderr: io.Discard}, []string{shopModel})
	if err != nil {
		t.Fatal(err)
	}
	for _, name := range livetest.Names {
		t.Run(name, func(t *testing.T) {
			e := livetest.Open(t, name, "verify_readonly", m.Model, "")
			defer e.Close()
			dir := t.TempDir()
			if err := os.Chmod(dir, 0o777); err != nil { // so that a server's program could write here
				t.Fatal(err)
			}
			marker := filepath.Join(dir, "marker")
			hostile := map[string]string{
				"delete_cte.sql":   "WITH gone AS (DELETE FROM shop.sales RETURNING id)\nSELECT count(*) AS revenue FROM gone",
				"drop.sql":         "DROP TABLE shop.sales",
				"create_as.sql":    "CREATE TABLE shop.copied AS SELECT * FROM shop.sales",
				"insert.sql":       "INSERT INTO shop.sales (id) VALUES (999) RETURNING id",
				"copy_program.sql": "COPY (SELECT 1) TO PROGRAM 'touch " + marker + "'",
				"two.sql":          "SELECT 1 AS revenue;\nDELETE FROM shop.sales",
				"outfile.sql":      "SELECT * FROM shop.sales INTO OUTFILE '" + marker + "'",
				"attach.sql":       "ATTACH '" + marker + "' AS x",
				"lock.sql":         "SELECT id FROM shop.sales FOR UPDATE",
			}
			before := shopCounts(t, e)
			for file, text := range hostile {
				path := filepath.Join(dir, file)
				if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
					t.Fatal(err)
				}
				var out, errb bytes.Buffer
				code := Main([]string{"verify", shopModel, "--dsn", e.DSN, "--sql", path, "-m", "revenue", "-b", "stores.region"},
					strings.NewReader(""), &out, &errb)
				msg := errb.String()
				if code != exitFindings || !strings.Contains(msg, path+":") ||
					!(strings.Contains(msg, "verify runs") || strings.Contains(msg, "only reads")) {
					t.Errorf("%s: exit %d, want %d and an error at %s:LINE:COL that says what verify runs:\n%s%s", file, code, exitFindings, path, out.String(), msg)
				}
			}
			if after := shopCounts(t, e); after != before {
				t.Errorf("the data changed: %s, was %s", after, before)
			}
			if _, err := e.Live.Query(context.Background(), "SELECT * FROM shop.copied", nil); err == nil {
				t.Error("CREATE TABLE AS made shop.copied")
			}
			if _, err := os.Stat(marker); err == nil {
				t.Errorf("%s was created", marker)
			}
		})
	}
}

// shopCounts counts the rows of the shop tables (and fails if one is gone).
func shopCounts(t *testing.T, e *livetest.Engine) string {
	t.Helper()
	var out []string
	for _, tbl := range []string{"sales", "stores", "repairs"} {
		res, err := e.Live.Query(context.Background(), "SELECT count(*) FROM shop."+tbl, nil)
		if err != nil {
			t.Fatalf("counting shop.%s: %v", tbl, err)
		}
		out = append(out, fmt.Sprintf("%s=%v", tbl, res.Rows[0][0]))
	}
	return strings.Join(out, " ")
}

// On the embedded DuckDB, the handwritten SQL can neither read nor write
// files: the engine is taken off the file system once the model's data is
// in (and its configuration locked), and a second statement never runs.
func TestVerifyDuckDBOffTheFileSystem(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	marker := filepath.Join(dir, "marker.csv")
	cases := map[string][2]string{
		"read.sql":    {"SELECT count(*) AS revenue FROM read_csv('" + shopModel + "')", "file system operations are disabled"},
		"text.sql":    {"SELECT count(*) AS revenue FROM (SELECT 1) t, read_text('" + shopModel + "')", "file system operations are disabled"},
		"copy.sql":    {"SELECT 1 AS revenue;\nCOPY (SELECT 1) TO '" + marker + "'", "copy.sql:2:1: a second statement"},
		"setting.sql": {"SET enable_external_access = true", "setting.sql:1:1: verify runs a query that reads"},
	}
	for file, c := range cases {
		text := c[0]
		path := filepath.Join(dir, file)
		if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		var out, errb bytes.Buffer
		code := Main([]string{"verify", shopModel, "--sql", path, "-m", "revenue", "-b", "stores.region"}, strings.NewReader(""), &out, &errb)
		if code != exitFindings || !strings.Contains(errb.String(), c[1]) {
			t.Errorf("%s: exit %d, want %d and %q\n%s%s", file, code, exitFindings, c[1], out.String(), errb.String())
		}
	}
	if _, err := os.Stat(marker); err == nil {
		t.Errorf("%s was written", marker)
	}
}
