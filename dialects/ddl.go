package dialects

import (
	"fmt"
	"regexp"
	"slices"
	"strings"

	"github.com/rollwise/rollwise/planner/plan"
)

// This file is the DDL layer: how each engine creates a view so that
// running the same script twice is harmless. The spellings come from the
// CREATE VIEW table of docs/engine-facts.md (§11).

// ViewStyle is how a dialect makes CREATE VIEW idempotent.
type ViewStyle int

// The idempotent forms of CREATE VIEW.
const (
	// CreateOrReplace: CREATE OR REPLACE VIEW (DuckDB, PostgreSQL, MySQL,
	// MariaDB, Snowflake, BigQuery, Trino, Spark).
	CreateOrReplace ViewStyle = iota
	// CreateOrAlter: CREATE OR ALTER VIEW (SQL Server).
	CreateOrAlter
	// DropAndCreate: DROP VIEW IF EXISTS, then CREATE VIEW, for engines
	// that can do nothing else (SQLite).
	DropAndCreate
)

// ViewDDL is what a dialect needs to create views, as data.
type ViewDDL struct {
	Style ViewStyle
	// OrderBy reports whether a view's query may end with ORDER BY. Where
	// it may not (SQL Server), the ordering is left to whoever selects
	// from the view.
	OrderBy bool
	// BatchEnd is a line written after each statement of a script, for
	// engines that want some statements alone in their batch ("GO" for
	// SQL Server's CREATE OR ALTER VIEW); "" for none.
	BatchEnd string
	// ColumnList reports whether CREATE VIEW v (c1, c2) AS ... names the
	// view's columns. Where it does not (Trino), the query is wrapped in a
	// SELECT that renames its columns.
	ColumnList bool
}

// QualifiedName quotes a view or relation name given as parts (schema,
// name) and joins them with dots.
func QualifiedName(d *Dialect, parts []string) string {
	q := make([]string, len(parts))
	for i, p := range parts {
		q[i] = d.Ident(p)
	}
	return strings.Join(q, ".")
}

// RenderView renders a plan as the query of a view: the statement
// RenderWith prints, without its final ORDER BY where the dialect allows
// none in a view (the rows are the same; their order is then up to the
// reader).
func RenderView(p *plan.Plan, d *Dialect, o Options) (sql, caution string, err error) {
	sql, caution, err = RenderWith(p, d, o)
	if err != nil {
		return "", "", err
	}
	// Render ends with ORDER BY exactly when it sorts by a measure or by
	// group values.
	if !d.view.OrderBy && (len(p.Order) > 0 || len(p.Query.Groups) > 0) {
		sql = withoutOrderBy(sql)
	}
	return sql, caution, nil
}

// CreateView returns the statements (without a trailing semicolon) that
// create view name, or replace it if it exists, over query. The view's
// columns are called columns; the query calls them inner (nil: the same).
func CreateView(d *Dialect, name []string, columns, inner []string, query string) ([]string, error) {
	ddl := d.view
	if inner != nil && len(inner) != len(columns) {
		return nil, fmt.Errorf("internal error: %d view columns for %d query columns", len(columns), len(inner))
	}
	target := QualifiedName(d, name)
	if ddl.ColumnList {
		cols := make([]string, len(columns))
		for i, c := range columns {
			cols[i] = d.Ident(c)
		}
		target += " (" + strings.Join(cols, ", ") + ")"
	} else if inner != nil && !slices.Equal(inner, columns) {
		cols := make([]string, len(columns))
		for i, c := range columns {
			cols[i] = d.Ident(inner[i]) + " AS " + d.Ident(c)
		}
		query = "SELECT\n  " + strings.Join(cols, ",\n  ") + "\nFROM (\n" + query + "\n) AS " + d.Ident("view_rows")
	}
	switch ddl.Style {
	case CreateOrAlter:
		return []string{"CREATE OR ALTER VIEW " + target + " AS\n" + query}, nil
	case DropAndCreate:
		return []string{"DROP VIEW IF EXISTS " + QualifiedName(d, name),
			"CREATE VIEW " + target + " AS\n" + query}, nil
	}
	return []string{"CREATE OR REPLACE VIEW " + target + " AS\n" + query}, nil
}

// Script joins statements into a script: each ends with a semicolon, and
// with the dialect's batch end where it has one.
func Script(d *Dialect, stmts []string) (string, error) {
	ddl := d.view
	var b strings.Builder
	for _, s := range stmts {
		if ddl.BatchEnd != "" {
			if line, ok := batchSeparatorLine(s); ok {
				return "", &UnsupportedError{Dialect: d.Name(), Construct: fmt.Sprintf("a name holding the line %q", line),
					Hint: "sqlcmd and SSMS end a batch at such a line, even inside brackets: rename it without line breaks"}
			}
		}
		b.WriteString(s)
		b.WriteString(";\n")
		if ddl.BatchEnd != "" {
			b.WriteString(ddl.BatchEnd + "\n")
		}
	}
	return b.String(), nil
}

// batchSeparator is a line that sqlcmd and SSMS take as the end of a batch
// wherever it stands, even inside a quoted literal or name: GO in any case,
// an optional repeat count, blanks and a trailing comment
// (learn.microsoft.com/sql/t-sql/language-elements/sql-server-utilities-statements-go).
var batchSeparator = regexp.MustCompile(`(?i)^[ \t]*go(?:[ \t]+[0-9]+)?[ \t]*(?:--.*)?$`)

// batchSeparatorLine returns the first line of stmt that is a batch
// separator, counting a lone carriage return as a line break too.
func batchSeparatorLine(stmt string) (string, bool) {
	for _, line := range strings.FieldsFunc(stmt, func(r rune) bool { return r == '\n' || r == '\r' }) {
		if batchSeparator.MatchString(line) {
			return line, true
		}
	}
	return "", false
}

// withoutOrderBy cuts the final ORDER BY of a statement that Render
// printed: Render starts its top-level clauses at the beginning of a line
// and indents everything inside its CTEs, so the last line that starts
// with ORDER BY is the statement's own.
func withoutOrderBy(query string) string {
	if i := strings.LastIndex(query, "\nORDER BY "); i >= 0 {
		return query[:i]
	}
	return query
}
