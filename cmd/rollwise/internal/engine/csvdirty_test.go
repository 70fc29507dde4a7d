package engine

import (
	"context"
	"fmt"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/planner/model"
)

// TestCSVReportsEveryBadValueAtOnce: a dirty file is reported whole in one
// run, in file order, each value with its line, column and the spelling to
// write instead (issue 16: a NA in an integer column, a 02/01/2024 date and
// a 7-decimal price used to surface one run at a time).
func TestCSVReportsEveryBadValueAtOnce(t *testing.T) {
	dir := t.TempDir()
	file := writeFile(t, dir, "sales.csv", "id,qty,sold_on,price\n"+
		"1,2,2024-01-02,1.50\n"+
		"2,NA,2024-01-02,1.50\n"+ // line 3: qty
		"3,1,02/01/2024,2.1234567\n"+ // line 4: sold_on, then price
		"4,1,2024-01-03,1.00\n")
	m := newModel(table("sales", nil, file, col("id", model.TypeInteger), col("qty", model.TypeInteger),
		col("sold_on", model.TypeDate), col("price", model.TypeDecimal)))
	_, err := OpenDuckDB(context.Background(), m, "", Options{})
	if err == nil {
		t.Fatal("OpenDuckDB loaded a dirty file")
	}
	want := []string{
		file + ": 3 values cannot be loaded:",
		file + `:3: column sales.qty (integer): cannot read "NA" as a whole number`,
		file + `:4: column sales.sold_on (date): cannot read "02/01/2024" as a date (write YYYY-MM-DD)`,
		file + `:4: column sales.price (decimal): "2.1234567" has more than 6 decimal places`,
	}
	lines := strings.Split(err.Error(), "\n")
	if len(lines) != len(want) {
		t.Fatalf("%d lines, want %d:\n%v", len(lines), len(want), err)
	}
	for i, w := range want {
		if !strings.Contains(lines[i], w) {
			t.Errorf("line %d is %q, want it to hold %q", i+1, lines[i], w)
		}
	}
}

// TestCSVBadValuesAreCappedAndCounted: past maxBadValues the values are
// counted, not listed, so a file of garbage gives a short error.
func TestCSVBadValuesAreCappedAndCounted(t *testing.T) {
	var b strings.Builder
	b.WriteString("id,qty\n")
	for i := 1; i <= 250; i++ {
		fmt.Fprintf(&b, "%d,x%d\n", i, i)
	}
	file := writeFile(t, t.TempDir(), "t.csv", b.String())
	_, err := OpenDuckDB(context.Background(), newModel(table("t", nil, file, col("id", model.TypeInteger), col("qty", model.TypeInteger))), "", Options{})
	if err == nil {
		t.Fatal("OpenDuckDB loaded a file of garbage")
	}
	lines := strings.Split(err.Error(), "\n")
	if len(lines) != 1+maxBadValues || !strings.Contains(lines[0], "250 values cannot be loaded; the first 20 in file order") ||
		!strings.Contains(lines[1], file+`:2: column t.qty`) || !strings.Contains(lines[maxBadValues], file+`:21: column t.qty`) {
		t.Errorf("error has %d lines:\n%v", len(lines), err)
	}
}

// TestNullTextsOfOneFileMustAgree: two tables over one file that declare
// different NULL texts are refused, since one would read as NULL a value
// the other reads as it is.
func TestNullTextsOfOneFileMustAgree(t *testing.T) {
	file := writeFile(t, t.TempDir(), "t.csv", "id,qty\n1,NA\n")
	a := table("a", []string{"t"}, file, col("id", model.TypeInteger), col("qty", model.TypeInteger))
	b := table("b", []string{"t"}, file, col("id", model.TypeInteger))
	a.NullTexts = []string{"NA"}
	expectOpenError(t, newModel(a, b), "", "tables a and b read", `different NULL texts (["NA"] and [])`, "same `with null` list")
	b.NullTexts = []string{"NA"}
	db, err := OpenDuckDB(context.Background(), newModel(a, b), "", Options{})
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	res := query(t, db, `SELECT count(*), count("qty") FROM "t"`)
	if fmt.Sprint(res.Rows) != "[[1 0]]" {
		t.Errorf("rows %v, want one row whose qty is NULL", res.Rows)
	}
}
