package engine

import (
	"context"
	"fmt"
	"math/rand/v2"
	"net/url"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// A read-only session refuses every write on the server's side, even for
// a statement that no check refused first (issue 17, item 1): the
// probe's statements that emptied or dropped a table through verify,
// sent straight to Live.Query, must fail and leave the data as it was.
// PostgreSQL refuses them in its read-only transaction (a data-modifying
// CTE included, but not COPY ... TO PROGRAM, which only reads tables and
// runs its program: verify.CheckQuery refuses it before it is sent);
// MySQL/MariaDB in its read-only session, DDL included; SQLite through
// query_only and the authorizer, on the main and on an attached file,
// and an ATTACH that would create a file.
func TestReadOnlySessionRefusesWrites(t *testing.T) {
	for _, name := range []string{"sqlite", "postgres", "mysql"} {
		t.Run(name, func(t *testing.T) {
			rw := liveEngine(t, name)
			ctx := context.Background()
			schema := fmt.Sprintf("livesafe_ro_%d", rand.Uint32())
			dsn, marker := readOnlyFixture(t, rw, name, schema)
			ro, err := OpenLive(ctx, dsn, LiveOptions{})
			if err != nil {
				t.Fatal(err)
			}
			defer ro.Close()
			tbl := schema + ".t"
			writes := []string{
				"DELETE FROM " + tbl,
				"UPDATE " + tbl + " SET x = 0",
				"DROP TABLE " + tbl,
				"CREATE TABLE " + schema + ".u AS SELECT * FROM " + tbl,
				"INSERT INTO " + tbl + " VALUES (9) RETURNING x",
			}
			switch name {
			case "postgres":
				writes = append(writes, "WITH gone AS (DELETE FROM "+tbl+" RETURNING x) SELECT count(*) FROM gone")
			case "sqlite":
				writes = append(writes, "DELETE FROM main.t", "PRAGMA query_only = 0", "ATTACH "+quoteSQLiteString(marker)+" AS n")
			}
			for _, w := range writes {
				_, err := ro.Query(ctx, w, nil)
				t.Logf("%s: %v", w, err)
				if err == nil {
					t.Errorf("%s ran in a read-only session", w)
				} else if !strings.Contains(strings.ToLower(err.Error()), "read") && !strings.Contains(err.Error(), "not authorized") {
					t.Errorf("%s: the error does not say why: %v", w, err)
				}
			}
			for _, table := range []string{tbl, "main.t"} {
				if name != "sqlite" && table == "main.t" {
					continue
				}
				res, err := rw.Query(ctx, "SELECT count(*) FROM "+table, nil)
				if err != nil || fmt.Sprint(res.Rows) != "[[3]]" {
					t.Errorf("%s after the writes: %v %v, want 3 rows", table, res, err)
				}
			}
			if _, err := rw.Query(ctx, "SELECT * FROM "+schema+".u", nil); err == nil {
				t.Errorf("CREATE TABLE AS made %s.u", schema)
			}
			if _, err := os.Stat(marker); err == nil {
				t.Errorf("%s was created", marker)
			}
			// And reading still works.
			if res, err := ro.Query(ctx, "SELECT sum(x) FROM "+tbl, nil); err != nil || fmt.Sprint(res.Rows) != "[[6]]" {
				t.Errorf("reading: %v %v", res, err)
			}
		})
	}
}

// readOnlyFixture creates table SCHEMA.t (x: 1, 2, 3) through the
// writable session rw (SQLite: also main.t) and returns the DSN of a
// second session on the same database, and a file that no statement may
// create.
func readOnlyFixture(t *testing.T, rw *Live, name, schema string) (dsn, marker string) {
	t.Helper()
	ctx := context.Background()
	dir := t.TempDir()
	marker = filepath.Join(dir, "marker")
	var setup []string
	switch name {
	case "sqlite":
		dsn = "sqlite:" + filepath.Join(dir, "main.db") + "?attach=" + url.QueryEscape(schema+"=s.db")
		rw.Close()
		l, err := OpenLive(ctx, strings.Replace(dsn, "?", "?mode=rwc&", 1), LiveOptions{Writable: true})
		if err != nil {
			t.Fatal(err)
		}
		*rw = *l
		setup = []string{"CREATE TABLE main.t (x integer)", "INSERT INTO main.t VALUES (1), (2), (3)"}
	case "postgres":
		setup = []string{"CREATE SCHEMA " + schema}
		dsn = os.Getenv("ROLLWISE_TEST_POSTGRES")
		dropAtEnd(t, rw, schema)
	case "mysql":
		setup = []string{"CREATE DATABASE " + schema}
		dsn = os.Getenv("ROLLWISE_TEST_MYSQL")
		dropAtEnd(t, rw, schema)
	}
	setup = append(setup, "CREATE TABLE "+schema+".t (x integer)", "INSERT INTO "+schema+".t VALUES (1), (2), (3)")
	for _, s := range setup {
		if err := rw.Exec(ctx, s); err != nil {
			t.Fatalf("%s: %v", s, err)
		}
	}
	return dsn, marker
}
