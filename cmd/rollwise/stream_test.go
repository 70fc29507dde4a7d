package main

import (
	"bytes"
	"context"
	"database/sql"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"runtime/debug"
	"strings"
	"testing"
	"time"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/livetest"
)

// run loads only the tables its query reads, and streams its result.

// A table the query does not read is not loaded: its missing file is no
// error, while a query that reads it still fails on it.
func TestRunLoadsOnlyTheTablesItReads(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	model := filepath.Join(dir, "m.roll")
	src := `table sales from "` + filepath.Join("..", "..", "..", "testdata", "exec", "sales.csv") + `" {
  key id
  id integer
  store_id integer -> stores.id
  qty integer
}
table stores from "` + filepath.Join("..", "..", "..", "testdata", "exec", "stores.csv") + `" {
  key id
  id integer
  region text
}
table gone from "nowhere.csv" {
  key id
  id integer
}
measure units = sum(sales.qty)
measure gones = count(gone.id)
`
	src = strings.ReplaceAll(src, filepath.Join("..", "..", "..", "testdata"), filepath.Join(mustAbs(t, "../../testdata")))
	if err := os.WriteFile(model, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	// units by region reads sales and, through the link, stores.
	got := runJSON(t, "run", model, "-m", "units", "-b", "stores.region", "--totals", "grand")
	if len(got) < 2 {
		t.Fatalf("rows %v", got)
	}
	var out, errb bytes.Buffer
	if code := Main([]string{"run", model, "-m", "gones"}, nil, &out, &errb); code != exitFindings || !strings.Contains(errb.String(), "nowhere.csv") {
		t.Errorf("reading the missing table: exit %d\n%s", code, errb.String())
	}
}

func mustAbs(t *testing.T, p string) string {
	t.Helper()
	a, err := filepath.Abs(p)
	if err != nil {
		t.Fatal(err)
	}
	return a
}

// heapWatch is an output that records the largest Go heap seen while the
// result is written (sampled every 64 KiB), and when the first row after
// the header arrived.
type heapWatch struct {
	n, next   int
	peak      uint64
	start     time.Time
	firstData time.Duration
	header    int
}

func (w *heapWatch) Write(p []byte) (int, error) {
	w.n += len(p)
	if w.firstData == 0 && w.n > w.header {
		w.firstData = time.Since(w.start)
	}
	if w.n >= w.next {
		w.next = w.n + 64<<10
		var m runtime.MemStats
		runtime.ReadMemStats(&m)
		w.peak = max(w.peak, m.HeapAlloc)
	}
	return len(p), nil
}

// bigModel writes a Parquet file of n rows (id 1..n, v = id % 7) and a
// model over it, and returns the model's path.
func bigModel(tb testing.TB, n int) string {
	tb.Helper()
	dir := tb.TempDir()
	db, err := sql.Open("duckdb", "")
	if err != nil {
		tb.Fatal(err)
	}
	defer db.Close()
	file := filepath.Join(dir, "big.parquet")
	if _, err := db.ExecContext(context.Background(), fmt.Sprintf(
		"COPY (SELECT i AS id, i %% 7 AS v FROM range(1, %d) t(i)) TO '%s' (FORMAT parquet)", n+1, file)); err != nil {
		tb.Fatal(err)
	}
	model := filepath.Join(dir, "big.roll")
	src := "table big from \"big.parquet\" {\n  key id\n  id integer\n  v integer\n}\nmeasure total = sum(big.v)\n"
	if err := os.WriteFile(model, []byte(src), 0o644); err != nil {
		tb.Fatal(err)
	}
	return model
}

// runWatched runs `run MODEL -m total -b big.id` in format f and returns
// the watch: the peak heap above the heap before the run.
func runWatched(tb testing.TB, model, f string, more ...string) *heapWatch {
	tb.Helper()
	runtime.GC()
	var m runtime.MemStats
	runtime.ReadMemStats(&m)
	w := &heapWatch{start: time.Now(), header: len("big.id,total,rolled_up\n") + 1}
	var errb bytes.Buffer
	if code := Main(append([]string{"run", model, "-m", "total", "-b", "big.id", "--format", f}, more...), nil, w, &errb); code != 0 {
		tb.Fatalf("exit %d: %s", code, errb.String())
	}
	w.peak -= min(w.peak, m.HeapAlloc)
	return w
}

// A result of 300,000 rows is written without holding them: the Go heap
// grows by far less than the rows take (about 250 bytes each held: 75 MB
// in all), in CSV, JSON and the table format. The GC runs at 20 % growth
// here, so that garbage does not count as held.
func TestRunStreamsLargeResults(t *testing.T) {
	if testing.Short() {
		t.Skip("300,000 rows")
	}
	const rows = 300_000
	model := bigModel(t, rows)
	defer debug.SetGCPercent(debug.SetGCPercent(20))
	for _, f := range []string{"csv", "json", "table"} {
		w := runWatched(t, model, f)
		t.Logf("%s: heap +%.1f MB, first row after %s", f, float64(w.peak)/(1<<20), w.firstData)
		if w.peak > 16<<20 {
			t.Errorf("%s: the heap grew by %d MB while writing %d rows", f, w.peak>>20, rows)
		}
		if w.n < rows*8 {
			t.Errorf("%s: only %d bytes written", f, w.n)
		}
	}
}

// With --dsn too the result is streamed: 300,000 rows from a PostgreSQL
// view grow the heap by a few MB at most.
func TestRunStreamsFromLiveDatabase(t *testing.T) {
	if testing.Short() {
		t.Skip("300,000 rows")
	}
	const rows = 300_000
	e := livetest.Empty(t, "postgres", "outputs_stream")
	if err := e.Live.Exec(context.Background(), fmt.Sprintf(`CREATE VIEW big AS SELECT i AS id, i %% 7 AS v FROM generate_series(1, %d) i`, rows)); err != nil {
		t.Fatal(err)
	}
	model := filepath.Join(t.TempDir(), "big.roll")
	if err := os.WriteFile(model, []byte("table big {\n  key id\n  id integer\n  v integer\n}\nmeasure total = sum(big.v)\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	defer debug.SetGCPercent(debug.SetGCPercent(20))
	w := runWatched(t, model, "csv", "--dsn", e.DSN)
	t.Logf("heap +%.1f MB, first row after %s", float64(w.peak)/(1<<20), w.firstData)
	if w.peak > 16<<20 || w.n < rows*8 {
		t.Errorf("the heap grew by %d MB while writing %d bytes", w.peak>>20, w.n)
	}
}

var streamRows = flag.Int("stream-rows", 10_000_000, "rows of BenchmarkRunStreams's result")

// BenchmarkRunStreams runs a query whose result has -stream-rows rows
// (10 million by default) and writes it as CSV: the peak growth of the Go
// heap, and the time to the first row.
func BenchmarkRunStreams(b *testing.B) {
	model := bigModel(b, *streamRows)
	b.ResetTimer()
	for range b.N {
		w := runWatched(b, model, "csv")
		b.ReportMetric(float64(w.peak)/(1<<20), "peak-heap-MB")
		b.ReportMetric(w.firstData.Seconds(), "s-to-first-row")
		b.ReportMetric(float64(w.n)/(1<<20), "output-MB")
	}
}

// BenchmarkRunOneOfManyTables runs a query reading one table of a model
// of 20,000 tables (all over one small CSV file).
func BenchmarkRunOneOfManyTables(b *testing.B) {
	dir := b.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "one.csv"), []byte("id,v\n1,10\n2,20\n"), 0o644); err != nil {
		b.Fatal(err)
	}
	var src strings.Builder
	for i := range 20_000 {
		fmt.Fprintf(&src, "table t%d from \"one.csv\" {\n  key id\n  id integer\n  v integer\n}\n", i)
	}
	src.WriteString("measure total = sum(t0.v)\n")
	model := filepath.Join(dir, "many.roll")
	if err := os.WriteFile(model, []byte(src.String()), 0o644); err != nil {
		b.Fatal(err)
	}
	b.ResetTimer()
	for range b.N {
		var out, errb bytes.Buffer
		if code := Main([]string{"run", model, "-m", "total", "--format", "csv"}, nil, &out, &errb); code != 0 || !strings.Contains(out.String(), "30") {
			b.Fatalf("exit %d: %s%s", code, out.String(), errb.String())
		}
	}
}
