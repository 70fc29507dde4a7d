package engine

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"strings"
	"time"

	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/shopspring/decimal"
)

// LoadInto copies a model's data into the live database, for tests and
// demonstrations: each table's CSV or Parquet file (or --data DIR's) is
// read and checked exactly as for the embedded DuckDB, then every
// relation is created under its `at` name with the declared column types
// (the dialect's ColumnType) and filled. Schemas are created as needed
// (PostgreSQL schemas, MySQL databases); in SQLite a schema must be an
// attached database (sqlite:PATH?attach=NAME=FILE). Existing tables of
// those names are dropped first: never point it at a warehouse.
func LoadInto(ctx context.Context, l *Live, m *model.Model, dataDir string) error {
	d, err := dialects.Get(l.dialect)
	if err != nil {
		return err
	}
	src, err := OpenDuckDB(ctx, m, dataDir, Options{})
	if err != nil {
		return err
	}
	defer src.Close()
	rels, err := relations(m.Tables, dataDir)
	if err != nil {
		return err
	}
	var errs []error
	for _, r := range rels {
		if err := l.loadRelation(ctx, d, src, r); err != nil {
			errs = append(errs, fmt.Errorf("loading %s into %s: %w", r.displayName(), l.Server, err))
		}
	}
	return errors.Join(errs...)
}

// relationName is the relation's quoted name in dialect d.
func relationName(d *dialects.Dialect, r *relation) string {
	parts := r.name
	if len(parts) == 0 {
		parts = []string{r.tables[0].Name}
	}
	q := make([]string, len(parts))
	for i, p := range parts {
		q[i] = d.Ident(p)
	}
	return strings.Join(q, ".")
}

// createNamespaceLive creates the schema a qualified relation name needs.
func (l *Live) createNamespaceLive(ctx context.Context, d *dialects.Dialect, r *relation) error {
	switch len(r.name) {
	case 0, 1:
		return nil
	case 2:
	default:
		return fmt.Errorf("relation %q has %d parts; the loader creates SCHEMA.TABLE or TABLE", r.displayName(), len(r.name))
	}
	schema := r.name[0]
	switch l.dialect {
	case "postgres":
		return l.Exec(ctx, "CREATE SCHEMA IF NOT EXISTS "+d.Ident(schema))
	case "mysql":
		return l.Exec(ctx, "CREATE DATABASE IF NOT EXISTS "+d.Ident(schema)+" CHARACTER SET utf8mb4")
	}
	var n int
	err := l.conn.QueryRowContext(ctx, "SELECT count(*) FROM pragma_database_list WHERE name = ?", schema).Scan(&n)
	if err == nil && n == 0 {
		err = fmt.Errorf("SQLite has no schema %q: attach a database file under that name (sqlite:PATH?attach=%s=FILE)", schema, schema)
	}
	return err
}

// columnType is the column's type in the live database. On MySQL and
// MariaDB text takes the session's binary NO PAD collation (openMySQL),
// which compares like DuckDB also at trailing spaces.
func (l *Live) columnType(d *dialects.Dialect, t model.Type) string {
	s := d.ColumnType(t)
	if t == model.TypeText && l.textCollation != "" {
		s = strings.Replace(s, "utf8mb4_bin", l.textCollation, 1)
	}
	return s
}

// placeholder is the n-th (1-based) statement parameter.
func (l *Live) placeholder(n int) string {
	if l.dialect == "postgres" {
		return fmt.Sprintf("$%d", n)
	}
	return "?"
}

func (l *Live) loadRelation(ctx context.Context, d *dialects.Dialect, src *sql.DB, r *relation) error {
	if err := l.createNamespaceLive(ctx, d, r); err != nil {
		return err
	}
	name := relationName(d, r)
	if err := l.Exec(ctx, "DROP TABLE IF EXISTS "+name); err != nil {
		return err
	}
	var defs, sel []string
	for _, c := range r.columns {
		defs = append(defs, d.Ident(c.name)+" "+l.columnType(d, c.typ))
		sel = append(sel, quoteIdent(c.name))
	}
	if err := l.Exec(ctx, "CREATE TABLE "+name+" ("+strings.Join(defs, ", ")+")"); err != nil {
		return err
	}
	res, err := Query(ctx, src, "SELECT "+strings.Join(sel, ", ")+" FROM "+r.sqlName())
	if err != nil {
		return err
	}
	batch := max(1, min(500, 20000/len(r.columns)))
	for start := 0; start < len(res.Rows); start += batch {
		rows := res.Rows[start:min(start+batch, len(res.Rows))]
		var tuples []string
		var args []any
		for _, row := range rows {
			marks := make([]string, len(row))
			for i, v := range row {
				args = append(args, l.param(v, r.columns[i].typ))
				marks[i] = l.placeholder(len(args))
			}
			tuples = append(tuples, "("+strings.Join(marks, ", ")+")")
		}
		if err := l.Exec(ctx, "INSERT INTO "+name+" VALUES "+strings.Join(tuples, ", "), args...); err != nil {
			return err
		}
	}
	return nil
}

// param is a DuckDB value as a statement parameter for the live database:
// decimals as exact text; dates and timestamps as ISO text for MySQL and
// SQLite (which stores them as text, in the form the sqlite dialect's
// literals use), as times for PostgreSQL.
func (l *Live) param(v any, t model.Type) any {
	switch x := v.(type) {
	case decimal.Decimal:
		return x.String()
	case time.Time:
		if l.dialect == "postgres" {
			return x
		}
		if t == model.TypeDate {
			return x.Format(time.DateOnly)
		}
		return x.Format("2006-01-02 15:04:05.999999")
	}
	return v
}
