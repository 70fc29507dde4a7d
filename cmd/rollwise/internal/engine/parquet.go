package engine

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// loadParquet creates r as a view over its Parquet file that selects the
// stored columns cast to their declared types (with r.fileDecimals, a
// decimal column that always fits is kept in the file's type). Before creating it, every
// column whose file type differs from the declared one, and does not
// always cast exactly (exactCast), is read and checked: a value
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
		if s.typ == c.duckType || r.fileDecimals && c.duckType == DecimalType && isDecimal(s.typ) && exactCast(s.typ, c.duckType) {
			selects[i] = field + " AS " + quoteIdent(c.name)
			continue
		}
		if s.typ == "VARCHAR" && c.typ == model.TypeTimestamp {
			// Keep the instant of a text timestamp with an offset.
			field = "CAST(" + field + " AS TIMESTAMPTZ)"
		}
		selects[i] = fmt.Sprintf("CAST(%s AS %s) AS %s", field, c.duckType, quoteIdent(c.name))
		if exactCast(s.typ, c.duckType) {
			continue // nothing to read: every value of the file's type fits
		}
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
	var cond, unreadable string
	switch {
	case s.typ == "VARCHAR":
		// Text is checked as a CSV field is.
		cond, unreadable = textRefused(x, c), textUnreadable(x, c)
	case c.typ == model.TypeText || c.typ == model.TypeFloat:
		// Any value has a text form; a float column is approximate by
		// declaration.
		unreadable = fmt.Sprintf("TRY_CAST(%s AS %s) IS NULL", x, c.duckType)
		cond = unreadable
	default:
		// Exact when the value survives the round trip to the declared
		// type and back.
		unreadable = fmt.Sprintf("TRY_CAST(%s AS %s) IS NULL", x, c.duckType)
		cond = unreadable + fmt.Sprintf(" OR TRY_CAST(TRY_CAST(%[1]s AS %[2]s) AS %[3]s) IS DISTINCT FROM %[1]s", x, c.duckType, s.typ)
	}
	q := fmt.Sprintf("SELECT file_row_number, CAST(%[1]s AS VARCHAR), %[2]s, %[3]s FROM read_parquet(%[4]s, file_row_number = true) WHERE %[1]s IS NOT NULL AND (%[5]s) ORDER BY file_row_number LIMIT 1",
		x, unreadable, textNumeric("CAST("+x+" AS VARCHAR)"), quoteString(r.file), cond)
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

// exactCast reports whether every value of DuckDB type src casts to the
// DuckDB type dst without failing or changing, so that the file's column
// need not be read to check it: a narrower integer into BIGINT, an integer
// or a DECIMAL(p,s) with s <= 6 and p-s <= 32 into DECIMAL(38,6), a date
// into TIMESTAMP, a FLOAT into DOUBLE, anything but a BLOB into text.
// (Common practice: these widenings are exact in any SQL engine; a
// DECIMAL(15,2) money column, as in TPC-H's Parquet files, is the case
// that matters, since reading it to check takes seconds at scale.)
func exactCast(src, dst string) bool {
	ints := map[string]int{ // integer types and the digits of their widest value
		"TINYINT": 3, "SMALLINT": 5, "INTEGER": 10, "BIGINT": 19,
		"UTINYINT": 3, "USMALLINT": 5, "UINTEGER": 10, "UBIGINT": 20,
	}
	switch dst {
	case "BIGINT":
		d, ok := ints[src]
		if ok {
			return d < 19 || src == "BIGINT"
		}
		p, s, ok := decimalType(src)
		return ok && s == 0 && p <= 18
	case DecimalType:
		if d, ok := ints[src]; ok {
			return d <= DecimalWidth-DecimalScale
		}
		p, s, ok := decimalType(src)
		return ok && s <= DecimalScale && p-s <= DecimalWidth-DecimalScale
	case "DOUBLE":
		return src == "FLOAT"
	case "TIMESTAMP":
		return src == "DATE"
	case "VARCHAR":
		return src != "BLOB"
	}
	return false
}

// isDecimal reports whether t is a DuckDB DECIMAL(p,s).
func isDecimal(t string) bool {
	_, _, ok := decimalType(t)
	return ok
}

// decimalType reads DuckDB's spelling DECIMAL(p,s).
func decimalType(t string) (p, s int, ok bool) {
	n, err := fmt.Sscanf(t, "DECIMAL(%d,%d)", &p, &s)
	return p, s, err == nil && n == 2 && strings.HasSuffix(t, ")")
}
