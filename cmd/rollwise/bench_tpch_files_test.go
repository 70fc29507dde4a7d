package main

import (
	"context"
	"database/sql"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/cmd/internal/tpch"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/engine"
	"github.com/rollwise/rollwise/planner/model"
)

// BenchmarkTPCHFiles times each rollwise query as `rollwise run --data`
// runs it, on the engine's views over the TPC-H Parquet files (decimals in
// the files' own types, engine.Options.FileDecimals), against the TPC-H
// query text typed by hand on the raw files (views that select * from
// read_parquet), side by side in one process: the "gen/spec" metric is
// the target of issue 18 (at most 1.15 on every query). "gen/wide" is the
// same rollwise query over every decimal read as DECIMAL(38,6), as before
// FileDecimals. Nothing is copied into tables: all three read Parquet.
//
//	ROLLWISE_BENCH_SF=0.1 go test ./cmd/rollwise -run '^$' -bench 'TPCHFiles' -benchtime 10x -timeout 2h
func BenchmarkTPCHFiles(b *testing.B) {
	sf, err := benchSF()
	if err != nil {
		b.Fatal(err)
	}
	ctx := context.Background()
	dir := tpch.CacheDir(sf)
	if err := tpch.Generate(ctx, dir, sf); err != nil {
		b.Fatal(err)
	}
	m, err := loadModelFiles([]string{"tpch.roll"})
	if err != nil {
		b.Fatal(err)
	}
	native := benchConn(b, func() (*sql.DB, error) { return engine.OpenDuckDB(ctx, m, dir, engine.Options{FileDecimals: true}) })
	wide := benchConn(b, func() (*sql.DB, error) { return engine.OpenDuckDB(ctx, m, dir, engine.Options{}) })
	raw := benchConn(b, func() (*sql.DB, error) { return rawParquetDB(ctx, dir) })
	runner := &engineRunner{ctx: ctx, models: map[string]*model.Model{}}
	b.Logf("TPC-H scale factor %v", sf)
	for _, c := range readTPCHChecks(b, "queries.json") {
		if strings.Contains(c.ID, "/") {
			continue // alternatives and derived checks: not TPC-H queries
		}
		b.Run(c.ID, func(b *testing.B) {
			gen, err := runner.sql(c)
			if err != nil {
				b.Fatal(err)
			}
			spec, err := c.sqlText()
			if err != nil {
				b.Fatal(err)
			}
			benchRace(b, []*sql.Conn{native, raw, wide}, []string{"gen", "spec", "wide"}, []string{gen, spec, gen}, false)
		})
	}
}

// benchConn opens a database and one connection on it, closed when the
// benchmark ends.
func benchConn(b *testing.B, open func() (*sql.DB, error)) *sql.Conn {
	b.Helper()
	db, err := open()
	if err != nil {
		b.Fatal(err)
	}
	b.Cleanup(func() { db.Close() })
	conn, err := db.Conn(context.Background())
	if err != nil {
		b.Fatal(err)
	}
	b.Cleanup(func() { conn.Close() })
	return conn
}

// rawParquetDB is a DuckDB where each TPC-H table is a view over its
// Parquet file as written, in the file's own types (tpch.CreateViews).
func rawParquetDB(ctx context.Context, dir string) (*sql.DB, error) {
	db, err := sql.Open("duckdb", "")
	if err != nil {
		return nil, err
	}
	if err := tpch.CreateViews(ctx, db, dir); err != nil {
		db.Close()
		return nil, err
	}
	return db, nil
}
