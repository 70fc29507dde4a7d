package main

import (
	"bytes"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// BigQuery column names hold letters, digits and _ only, so key columns
// are respelled (plants.family as plants__family). Two group columns that
// would be spelled alike must be refused, naming both, never rendered as
// one ambiguous column; distinct spellings still render.
func TestBigQueryKeySpellingsThatCollide(t *testing.T) {
	t.Parallel()
	model := filepath.Join(t.TempDir(), "beds.roll")
	src := `table beds {
  key id
  id integer
  row__n text
  row_id integer -> beds__row.id
  bed_col text
}
table beds__row {
  key id
  id integer
  n text
}
measure beds_n = count(beds.id)
`
	if err := os.WriteFile(model, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	sql := func(by string) (int, string, string) {
		var out, errb bytes.Buffer
		code := Main([]string{"sql", model, "-m", "beds_n", "-b", by, "-d", "bigquery"}, nil, &out, &errb)
		return code, out.String(), errb.String()
	}
	code, out, errb := sql("beds.row__n,beds__row.n")
	if code == 0 || !strings.Contains(errb, "bigquery cannot express both beds.row__n and beds__row.n") ||
		!strings.Contains(errb, "spelled beds__row__n") {
		t.Errorf("exit %d, want a refusal naming both columns and the spelling:\n%s%s", code, errb, out)
	}
	code, out, errb = sql("beds.row__n,beds.bed_col")
	if code != 0 || !strings.Contains(out, "`beds__row__n`") || !strings.Contains(out, "`beds__bed_col`") {
		t.Errorf("exit %d, want both spellings in the SQL:\n%s%s", code, errb, out)
	}
}
