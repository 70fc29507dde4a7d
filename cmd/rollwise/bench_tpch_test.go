package main

import (
	"context"
	"database/sql"
	"fmt"
	"os"
	"slices"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/rollwise/rollwise/cmd/internal/tpch"
)

// Benchmarks of the SQL rollwise generates, on TPC-H data (scale factor 1
// unless ROLLWISE_BENCH_SF says otherwise). They only run with -bench; the
// first one generates the data into tpch.CacheDir (about 40 s, once).
//
//	go test ./cmd/rollwise -run '^$' -bench 'TPCH|WideReport' -benchtime 10x -timeout 2h
//
// Every figure is a ratio against a baseline run in the same process, on
// the same DuckDB connection, in alternating order: the generated SQL's
// time over the TPC-H query text's (BenchmarkTPCH), over a hand-fused query
// and the naive plan's (BenchmarkWideReport). docs/benchmarks.md records
// the figures.

// benchSFEnv overrides the benchmarks' scale factor (for a quick run at
// 0.1, say).
const benchSFEnv = "ROLLWISE_BENCH_SF"

// benchData is the benchmarks' database: the TPC-H tables loaded into an
// in-memory DuckDB as the engine exposes them (the model's types), and one
// connection that runs every query.
type benchData struct {
	sf   float64
	r    *engineRunner
	conn *sql.Conn
}

var benchShared struct {
	once sync.Once
	d    *benchData
	err  error
}

// sharedBenchData opens the database once per process.
func sharedBenchData(b *testing.B) *benchData {
	b.Helper()
	benchShared.once.Do(func() { benchShared.d, benchShared.err = openBenchData() })
	if benchShared.err != nil {
		b.Fatal(benchShared.err)
	}
	return benchShared.d
}

// openBenchData generates the data if needed, opens the engine over it and
// copies every relation into a table, so that the queries time DuckDB's
// own storage rather than Parquet decoding.
func openBenchData() (*benchData, error) {
	sf, err := benchSF()
	if err != nil {
		return nil, err
	}
	ctx := context.Background()
	dir := tpch.CacheDir(sf)
	if err := tpch.Generate(ctx, dir, sf); err != nil {
		return nil, err
	}
	r, err := newEngineRunner(ctx, dir)
	if err != nil {
		return nil, err
	}
	conn, err := r.db.Conn(ctx)
	if err != nil {
		r.Close()
		return nil, err
	}
	for _, t := range tpch.Tables {
		for _, q := range []string{
			fmt.Sprintf(`CREATE TABLE "bench_%s" AS SELECT * FROM %q`, t.Name, t.Name),
			fmt.Sprintf(`DROP VIEW %q`, t.Name),
			fmt.Sprintf(`ALTER TABLE "bench_%s" RENAME TO %q`, t.Name, t.Name),
		} {
			if _, err := conn.ExecContext(ctx, q); err != nil {
				conn.Close()
				r.Close()
				return nil, fmt.Errorf("%s: %v", q, err)
			}
		}
	}
	return &benchData{sf: sf, r: r, conn: conn}, nil
}

// benchSF is the benchmarks' scale factor: 1, or ROLLWISE_BENCH_SF.
func benchSF() (float64, error) {
	s := os.Getenv(benchSFEnv)
	if s == "" {
		return 1, nil
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		return 0, fmt.Errorf("%s=%q: %v", benchSFEnv, s, err)
	}
	return v, nil
}

// timedQuery runs a query to its last row and returns the rows, the wall
// time and the process's CPU time it took.
func timedQuery(ctx context.Context, conn *sql.Conn, q string) ([][]cellValue, time.Duration, time.Duration, error) {
	cpu := processCPU()
	start := time.Now()
	rows, err := conn.QueryContext(ctx, q)
	if err != nil {
		return nil, 0, 0, err
	}
	defer rows.Close()
	cols, err := rows.Columns()
	if err != nil {
		return nil, 0, 0, err
	}
	raw := make([]any, len(cols))
	ptrs := make([]any, len(cols))
	for i := range raw {
		ptrs[i] = &raw[i]
	}
	var out [][]cellValue
	for rows.Next() {
		if err := rows.Scan(ptrs...); err != nil {
			return nil, 0, 0, err
		}
		vals := make([]cellValue, len(raw))
		for i, v := range raw {
			if vals[i], err = sqlValue(v); err != nil {
				return nil, 0, 0, fmt.Errorf("column %s: %v", cols[i], err)
			}
		}
		out = append(out, vals)
	}
	if err := rows.Err(); err != nil {
		return nil, 0, 0, err
	}
	return out, time.Since(start), processCPU() - cpu, nil
}

// sameResults compares two SQL results: exact values exactly, a value in
// double precision within approxTolerance of the other.
func sameResults(a, b [][]cellValue) string {
	if len(a) != len(b) {
		return fmt.Sprintf("%d rows against %d", len(a), len(b))
	}
	for i := range a {
		if len(a[i]) != len(b[i]) {
			return fmt.Sprintf("row %d: %d columns against %d", i+1, len(a[i]), len(b[i]))
		}
		for j := range a[i] {
			x, y := a[i][j], b[i][j]
			if x.kind != y.kind {
				x, y = asApprox(x), asApprox(y)
			}
			if !sameCell(x, y) {
				return fmt.Sprintf("row %d, column %d: %s against %s\n  %s\n  %s", i+1, j+1, a[i][j], b[i][j], rowText(a[i]), rowText(b[i]))
			}
		}
	}
	return ""
}

