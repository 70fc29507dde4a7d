package main

import (
	"bytes"
	"database/sql"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// `rollwise run` reads a Parquet DECIMAL(15,2) in its own type (faster;
// docs/benchmarks.md) and stays exact: 10^8 * 10^7 overflows the
// DECIMAL(18,4) DuckDB gives a product of two DECIMAL(15,2), an error that
// makes run compute the query again on DECIMAL(38,6), which holds it.
// Worked by hand: 100000000.00 * 10000000.00 + 0.01 * 2.50 =
// 1000000000000000.025; the prices sum to 100000000.01.
func TestRunFileDecimalsStayExact(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	db, err := sql.Open("duckdb", "")
	if err != nil {
		t.Fatal(err)
	}
	defer db.Close()
	file := filepath.Join(dir, "lines.parquet")
	if _, err := db.Exec(`COPY (SELECT * FROM (VALUES
		(100000000.00::DECIMAL(15,2), 10000000.00::DECIMAL(15,2)),
		(0.01::DECIMAL(15,2), 2.50::DECIMAL(15,2))) v(price, qty)) TO '` + file + `' (FORMAT parquet)`); err != nil {
		t.Fatal(err)
	}
	model := filepath.Join(dir, "m.roll")
	src := "table lines from \"lines.parquet\" {\n  price decimal\n  qty decimal\n}\n" +
		"measure total = sum(lines.price * lines.qty)\nmeasure prices = sum(lines.price)\nmeasure small = sum(lines.qty * 2)\n"
	if err := os.WriteFile(model, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct{ measures, want string }{
		{"prices,small", `{"prices": 100000000.01, "small": 20000005, "rolled_up": []}`}, // no overflow: the files' types
		{"total,prices", `{"total": 1000000000000000.025, "prices": 100000000.01, "rolled_up": []}`},
	} {
		var out, errb bytes.Buffer
		code := Main([]string{"run", model, "-m", c.measures, "--format", "json"}, strings.NewReader(""), &out, &errb)
		if code != 0 || !strings.Contains(out.String(), c.want) {
			t.Errorf("run -m %s: exit %d\n%s\n%s\nwant %s", c.measures, code, out.String(), errb.String(), c.want)
		}
	}
}
