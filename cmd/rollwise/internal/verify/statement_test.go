package verify

import (
	"strings"
	"testing"
)

// CheckQuery reads the handwritten SQL as each engine's lexer does. The
// lexical rules come from the engines' manuals: PostgreSQL's "Lexical
// Structure" (nested /* */ comments, $tag$ dollar quoting, E” escape
// strings; postgresql.org/docs/current/sql-syntax-lexical.html), MySQL's
// "Comments" ("-- " needs a space after it, # to the end of the line,
// /*! ... */ is run; dev.mysql.com/doc/refman/8.0/en/comments.html) and
// string literals (backslash escapes, "..." is a string), SQLite's
// "SQLite Keywords" ("...", [...] and `...` quote names;
// sqlite.org/lang_keywords.html).
func TestCheckQueryAccepts(t *testing.T) {
	cases := []struct{ dialect, sql, want string }{
		{"postgres", "SELECT 1;", "SELECT 1"},
		{"postgres", "select 1 ;  -- done\n", "select 1 "},
		{"postgres", "WITH a AS (SELECT 1 AS x) SELECT x FROM a", "WITH a AS (SELECT 1 AS x) SELECT x FROM a"},
		{"postgres", "(SELECT 1) UNION (SELECT 2)", "(SELECT 1) UNION (SELECT 2)"},
		{"postgres", "SELECT 'a;b; DROP TABLE t' AS s", ""},
		{"postgres", "SELECT $$; DELETE FROM t$$ AS s", ""},
		{"postgres", "SELECT $x$ $$; DELETE $$ $x$ AS s", ""},
		{"postgres", "SELECT E'it\\'s; DROP' AS s", ""},
		{"postgres", "SELECT \"delete\", \"insert;\" FROM t", ""},
		{"postgres", "SELECT 1 /* outer /* inner; DROP */ still; */", ""},
		{"postgres", "SELECT $1::int", ""},
		{"postgres", "SELECT a.share, replace(s, 'a', 'b') FROM t", ""},
		{"mysql", "SELECT 'it\\'s; DROP' AS s", ""},
		{"mysql", "SELECT \"a;b\" AS s # ; DROP TABLE t\n", ""},
		{"mysql", "SELECT `x;y` FROM t -- ; DROP TABLE t", ""},
		{"mysql", "SELECT 1--1", ""},
		{"sqlite", "SELECT [delete;x], `a;b`, \"c;d\" FROM t", ""},
		{"duckdb", "FROM t SELECT x", ""},
		{"duckdb", "SELECT 1;\n\n-- trailing comment\n;", "SELECT 1"},
	}
	for _, c := range cases {
		got, err := CheckQuery(c.dialect, "q.sql", c.sql)
		if err != nil {
			t.Errorf("%s: %q refused: %v", c.dialect, c.sql, err)
			continue
		}
		want := c.want
		if want == "" {
			want = c.sql
		}
		if got != want {
			t.Errorf("%s: %q gives %q, want %q", c.dialect, c.sql, got, want)
		}
	}
}

func TestCheckQueryRefuses(t *testing.T) {
	cases := []struct{ dialect, sql, want string }{
		// The probe's statements (issue 17, item 1).
		{"postgres", "WITH gone AS (DELETE FROM t RETURNING x) SELECT count(*) FROM gone", "q.sql:1:15: DELETE changes the database"},
		{"postgres", "DROP TABLE t", "q.sql:1:1: verify runs a query that reads"},
		{"postgres", "CREATE TABLE u AS SELECT * FROM t", "q.sql:1:1: verify runs a query that reads"},
		{"postgres", "INSERT INTO t VALUES (1) RETURNING *", "q.sql:1:1: verify runs a query that reads"},
		{"postgres", "COPY (SELECT 1) TO PROGRAM 'touch /tmp/x'", "q.sql:1:1: verify runs a query that reads"},
		{"postgres", "SELECT 1;\nSELECT 2", "q.sql:2:1: a second statement starts here"},
		{"sqlite", "SELECT 1; DELETE FROM t", "q.sql:1:11: a second statement"},
		{"postgres", "SELECT 1; -- fine\n  DROP TABLE t;", "q.sql:2:3: a second statement"},
		{"postgres", "SELECT * INTO u FROM t", "q.sql:1:10: INTO changes the database"},
		{"postgres", "SELECT * FROM t FOR UPDATE", "q.sql:1:21: UPDATE changes"},
		{"postgres", "SELECT * FROM t FOR SHARE", "q.sql:1:21: SHARE changes"},
		{"postgres", "SELECT set_config('default_transaction_read_only', 'off', false)", "q.sql:1:8: set_config reaches outside"},
		{"postgres", "SELECT \"dblink_exec\"('x', 'DELETE FROM t')", "q.sql:1:8: dblink_exec reaches outside"},
		{"postgres", "SELECT pg_catalog.query_to_xml('DELETE FROM t', true, true, '')", "q.sql:1:19: query_to_xml"},
		{"postgres", "SELECT $$a$$; DROP TABLE t", "q.sql:1:15: a second statement"},
		{"postgres", "SELECT 'a", "q.sql:1:8: this string is never closed"},
		{"postgres", "SELECT $q$ a", "q.sql:1:8: this $q$ string is never closed"},
		{"postgres", "SELECT 1 /* a /* b */ ; DROP TABLE t", "q.sql:1:10: this comment is never closed"},
		{"postgres", "SELECT \"a", "q.sql:1:8: this quoted name is never closed"},
		{"mysql", "SELECT 1 /*! ; DROP TABLE t */", "q.sql:1:10: MySQL runs the text"},
		{"mysql", "SELECT 1--1; DROP TABLE t", "q.sql:1:14: a second statement"},
		{"mysql", "SELECT 'a\\'; DROP TABLE t", "q.sql:1:8: this string is never closed"},
		{"mysql", "SELECT * FROM t INTO OUTFILE '/tmp/x'", "q.sql:1:17: INTO changes"},
		{"sqlite", "ATTACH 'x.db' AS x", "q.sql:1:1: verify runs"},
		{"sqlite", "PRAGMA query_only = 0", "q.sql:1:1: verify runs"},
		{"sqlite", "VACUUM INTO '/tmp/x.db'", "q.sql:1:1: verify runs"},
		{"duckdb", "SELECT 1; COPY t TO '/tmp/x.csv'", "q.sql:1:11: a second statement"},
		{"postgres", "FROM t SELECT x", "q.sql:1:1: verify runs"},
		{"postgres", "-- only a comment\n", "holds no SQL statement"},
		{"postgres", "  ;  ", "holds no SQL statement"},
		{"postgres", "EXPLAIN ANALYZE DELETE FROM t", "q.sql:1:1: verify runs"},
		{"postgres", "SELECT 1 AS \"x\";\n/* c */ SELECT 2", "q.sql:2:9: a second statement"},
		{"postgres", "SELECT 'é', 1; SELECT 2", "q.sql:1:16: a second statement"},
	}
	for _, c := range cases {
		_, err := CheckQuery(c.dialect, "q.sql", c.sql)
		if err == nil {
			t.Errorf("%s: %q accepted", c.dialect, c.sql)
			continue
		}
		if !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: %q: got %q, want it to say %q", c.dialect, c.sql, err, c.want)
		}
	}
}
