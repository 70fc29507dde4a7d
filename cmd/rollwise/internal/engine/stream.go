package engine

import (
	"context"
	"database/sql"
	"fmt"

	"github.com/rollwise/rollwise/planner/model"
)

// Each is what a streamed query calls: Columns once with the result's
// column names, before any row, then Row once per row with its
// normalised values (see Result), a fresh slice each time. An error from
// either stops the query and is returned.
type Each struct {
	Columns func(names []string) error
	Row     func(values []any) error
}

// stream hands each row of rows to each, its values converted by conv
// (given the column's index, the driver's value and the driver's type
// name), and closes rows. Rows are read one at a time, so a result of any
// size takes the memory of one row here.
func stream(rows *sql.Rows, conv func(i int, v any, dbType string) (any, error), each Each) error {
	defer rows.Close()
	cols, err := rows.Columns()
	if err != nil {
		return err
	}
	types, err := rows.ColumnTypes()
	if err != nil {
		return err
	}
	if err := each.Columns(cols); err != nil {
		return err
	}
	raw := make([]any, len(cols))
	ptrs := make([]any, len(cols))
	for i := range raw {
		ptrs[i] = &raw[i]
	}
	for n := 1; rows.Next(); n++ {
		for i := range raw {
			raw[i] = nil
		}
		if err := rows.Scan(ptrs...); err != nil {
			return fmt.Errorf("query: reading row %d: %w", n, err)
		}
		row := make([]any, len(cols))
		for i, v := range raw {
			if row[i], err = conv(i, v, types[i].DatabaseTypeName()); err != nil {
				return fmt.Errorf("query: column %q: %v", cols[i], err)
			}
		}
		if err := each.Row(row); err != nil {
			return err
		}
	}
	if err := rows.Err(); err != nil {
		return fmt.Errorf("query failed: %w", err)
	}
	return nil
}

// collect is an Each that gathers every row into res.
func collect(res *Result) Each {
	return Each{
		Columns: func(names []string) error { res.Columns = names; return nil },
		Row:     func(values []any) error { res.Rows = append(res.Rows, values); return nil },
	}
}

// Query runs a query on the embedded engine and returns all its rows with
// normalised values. A value of a type rollwise does not use (a list, an
// interval, a blob...) is an error naming the column.
func Query(ctx context.Context, db *sql.DB, query string) (*Result, error) {
	if db == nil {
		return nil, fmt.Errorf("query: no database")
	}
	res := &Result{Rows: [][]any{}}
	if err := QueryEach(ctx, db, query, collect(res)); err != nil {
		return nil, err
	}
	return res, nil
}

// QueryEach runs a query on the embedded engine and streams its rows to
// each, normalised as by Query.
func QueryEach(ctx context.Context, db *sql.DB, query string, each Each) error {
	rows, err := db.QueryContext(ctx, query)
	if err != nil {
		return fmt.Errorf("query failed: %w", err)
	}
	return stream(rows, func(_ int, v any, dbType string) (any, error) { return normalize(v, dbType) }, each)
}

// Query runs a query on the live database and returns all its rows, with
// values normalised as on the embedded DuckDB (see Result): want gives
// the logical type of each result column, which decides the Go type of
// its values whatever the driver returns (PostgreSQL sends numeric as
// text, MySQL sends everything as text, SQLite has no date or decimal
// type). A column past the end of want, or of TypeNull, keeps the
// driver's value; with want nil, the type the server reports decides.
func (l *Live) Query(ctx context.Context, query string, want []model.Type) (*Result, error) {
	res := &Result{Rows: [][]any{}}
	if err := l.QueryEach(ctx, query, want, collect(res)); err != nil {
		return nil, err
	}
	return res, nil
}

// QueryEach runs a query on the live database and streams its rows to
// each, normalised as by Query, within the session's statement timeout
// (each's work included); past it, or when ctx ends, the statement is
// cancelled on the server.
func (l *Live) QueryEach(ctx context.Context, query string, want []model.Type, each Each) error {
	ctx, cancel := l.withStatementTimeout(ctx)
	defer cancel()
	return l.explain(ctx, l.queryEach(ctx, query, want, each))
}

// queryEach is QueryEach within the statement's time.
func (l *Live) queryEach(ctx context.Context, query string, want []model.Type, each Each) error {
	rows, done, err := l.rows(ctx, query)
	if err != nil {
		return fmt.Errorf("query failed: %w", err)
	}
	defer done() //nolint:errcheck // rolls back a read-only transaction: nothing to keep
	return stream(rows, func(i int, v any, dbType string) (any, error) {
		t := model.TypeNull
		switch {
		case i < len(want):
			t = want[i]
		case want == nil:
			t = typeOfColumn(dbType)
		}
		return liveValue(v, dbType, t)
	}, each)
}
