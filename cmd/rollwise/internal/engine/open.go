package engine

import (
	"context"
	"database/sql"

	"github.com/rollwise/rollwise/planner/model"
)

// Engine runs rollwise's SQL: the embedded DuckDB loaded with a model's
// tables, or a live database. Both hand back values normalised the same
// way (see Result).
type Engine interface {
	// Query runs a query and returns all its rows. want gives the logical
	// type of each result column, which decides the Go type of its values
	// whatever a live driver returns; with want nil, the type the engine
	// reports decides. The embedded DuckDB reports every type exactly and
	// needs no want.
	Query(ctx context.Context, query string, want []model.Type) (*Result, error)
	// QueryEach runs a query and streams its rows to each, normalised as
	// by Query.
	QueryEach(ctx context.Context, query string, want []model.Type, each Each) error
	// Dialect is the name of the rollwise dialect the engine runs.
	Dialect() string
	// Close releases the engine.
	Close() error
}

// Target says what Open opens: the live database DSN names, or, when DSN
// is "", the embedded DuckDB with the tables of Model read from DataDir
// or their files.
type Target struct {
	DSN  string
	Live LiveOptions

	Model   *model.Model
	DataDir string
	DuckDB  Options
}

// Open opens the engine t names.
func Open(ctx context.Context, t Target) (Engine, error) {
	if t.DSN != "" {
		return OpenLive(ctx, t.DSN, t.Live)
	}
	db, err := OpenDuckDB(ctx, t.Model, t.DataDir, t.DuckDB)
	if err != nil {
		return nil, err
	}
	return &DuckDB{DB: db}, nil
}

// DuckDB is the embedded engine over a database OpenDuckDB loaded.
type DuckDB struct{ DB *sql.DB }

// Query runs a query (want is not needed: DuckDB reports each column's
// type exactly).
func (d *DuckDB) Query(ctx context.Context, query string, _ []model.Type) (*Result, error) {
	return Query(ctx, d.DB, query)
}

// QueryEach streams a query's rows to each.
func (d *DuckDB) QueryEach(ctx context.Context, query string, _ []model.Type, each Each) error {
	return QueryEach(ctx, d.DB, query, each)
}

// Dialect is "duckdb".
func (d *DuckDB) Dialect() string { return "duckdb" }

// Close closes the database.
func (d *DuckDB) Close() error { return d.DB.Close() }
