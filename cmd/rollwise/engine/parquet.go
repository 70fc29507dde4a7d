package engine

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/planner"
)

// loadParquet creates r as a view over its Parquet file that selects the
// stored columns cast to their declared types. Before creating it, every
// column whose file type differs from the declared one is checked: a value
// the cast would fail on or change (a fraction in an integer column, a
// seventh decimal place, a time of day in a date column) is an error that
// names the file, row, column and value.
func loadParquet(ctx context.Context, conn *sql.Conn, r *relation) error {
	name := r.tables[0].Name
	reader := "read_parquet(" + quoteString(r.file) + ")"
	src, err := describe(ctx, conn, reader)
	if err != nil {
		return fmt.Errorf("table %s: %s: %s", name, r.file, firstParagraph(err.Error()))
	}
	header := make([]string, len(src))
	for i, s := range src {
		header[i] = s.name
	}
	at, err := matchHeader(r, header)
	if err != nil {
		return err
	}
	selects := make([]string, len(r.columns))
	var errs []error
	for i, c := range r.columns {
		s := src[at[i]]
		field := quoteIdent(s.name)
		if s.typ == c.duckType {
			selects[i] = field + " AS " + quoteIdent(c.name)
			continue
		}
		if s.typ == "VARCHAR" && c.typ == planner.TypeTimestamp {
			// Keep the instant of a text timestamp with an offset.
			field = "CAST(" + field + " AS TIMESTAMPTZ)"
		}
		selects[i] = fmt.Sprintf("CAST(%s AS %s) AS %s", field, c.duckType, quoteIdent(c.name))
		if err := checkParquetColumn(ctx, conn, r, c, s); err != nil {
			errs = append(errs, err)
		}
	}
	if len(errs) > 0 {
		return errors.Join(errs...)
	}
	q := fmt.Sprintf("CREATE VIEW %s AS SELECT %s FROM %s", r.sqlName(), strings.Join(selects, ", "), reader)
	if _, err := conn.ExecContext(ctx, q); err != nil {
		return fmt.Errorf("table %s: %s: %s", name, r.file, firstParagraph(err.Error()))
	}
	return nil
}

// sourceColumn is a column of a data file as DuckDB reads it.
type sourceColumn struct {
	name string
	typ  string
}

// describe lists the columns a table function call returns.
func describe(ctx context.Context, conn *sql.Conn, reader string) ([]sourceColumn, error) {
	rows, err := conn.QueryContext(ctx, "SELECT column_name, column_type FROM (DESCRIBE SELECT * FROM "+reader+")")
	if err != nil {
		return nil, err
	}
	defer rows.Close()
	var cols []sourceColumn
	for rows.Next() {
		var c sourceColumn
		if err := rows.Scan(&c.name, &c.typ); err != nil {
			return nil, err
		}
		cols = append(cols, c)
	}
	return cols, rows.Err()
}

// checkParquetColumn finds the first value of source column s that column
// c cannot hold exactly.
func checkParquetColumn(ctx context.Context, conn *sql.Conn, r *relation, c column, s sourceColumn) error {
	x := quoteIdent(s.name)
	target := c.duckType
	if s.typ == "VARCHAR" {
		target = parseType(c)
	}
	cond := fmt.Sprintf("TRY_CAST(%s AS %s) IS NULL", x, target)
	switch {
	case c.typ == planner.TypeText || c.typ == planner.TypeFloat:
		// Any value has a text form; a float column is approximate by
		// declaration.
	case s.typ == "VARCHAR":
		// Parsing text loses nothing, except digits a number rounds off.
		if c.typ == planner.TypeInteger || c.typ == planner.TypeDecimal {
			cond += " OR " + lossyExpr(x, scaleOf(c.typ))
		}
	default:
		// Exact when the value survives the round trip to the declared
		// type and back.
		cond += fmt.Sprintf(" OR TRY_CAST(TRY_CAST(%[1]s AS %[2]s) AS %[3]s) IS DISTINCT FROM %[1]s", x, c.duckType, s.typ)
	}
	q := fmt.Sprintf("SELECT file_row_number, CAST(%[1]s AS VARCHAR), TRY_CAST(%[1]s AS %[2]s) IS NULL, TRY_CAST(%[1]s AS DOUBLE) IS NOT NULL FROM read_parquet(%[3]s, file_row_number = true) WHERE %[1]s IS NOT NULL AND (%[4]s) ORDER BY file_row_number LIMIT 1",
		x, target, quoteString(r.file), cond)
	b := badValue{col: c}
	err := conn.QueryRowContext(ctx, q).Scan(&b.row, &b.value, &b.unreadable, &b.numeric)
	if errors.Is(err, sql.ErrNoRows) {
		return nil
	}
	if err != nil {
		return fmt.Errorf("table %s: %s: column %s (%s in the file, declared %s): %s",
			c.table.Name, r.file, c.name, s.typ, c.typ, firstParagraph(err.Error()))
	}
	return fmt.Errorf("%s: row %d: column %s.%s (%s): %s", r.file, b.row+1, c.table.Name, c.name, c.typ, b.explain())
}