// asApprox turns an exact number into a double.
func asApprox(v cellValue) cellValue {
	if v.kind != kindExact {
		return v
	}
	f, _ := v.num.Float64()
	return cellValue{kind: kindApprox, f: f}
}

// benchRace times queries against each other: each iteration runs all of
// them once, starting with a different one each time, query k on conns[k]
// (one connection serves all when conns has one). Before timing, it runs each once and checks that all return
// the same rows as the first (check false skips that, for queries whose
// order of equal rows may differ). It reports, for each query k > 0, the
// median over iterations of time(first)/time(k) as "NAME0/NAMEk", the
// ratio of their total CPU times as "NAME0/NAMEk-cpu", and the median wall
// time of each as "NAME-ms".
func benchRace(b *testing.B, conns []*sql.Conn, names, queries []string, check bool) {
	b.Helper()
	ctx := context.Background()
	conn := func(k int) *sql.Conn { return conns[min(k, len(conns)-1)] }
	var first [][]cellValue
	for k, q := range queries {
		rows, wall, _, err := timedQuery(ctx, conn(k), q)
		if err != nil {
			b.Fatalf("%s: %v\n%s", names[k], err, q)
		}
		b.Logf("%s: %d rows, %.0f ms (warm-up)", names[k], len(rows), float64(wall.Microseconds())/1000)
		if k == 0 {
			first = rows
		} else if msg := sameResults(first, rows); msg != "" && check {
			b.Fatalf("%s and %s disagree: %s", names[0], names[k], msg)
		}
	}
	wall := make([][]time.Duration, len(queries))
	cpu := make([]time.Duration, len(queries))
	for i := 0; b.Loop(); i++ {
		for j := range queries {
			k := (i + j) % len(queries)
			_, w, c, err := timedQuery(ctx, conn(k), queries[k])
			if err != nil {
				b.Fatalf("%s: %v", names[k], err)
			}
			wall[k] = append(wall[k], w)
			cpu[k] += c
		}
	}
	for k := 1; k < len(queries); k++ {
		ratios := make([]float64, len(wall[0]))
		for i := range ratios {
			ratios[i] = float64(wall[0][i]) / float64(wall[k][i])
		}
		b.ReportMetric(median(ratios), names[0]+"/"+names[k])
		if cpu[k] > 0 {
			b.ReportMetric(float64(cpu[0])/float64(cpu[k]), names[0]+"/"+names[k]+"-cpu")
		}
	}
	for k := range queries {
		ms := make([]float64, len(wall[k]))
		for i, w := range wall[k] {
			ms[i] = float64(w.Microseconds()) / 1000
		}
		b.ReportMetric(median(ms), names[k]+"-ms")
	}
}

func median(xs []float64) float64 {
	if len(xs) == 0 {
		return 0
	}
	s := slices.Clone(xs)
	slices.Sort(s)
	if len(s)%2 == 1 {
		return s[len(s)/2]
	}
	return (s[len(s)/2-1] + s[len(s)/2]) / 2
}

// BenchmarkTPCH times each rollwise query of queries.json against the
// TPC-H query text it reproduces (the target: gen/spec at most
// 1.10 for every query).
func BenchmarkTPCH(b *testing.B) {
	d := sharedBenchData(b)
	b.Logf("TPC-H scale factor %v", d.sf)
	for _, c := range readTPCHChecks(b, "queries.json") {
		if strings.Contains(c.ID, "/") {
			continue // alternatives and derived checks: not TPC-H queries
		}
		b.Run(c.ID, func(b *testing.B) {
			gen, err := d.r.sql(c)
			if err != nil {
				b.Fatal(err)
			}
			spec, err := c.sqlText()
			if err != nil {
				b.Fatal(err)
			}
			// Results are compared by the equivalence tests; here the
			// columns come in other orders.
			benchRace(b, []*sql.Conn{d.conn}, []string{"gen", "spec"}, []string{gen, spec}, false)
		})
	}
}

// BenchmarkTimeEdits times the plan rollwise makes for last year's order
// value and the year to date (queries.json's derived check orders_ly_ytd:
// the month cells shifted a year, and a window over the month cells; see
// planner/plan/plan_timecells.go) against the window query written by
// hand from the TPC-H schema, which computes both from the month cells
// alone (a join on the shifted month, a running sum).
func BenchmarkTimeEdits(b *testing.B) {
	d := sharedBenchData(b)
	b.Logf("TPC-H scale factor %v", d.sf)
	for _, c := range readTPCHChecks(b, "queries.json") {
		if !strings.HasSuffix(c.ID, "orders_ly_ytd") {
			continue
		}
		gen, err := d.r.sql(c)
		if err != nil {
			b.Fatal(err)
		}
		window, err := c.sqlText()
		if err != nil {
			b.Fatal(err)
		}
		benchRace(b, []*sql.Conn{d.conn}, []string{"gen", "window"}, []string{gen, window}, false)
	}
}
