package engine

import (
	"context"
	"database/sql"
	"testing"

	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/planner/model"
)

// multiline are texts whose line breaks must survive a dialect's literal
// exactly: a line that is only GO (SQL Server's batch separator for
// sqlcmd and SSMS), a backslash just before a line break (a line
// continuation inside a T-SQL literal), CR LF pairs and lone CRs.
var multiline = []string{
	"a\nGO\nb", "x\n  go  \ny", "\nGo 5\n", "a\\\nb", "a\\\r\nb", "\\\n", "a\r\nGO\r\nb", "cr\ronly",
	"it's\n'\n", "\n", "\n\n", "end\\", "tab\t\nx",
}

// Every multi-line text, rendered by the dialect and selected on the
// engine, reads back exactly (DuckDB embedded; SQLite, PostgreSQL and
// MySQL/MariaDB when configured). SQL Server, which cannot run here, is
// covered by dialects' line check and the views golden.
func TestMultilineLiteralsReadBack(t *testing.T) {
	ctx := context.Background()
	db, err := sql.Open("duckdb", "")
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	duck, _ := dialects.Get("duckdb")
	for _, v := range multiline {
		var got string
		if err := db.QueryRowContext(ctx, "SELECT "+duck.String(v)).Scan(&got); err != nil || got != v {
			t.Errorf("duckdb: %s reads back as %q (%v), want %q", duck.String(v), got, err, v)
		}
	}
	for _, name := range []string{"sqlite", "postgres", "mysql"} {
		t.Run(name, func(t *testing.T) {
			l := liveEngine(t, name)
			d, _ := dialects.Get(name)
			for _, v := range multiline {
				res, err := l.Query(ctx, "SELECT "+d.String(v)+" AS v", []model.Type{model.TypeText})
				if err != nil || len(res.Rows) != 1 || res.Rows[0][0] != v {
					t.Errorf("%s: %s reads back as %v (%v), want %q", name, d.String(v), res, err, v)
				}
			}
		})
	}
}
