package main

import (
	"encoding/csv"
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
	for _, r := range hostileRows(t) {
		lit := "'" + strings.ReplaceAll(r.name, "'", "''") + "'"
		got := runJSON(t, "run", hostileModel, "-m", "tot'al,n ]--", "-w", "`we\"ird'; --`.`na'me\"; DROP` = "+lit)
		expectRows(t, got, []row{{"tot'al": r.value, "n ]--": 1, "rolled_up": none}})
	}
}

// Grouping by a hostile column returns each hostile value as it was
// loaded, under the hostile names.
func TestHostileNamesAsGroups(t *testing.T) {
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
