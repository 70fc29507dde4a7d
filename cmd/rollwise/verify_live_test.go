package main

import (
	"bytes"
	"strings"
	"testing"
)

// verify --dsn on the live PostgreSQL of the dialects tests (skipped
// without a server, a failure under CI=true): the handwritten SQL runs
// there, rollwise's query is rendered for PostgreSQL and runs there too,
// and the same verdicts and diagnoses come out as on DuckDB.
func TestVerifyOnLivePostgres(t *testing.T) {
	t.Parallel()
	e := liveEngine(t, "postgres", shopModel)
	cases := []struct {
		sql  string
		args []string
		exit int
		want string
	}{
		// A correct rollup (the total re-computed): everything agrees.
		{"right_grand.sql", []string{"-m", "revenue,margin_rate,items", "-b", "sales.item", "--totals", "grand"}, 0, "ok: 4 rows matched, 12 values compared, 0 differ"},
		// A total that adds the rows' margin rates (1.52 for 0.5).
		{"sum_of_ratios.sql", []string{"-m", "revenue,margin_rate", "-b", "stores.region", "--totals", "grand", "--grouping-column", "g"}, 1, "sum-of-ratios"},
	}
	for _, c := range cases {
		t.Run(c.sql, func(t *testing.T) {
			var out, errb bytes.Buffer
			args := append([]string{"verify", shopModel, "--dsn", e.DSN, "--sql", "../../testdata/verify/" + c.sql}, c.args...)
			code := Main(args, strings.NewReader(""), &out, &errb)
			if code != c.exit {
				t.Fatalf("exit %d, want %d\nstdout:\n%s\nstderr:\n%s", code, c.exit, out.String(), errb.String())
			}
			if !strings.Contains(out.String(), c.want) {
				t.Errorf("the report does not say %q:\n%s", c.want, out.String())
			}
		})
	}
}
