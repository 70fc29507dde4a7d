package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestDirtyDataAllAtOnceAndNullTexts: through the command, a dirty CSV
// file is reported whole in one run with the fix for each value, and a
// table that declares its NULL texts (`with null "NA", "-"`) loads them as
// NULL, in every column type, while other texts are still refused.
func TestDirtyDataAllAtOnceAndNullTexts(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	write := func(name, text string) string {
		t.Helper()
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	write("t.csv", "id,shop,qty,price,day\n"+
		"1,north,2,1.50,2026-01-01\n"+
		"2,NA,NA,2.00,2026-01-02\n"+ // shop and qty missing
		"3,north,-,-,-\n"+ // qty, price and day missing
		"4,south,5,1.00,2026-01-03\n")
	table := func(nulls string) string {
		return "table t from \"t.csv\"" + nulls + " {\n  key id\n  id integer\n  shop text\n  qty integer\n  price decimal nonadditive\n  day date\n}\n" +
			"measure units = sum(t.qty)\nmeasure priced = count(t.price)\nmeasure days = count(distinct t.day)\nmeasure lines = count(*)\n"
	}
	var out, errb bytes.Buffer
	model := write("plain.roll", table(""))
	code := Main([]string{"run", model, "-m", "units"}, nil, &out, &errb)
	lines := strings.Split(strings.TrimSpace(errb.String()), "\n")
	// Four values cannot be read: NA in qty (line 3), - in qty, price
	// and day (line 4). The shop column is text, so NA is a shop's name.
	if code != 1 || len(lines) != 5 || !strings.Contains(lines[0], "4 values cannot be loaded") ||
		!strings.Contains(lines[1], `t.csv:3: column t.qty (integer): cannot read "NA" as a whole number`) ||
		!strings.Contains(lines[1], `declare it on the table: with null "NA"`) ||
		!strings.Contains(lines[4], `t.csv:4: column t.day (date): cannot read "-" as a date`) {
		t.Fatalf("exit %d, stderr:\n%s", code, errb.String())
	}

	out.Reset()
	errb.Reset()
	model = write("nulls.roll", table(` with null "NA", "-"`))
	code = Main([]string{"run", model, "-m", "units,priced,days,lines", "-b", "t.shop", "--totals", "grand", "--format", "csv"}, nil, &out, &errb)
	if code != 0 {
		t.Fatalf("exit %d: %s", code, errb.String())
	}
	// Hand-worked: north (ids 1 and 3): units 2 + NULL = 2, priced 1
	// (id 3's price is "-"), days 1, lines 2; south (id 4): 5, 1, 1, 1;
	// shop NULL (id 2, "NA"): units NULL (its qty is "NA" too), priced 1,
	// days 1, lines 1; total: units 7, priced 3, days 3, lines 4.
	want := "t.shop,units,priced,days,lines,rolled_up\n" +
		"north,2,1,1,2,\n" +
		"south,5,1,1,1,\n" +
		",,1,1,1,\n" +
		",7,3,3,4,t.shop\n"
	if got := out.String(); got != want {
		t.Errorf("got\n%s\nwant\n%s", got, want)
	}
}
