package main

import (
	"encoding/csv"
	"flag"
	"os"
	"strconv"
	"strings"
	"testing"
)

// The injection suite, part two (part one, dialects/quote_test.go, reads
// every dialect's quoting back by the engine's token rules): the hostile
// model of testdata/dialects (quotes of every kind, brackets, comment
// markers, backslashes and unicode in its table, column, relation and
// measure names and in its data) is created, loaded and queried on
// DuckDB, and through runJSON's cross-check on SQLite, PostgreSQL and
// MySQL/MariaDB, which must give the same rows. A value that escaped its
// literal would match the wrong rows, or none, or break the statement.

// hostileRow is a row of weird.csv: its id, name and value.
type hostileRow struct{ id, name, value string }

func hostileRows(t *testing.T) []hostileRow {
	t.Helper()
	f, err := os.Open("../../testdata/dialects/weird.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	var out []hostileRow
	for _, r := range recs[1:] {
		out = append(out, hostileRow{id: r[0], name: r[1], value: r[2]})
	}
	if len(out) < 10 {
		t.Fatalf("weird.csv has %d rows", len(out))
	}
	return out
}

// Each hostile value, written as a rollwise literal in a --where filter,
// selects exactly its own row on every engine.
func TestHostileValuesSelectTheirRow(t *testing.T) {
	t.Parallel()
	for _, r := range hostileRows(t) {
		lit := "'" + strings.ReplaceAll(r.name, "'", "''") + "'"
		got := runJSON(t, "run", hostileModel, "-m", "tot'al,n ]--", "-w", "`we\"ird'; --`.`na'me\"; DROP` = "+lit)
		expectRows(t, got, []row{{"tot'al": r.value, "n ]--": 1, "rolled_up": none}})
	}
}

// Grouping by a hostile column returns each hostile value as it was
// loaded, under the hostile names.
func TestHostileNamesAsGroups(t *testing.T) {
	t.Parallel()
	rows := hostileRows(t)
	got := runJSON(t, "run", hostileModel, "--view", `by "name"`)
	if len(got) != len(rows) {
		t.Fatalf("%d rows, want one per name (%d):\n%s", len(got), len(rows), dump(got))
	}
	byName := map[string]map[string]any{}
	for _, g := range got {
		name, ok := g[`we"ird'; --.na'me"; DROP`].(string)
		if !ok {
			t.Fatalf("no name in %v", g)
		}
		byName[name] = g
	}
	for _, r := range rows {
		g, ok := byName[r.name]
		if !ok {
			t.Errorf("no row for %q", r.name)
			continue
		}
		if !sameValue(g["tot'al"], r.value) || !sameValue(g["n ]--"], 1) || !sameValue(g["avg/*x*/"], mustFloat(t, r.value)) {
			t.Errorf("%q: %v, want tot'al %s", r.name, g, r.value)
		}
	}
	// Two hostile groups, with subtotals: the grand total is every value.
	got = runJSON(t, "run", hostileModel, "--view", "by 'label'", "--totals", "rollup")
	last := got[len(got)-1]
	if !sameValue(last["tot'al"], "58.00") || !sameValue(last["names#"], 10) {
		t.Errorf("grand total %v, want tot'al 58 and 10 names", last)
	}
}

func mustFloat(t *testing.T, s string) float64 {
	t.Helper()
	f, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatal(err)
	}
	return f
}

// injectionAll runs every injection payload on the engines, not only
// every fifth (the SQL of every payload is checked on every dialect
// either way).
var injectionAll = flag.Bool("injection.all", false, "run every injection payload on DuckDB and the live engines")

// injectionPayloads reads testdata/badinput/injection.txt.
func injectionPayloads(t *testing.T) []string {
	t.Helper()
	b, err := os.ReadFile("../../testdata/badinput/injection.txt")
	if err != nil {
		t.Fatal(err)
	}
	var out []string
	for _, line := range strings.Split(string(b), "\n") {
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		p, err := strconv.Unquote(line)
		if err != nil {
			t.Fatalf("injection.txt: %s: %v", line, err)
		}
		out = append(out, p)
	}
	return out
}

// Each injection payload (quotes, backslashes, comment markers, batch
// separators, dollar quotes, NUL, look-alike quotes), written as a
// rollwise literal in a --where filter on the hostile column: the SQL of
// every dialect is one statement that `sql` prints without error, and on
// DuckDB (and, through runJSON's cross-check, SQLite, PostgreSQL and
// MySQL/MariaDB when they are available) the filter matches exactly the
// hostile rows of that name (none, but for "-- comment"): a payload that
// escaped its literal would match other rows, fail the statement, or run
// a second one. A payload the language cannot hold (a NUL byte)
// is refused at its position. The counts are those of docs/testing.md.
func TestInjectionPayloadsStayLiterals(t *testing.T) {
	t.Parallel()
	payloads := injectionPayloads(t)
	matches := map[string]int{} // the hostile rows whose name a payload is
	for _, r := range hostileRows(t) {
		matches[r.name]++
	}
	dialectNames := []string{"duckdb", "postgres", "mysql", "sqlite", "sqlserver", "snowflake", "bigquery", "trino", "spark"}
	tried, clean, refused := 0, 0, 0
	for i, p := range payloads {
		filter := "`we\"ird'; --`.`na'me\"; DROP` = '" + strings.ReplaceAll(p, "'", "''") + "'"
		var errb strings.Builder
		for _, d := range dialectNames {
			tried++
			var out strings.Builder
			errb.Reset()
			code := Main([]string{"sql", hostileModel, "-d", d, "-m", "tot'al,n ]--", "-w", filter}, nil, &out, &errb)
			switch {
			case code == exitFindings && strings.Contains(errb.String(), "--where:1:"):
				refused++ // refused with a position, the same on every dialect
				clean++
			case code != 0:
				t.Errorf("%q on %s: exit %d: %s", p, d, code, errb.String())
			case strings.Count(out.String(), p) > 1 && !strings.ContainsAny(p, "'\\\r\n"):
				t.Errorf("%q on %s appears %d times in the SQL", p, d, strings.Count(out.String(), p))
			default:
				clean++
			}
		}
		if strings.Contains(errb.String(), "--where:1:") || (i%5 != 0 && !*injectionAll) {
			continue
		}
		tried++
		got := runJSON(t, "run", hostileModel, "-m", "tot'al,n ]--", "-w", filter)
		if len(got) == 1 && sameValue(got[0]["n ]--"], matches[p]) {
			clean++
		} else {
			t.Errorf("%q matched other than its %d rows: %s", p, matches[p], dump(got))
		}
	}
	if refused == 0 {
		t.Error("no payload was refused; the NUL byte should be")
	}
	t.Logf("injection payloads: %d payloads, %d runs (9 dialects' SQL each, and a DuckDB run of every fifth or, with -injection.all, of each), %d clean (%d refused with a position), %d escapes",
		len(payloads), tried, clean, refused, tried-clean)
}
