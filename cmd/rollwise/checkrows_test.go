package main

import (
	"maps"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"pgregory.net/rapid"

	"github.com/rollwise/rollwise/planner/reference/casegen"
)

// stockModel declares a key and a semiadditive balance; stockData breaks
// both promises, by hand:
//
//	items: code 'a' twice, 'b' once       -> 1 key value repeats, on 2 rows
//	stock: id 1..5 (unique);
//	       (item a, 2026-01-01) on rows 1, 2 and 3 -> repeats, on 3 rows
//	       (item b, 2026-01-01) on row 4, (b, 2026-01-02) on row 5
const stockModel = `table items from "items.csv" {
  key code
  code  text
  name  text
}
table stock from "stock.csv" {
  key id
  id    integer
  item  text -> items.code
  day   date
  qty   integer semiadditive(stock.day)
}
measure on_hand = sum(stock.qty)[stock.day = date '2026-01-02']
`

var stockData = map[string]string{
	"items.csv": "code,name\na,Apple\na,Apricot\nb,Banana\n",
	"stock.csv": "id,item,day,qty\n1,a,2026-01-01,5\n2,a,2026-01-01,7\n3,a,2026-01-01,1\n4,b,2026-01-01,2\n5,b,2026-01-02,3\n",
}

// check --data finds a declared key that repeats and a semiadditive
// column with two rows for one key and date (issue 13, rule 8): each
// finding names the table, the columns, an example value and the count.
// Before, check --data looked at required links only and said ok.
func TestCheckDataRepeatedKeys(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "stock.roll"), []byte(stockModel), 0o644); err != nil {
		t.Fatal(err)
	}
	for name, text := range stockData {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	code, msg := checkCmd(filepath.Join(dir, "stock.roll"), "--data", dir)
	for _, want := range []string{
		"stock.roll:1:7: error: table items: the key (code) is not unique on the data: 1 value repeats, on 2 rows; for example code = a is on 2 rows",
		"stock.roll:11:3: error: table stock: qty is semiadditive(stock.day), but its key and date (item, day) are not unique on the data: 1 value repeats, on 3 rows; for example item = a, day = 2026-01-01 is on 3 rows",
	} {
		if !strings.Contains(msg, want) {
			t.Errorf("missing %q in:\n%s", want, msg)
		}
	}
	if code != exitFindings || strings.Count(msg, "error:") != 2 {
		t.Errorf("exit %d, want %d with 2 errors:\n%s", code, exitFindings, msg)
	}
}

// On random cases (whose generator keeps every promise: unique keys,
// required links that find their rows), check --data finds nothing: the
// statements run on every drawn schema, composite keys included, and a
// finding there would be a false alarm. Then one row of a random table is
// repeated, and check must name that table's key. 10 cases by default.
func TestCheckDataOnGeneratedCases(t *testing.T) {
	t.Parallel()
	checkCases(t, 10, func(rt *rapid.T) {
		c := casegen.Generator(casegen.DefaultOptions).Draw(rt, "case")
		dir := t.TempDir()
		if err := c.Write(dir); err != nil {
			rt.Fatal(err)
		}
		model := filepath.Join(dir, casegen.ModelFile)
		code, msg := checkCmd(model, "--data", dir)
		if code != 0 || !strings.Contains(msg, "uniqueness promise") {
			rt.Fatalf("exit %d\n%s\nthe case:\n%s", code, msg, c)
		}
		// Repeat one row of one table: its key repeats, and check says so.
		names := slices.Sorted(maps.Keys(c.Data))
		name := names[rapid.IntRange(0, len(names)-1).Draw(rt, "table")]
		lines := strings.SplitAfter(c.Data[name], "\n")
		if len(lines) < 3 {
			return // a header and no row
		}
		if err := os.WriteFile(filepath.Join(dir, name+".csv"), []byte(c.Data[name]+lines[1]), 0o644); err != nil {
			rt.Fatal(err)
		}
		code, msg = checkCmd(model, "--data", dir)
		if code != exitFindings || !strings.Contains(msg, "error: table "+name+": the key (") {
			rt.Fatalf("a repeated row of %s: exit %d\n%s\nthe case:\n%s", name, code, msg, c)
		}
	})
}
