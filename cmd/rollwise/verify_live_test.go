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

// verify's per-row sums and averages on the live engines without
// GROUPING SETS (SQLite; MySQL/MariaDB have only WITH ROLLUP:
// docs/engine-facts.md): the renderer spells the report's grouping sets
// as a UNION ALL of one GROUP BY per set, so the per-row diagnosis comes
// out as on DuckDB (testdata/verify/average_of_ratios.sql: the rose's
// unit revenue is the plain average of its lines' prices, 2.6667 for
// 18 / 7 = 2.5714, worked out in that file).
func TestVerifyPerRowWithoutGroupingSets(t *testing.T) {
	t.Parallel()
	// The PostgreSQL server first, as every other live test takes it
	// before MySQL's: test processes that wait for each other's servers
	// (livetest.holdServer) take them in one order and never deadlock.
	liveEngine(t, "postgres", shopModel)
	for _, name := range []string{"sqlite", "mysql"} {
		t.Run(name, func(t *testing.T) {
			e := liveEngine(t, name, shopModel)
			var out, errb bytes.Buffer
			args := []string{"verify", shopModel, verifyExtra, "--dsn", e.DSN, "--sql", "../../testdata/verify/average_of_ratios.sql",
				"-m", "margin_rate,unit_revenue", "-b", "sales.item", "--totals", "grand"}
			code := Main(args, strings.NewReader(""), &out, &errb)
			if code != 1 {
				t.Fatalf("exit %d, want 1\nstdout:\n%s\nstderr:\n%s", code, out.String(), errb.String())
			}
			for _, line := range strings.Split(out.String(), "\n") {
				if strings.Contains(line, "could not compute the per-row") {
					t.Errorf("the per-row values were not computed: %s", line)
				}
			}
			// The rose's cell (detail set) and the grand total (the
			// empty set), each from the per-row values: 3 and 6 lines.
			for _, want := range []string{"unit_revenue is computed on each of the 3 sales rows of the cell and averaged",
				"unit_revenue is computed on each of the 6 sales rows of the cell and averaged"} {
				if !strings.Contains(out.String(), want) {
					t.Errorf("the report does not say %q:\n%s", want, out.String())
				}
			}
		})
	}
}
