package main

import (
	"context"
	"database/sql"
	"fmt"
	"math"
	"path/filepath"
	"strings"
	"time"

	"github.com/shopspring/decimal"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/engine"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/pipeline"
	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
)

// The scale factor 1 checks and the benchmarks run rollwise through its
// library (planner, dialects, engine) on one embedded DuckDB opened once,
// rather than through the command line: each `rollwise run` opens a new
// DuckDB and checks every Parquet column it casts, which at scale factor 1
// costs about 20 s of CPU per run (docs/benchmarks.md).

// loadModelFiles parses and checks model files of testdata/tpch.
func loadModelFiles(names []string) (*model.Model, error) {
	var paths []string
	for _, name := range names {
		paths = append(paths, filepath.Join(tpchDir, name))
	}
	m, diags, err := pipeline.Load(paths)
	if diags.HasErrors() {
		return nil, fmt.Errorf("%s", diags.Errors()[0].Error())
	}
	if err != nil {
		return nil, err
	}
	return m.Model, nil
}

// planSQL checks a query against the model, plans it and renders it.
func planSQL(m *model.Model, spec model.Request) (string, error) {
	q, diags := m.NewQuery(spec)
	if diags.HasErrors() {
		return "", fmt.Errorf("query: %v", diags.Errors()[0].Error())
	}
	p, diags := plan.NewPlan(q)
	if diags.HasErrors() {
		return "", fmt.Errorf("plan: %v", diags.Errors()[0].Error())
	}
	d, err := dialects.Get("duckdb")
	if err != nil {
		return "", err
	}
	return dialects.Render(p, d)
}

// engineRunner computes checks with planner, dialects and engine on one
// DuckDB, which reads the TPC-H tables as `rollwise run --data` does.
type engineRunner struct {
	ctx    context.Context
	db     *sql.DB
	models map[string]*model.Model
}

// newEngineRunner opens the embedded engine over the data of dir for the
// tables of tpch.roll (the other model files declare none).
func newEngineRunner(ctx context.Context, dir string) (*engineRunner, error) {
	m, err := loadModelFiles([]string{"tpch.roll"})
	if err != nil {
		return nil, err
	}
	// Decimals in the files' own types, as `rollwise run --data` reads
	// them first (it runs a query again on DECIMAL(38,6) only if it
	// overflows them).
	db, err := engine.OpenDuckDB(ctx, m, dir, engine.Options{FileDecimals: true})
	if err != nil {
		return nil, err
	}
	return &engineRunner{ctx: ctx, db: db, models: map[string]*model.Model{}}, nil
}

// Close closes the database.
func (r *engineRunner) Close() error { return r.db.Close() }

// model loads (once) the model of the listed files.
func (r *engineRunner) model(names []string) (*model.Model, error) {
	key := strings.Join(names, "+")
	if m, ok := r.models[key]; ok {
		return m, nil
	}
	m, err := loadModelFiles(names)
	if err != nil {
		return nil, err
	}
	r.models[key] = m
	return m, nil
}

// spec is the check's query as model.NewQuery takes it.
func (c tpchCheck) spec() model.Request {
	return model.Request{Measures: c.Measures, By: c.By, Where: c.Where, Totals: c.Totals,
		Order: c.Order, Limit: c.Limit}
}

// sql compiles the check's query.
func (r *engineRunner) sql(c tpchCheck) (string, error) {
	m, err := r.model(c.Models)
	if err != nil {
		return "", err
	}
	return planSQL(m, c.spec())
}

// table computes the check's rows: the mapped columns, in the SQL's order.
func (r *engineRunner) table(c tpchCheck) ([][]cellValue, error) {
	text, err := r.sql(c)
	if err != nil {
		return nil, err
	}
	res, err := engine.Query(r.ctx, r.db, text)
	if err != nil {
		return nil, err
	}
	at := map[string]int{}
	for i, name := range res.Columns {
		at[name] = i
	}
	var out [][]cellValue
	for _, row := range res.Rows {
		var vals []cellValue
		for _, col := range c.Columns {
			i, ok := at[col.Rollwise]
			if !ok {
				return nil, fmt.Errorf("the result has no column %q: %v", col.Rollwise, res.Columns)
			}
			v, err := engineValue(row[i])
			if err != nil {
				return nil, fmt.Errorf("%s: %v", col.Rollwise, err)
			}
			vals = append(vals, v)
		}
		out = append(out, vals)
	}
	return out, nil
}

// engineValue turns a value of engine.Result into a cellValue the way
// `rollwise run --format json` prints it: decimals exactly, floats in
// their shortest form, dates as YYYY-MM-DD.
func engineValue(v any) (cellValue, error) {
	switch x := v.(type) {
	case nil:
		return cellValue{kind: kindNull}, nil
	case string:
		return cellValue{kind: kindText, text: x}, nil
	case bool:
		return cellValue{kind: kindText, text: fmt.Sprint(x)}, nil
	case int64:
		return cellValue{kind: kindExact, num: decimal.NewFromInt(x), f: float64(x)}, nil
	case decimal.Decimal:
		f, _ := x.Float64()
		return cellValue{kind: kindExact, num: x, f: f}, nil
	case float64:
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return cellValue{kind: kindNull}, nil
		}
		return cellValue{kind: kindExact, num: decimal.NewFromFloat(x), f: x}, nil
	case time.Time:
		if x.Hour() == 0 && x.Minute() == 0 && x.Second() == 0 && x.Nanosecond() == 0 {
			return cellValue{kind: kindText, text: x.Format(time.DateOnly)}, nil
		}
		return cellValue{kind: kindText, text: x.Format(time.RFC3339Nano)}, nil
	}
	return cellValue{}, fmt.Errorf("unexpected engine value %v (%T)", v, v)
}
