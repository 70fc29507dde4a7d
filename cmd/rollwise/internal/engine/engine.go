// Package engine runs generated SQL on an embedded, in-memory DuckDB that
// exposes a model's tables under their warehouse relation names, loaded from
// the tables' CSV or Parquet files.
package engine

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"

	_ "github.com/duckdb/duckdb-go/v2" // registers the "duckdb" driver
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
)

// relation is one warehouse relation to create and the model tables that
// read it. Several tables may read one relation (a dimension playing
// several roles); it is loaded once, with the union of their stored
// columns.
type relation struct {
	name    []string
	tables  []*model.Table
	file    string
	columns []column
	// fileDecimals is Options.FileDecimals.
	fileDecimals bool
}

// column is a stored column of a relation.
type column struct {
	name     string
	typ      model.Type
	duckType string
	table    *model.Table
}

// Options are the choices of OpenDuckDB.
type Options struct {
	// FileDecimals keeps a Parquet column of a decimal type that always
	// fits DecimalType (a DECIMAL(15,2), say) in the file's own type
	// instead of casting it to DecimalType: the same values, in narrower
	// arithmetic that DuckDB computes two to three times faster
	// (docs/benchmarks.md). Results stay exact: DuckDB widens a sum to 38
	// digits and reports an overflow as an error (Out of Range), never a
	// rounding, and a query that fails so is run again on the wide types
	// (see Overflowed).
	FileDecimals bool
	// Tables, when set, are the only tables of the model loaded: a query
	// that reads a few tables of a large model loads just those (see
	// TablesRead).
	Tables []*model.Table
}

// Overflowed reports whether err is DuckDB's out-of-range error (a decimal
// product or sum too large for its type), after which a query on
// FileDecimals tables can be run again on the wide ones.
func Overflowed(err error) bool {
	return err != nil && strings.Contains(err.Error(), "Out of Range Error")
}

// OpenDuckDB opens an in-memory DuckDB and creates every table of m under its
// relation name: a TABLE loaded from a CSV file, or a VIEW over a Parquet
// file, with the stored columns in their declared types. With dataDir set,
// the file of table NAME is dataDir/NAME.csv or dataDir/NAME.parquet;
// otherwise it is the table's `from` file. All problems found are returned
// together; on error no database is returned. The database's time zone
// is UTC.
func OpenDuckDB(ctx context.Context, m *model.Model, dataDir string, o Options) (*sql.DB, error) {
	if m == nil {
		return nil, errors.New("no model to load")
	}
	tables := m.Tables
	if o.Tables != nil {
		tables = o.Tables
	}
	rels, err := relations(tables, dataDir)
	if err != nil {
		return nil, err
	}
	db, err := sql.Open("duckdb", "")
	if err != nil {
		return nil, fmt.Errorf("opening DuckDB: %w", err)
	}
	// One connection does all the loading, so that its temporary tables
	// stay visible to it; the tables it creates are visible to all.
	conn, err := db.Conn(ctx)
	if err != nil {
		db.Close()
		return nil, fmt.Errorf("opening DuckDB: %w", err)
	}
	// Time zones: UTC, whatever the machine's, so that results do not
	// depend on where rollwise runs. (Without the ICU extension DuckDB
	// has no time zones and is in UTC anyway, so a failure is harmless.)
	conn.ExecContext(ctx, "SET GLOBAL TimeZone = 'UTC'") //nolint:errcheck // see above
	var errs []error
	for _, r := range rels {
		r.fileDecimals = o.FileDecimals
		if err := load(ctx, conn, r); err != nil {
			errs = append(errs, err)
		}
	}
	if len(errs) == 0 {
		errs = append(errs, lockDown(ctx, conn, rels))
	}
	conn.Close()
	if err := errors.Join(errs...); err != nil {
		db.Close()
		return nil, err
	}
	return db, nil
}

// lockDown takes the loaded DuckDB off the file system, so that the SQL
// it runs (a handwritten query under verify) can neither read nor write
// files: only the Parquet files its views read stay readable
// (allowed_paths), and the configuration is locked so that no statement
// turns access back on (duckdb.org/docs/stable/operations_manual/securing_duckdb/overview).
func lockDown(ctx context.Context, conn *sql.Conn, rels []*relation) error {
	var files []string
	for _, r := range rels {
		if strings.EqualFold(filepath.Ext(r.file), ".parquet") {
			files = append(files, quoteString(r.file))
		}
	}
	stmts := []string{"SET enable_external_access = false", "SET lock_configuration = true"}
	if len(files) > 0 {
		stmts = append([]string{"SET allowed_paths = [" + strings.Join(files, ", ") + "]"}, stmts...)
	}
	for _, s := range stmts {
		if _, err := conn.ExecContext(ctx, s); err != nil {
			return fmt.Errorf("internal error: taking DuckDB off the file system: %w", err)
		}
	}
	return nil
}

// relations groups tables by relation and resolves each relation's data
// file and columns.
func relations(tables []*model.Table, dataDir string) ([]*relation, error) {
	var errs []error
	byKey := map[string]*relation{}
	var rels []*relation
	for _, t := range tables {
		key, err := relationKey(t)
		if err != nil {
			errs = append(errs, err)
			continue
		}
		r := byKey[key]
		if r == nil {
			r = &relation{name: t.Relation}
			byKey[key] = r
			rels = append(rels, r)
		}
		r.tables = append(r.tables, t)
	}
	for _, r := range rels {
		if err := r.resolveFile(dataDir); err != nil {
			errs = append(errs, err)
		}
		if err := r.resolveColumns(); err != nil {
			errs = append(errs, err)
		}
	}
	return rels, errors.Join(errs...)
}

// TablesRead lists the tables plan p reads: the table of each scan and
// the tables its joins reach, each once, in the model's order.
func TablesRead(m *model.Model, p *plan.Plan) []*model.Table {
	read := map[*model.Table]bool{}
	for _, s := range p.Scans {
		read[s.Table] = true
		for _, l := range s.Joins {
			read[l.To] = true
		}
	}
	var out []*model.Table
	for _, t := range m.Tables {
		if read[t] {
			out = append(out, t)
		}
	}
	return out
}

// relationKey is the identity of a table's relation in DuckDB, which
// matches names without regard to case and puts unqualified names in the
// main schema of the memory catalog.
func relationKey(t *model.Table) (string, error) {
	parts := t.Relation
	if len(parts) == 0 {
		parts = []string{t.Name}
	}
	if len(parts) > 3 {
		return "", fmt.Errorf("table %s: relation %q has %d parts; DuckDB names have at most three (catalog.schema.name)",
			t.Name, strings.Join(parts, "."), len(parts))
	}
	for _, p := range parts {
		if p == "" {
			return "", fmt.Errorf("table %s: relation %q has an empty part", t.Name, strings.Join(parts, "."))
		}
	}
	full := append([]string{"memory", "main"}[:3-len(parts)], parts...)
	return strings.ToLower(quoteName(full)), nil
}

// displayName is the relation as written in the model.
func (r *relation) displayName() string {
	if len(r.name) == 0 {
		return r.tables[0].Name
	}
	return strings.Join(r.name, ".")
}

// sqlName is the relation's quoted SQL name.
func (r *relation) sqlName() string {
	if len(r.name) == 0 {
		return quoteIdent(r.tables[0].Name)
	}
	return quoteName(r.name)
}

// tableNames lists the names of the tables reading r.
func (r *relation) tableNames() string {
	names := make([]string, len(r.tables))
	for i, t := range r.tables {
		names[i] = t.Name
	}
	return strings.Join(names, ", ")
}

// resolveFile finds the one data file of r.
func (r *relation) resolveFile(dataDir string) error {
	var errs []error
	var from *model.Table
	for _, t := range r.tables {
		f, err := dataFile(t, dataDir)
		if err != nil {
			errs = append(errs, err)
			continue
		}
		if f == "" {
			continue
		}
		if r.file == "" {
			r.file, from = f, t
		} else if filepath.Clean(f) != filepath.Clean(r.file) {
			errs = append(errs, fmt.Errorf("tables %s and %s both read relation %q but from different files, %s and %s; give them the same file",
				from.Name, t.Name, r.displayName(), r.file, f))
		}
	}
	if len(errs) > 0 {
		return errors.Join(errs...)
	}
	if r.file != "" {
		return nil
	}
	t := r.tables[0]
	if dataDir != "" {
		// Tables that play roles of one relation (at "nation") can share
		// the relation's file: DIR/nation.parquet.
		rel := t.Name
		if len(t.Relation) > 0 {
			rel = t.Relation[len(t.Relation)-1]
		}
		f, err := dataFileNamed(rel, dataDir)
		if err != nil || f != "" {
			r.file = f
			return err
		}
		return fmt.Errorf("table %s has no data file: --data %s holds none of %s.csv, %s.parquet, %s.csv, %s.parquet",
			t.Name, dataDir, t.Name, t.Name, rel, rel)
	}
	return fmt.Errorf("table %s has no data file: write `from \"FILE\"` in its declaration (a .csv or .parquet file, relative to the model file), or run with --data DIR where DIR holds %s.csv or %s.parquet",
		t.Name, t.Name, t.Name)
}

// dataFile returns the data file of t, or "" when it has none.
func dataFile(t *model.Table, dataDir string) (string, error) {
	if dataDir != "" {
		return dataFileNamed(t.Name, dataDir)
	}
	if t.File == "" {
		return "", nil
	}
	switch strings.ToLower(filepath.Ext(t.File)) {
	case ".csv", ".parquet":
		return t.File, nil
	}
	return "", fmt.Errorf("table %s: data file %s: rollwise reads .csv and .parquet files only", t.Name, t.File)
}

// dataFileNamed returns dataDir/name.csv or dataDir/name.parquet, or ""
// when neither exists.
func dataFileNamed(name, dataDir string) (string, error) {
	if name == "" || name == "." || name == ".." || strings.ContainsAny(name, `/\`) {
		return "", fmt.Errorf("%q cannot be used as a file name in --data %s", name, dataDir)
	}
	csvPath := filepath.Join(dataDir, name+".csv")
	pqPath := filepath.Join(dataDir, name+".parquet")
	hasCSV, hasPQ := isFile(csvPath), isFile(pqPath)
	switch {
	case hasCSV && hasPQ:
		return "", fmt.Errorf("%s: both %s and %s exist; keep only one", name, csvPath, pqPath)
	case hasCSV:
		return csvPath, nil
	case hasPQ:
		return pqPath, nil
	}
	return "", nil
}

// isFile reports whether path names an existing file (or a link to one).
func isFile(path string) bool {
	fi, err := os.Stat(path)
	return err == nil && !fi.IsDir()
}

// resolveColumns collects the stored columns of r's tables, in declaration
// order, checking that tables sharing the relation agree on their types.
func (r *relation) resolveColumns() error {
	var errs []error
	seen := map[string]column{}
	for _, t := range r.tables {
		for _, c := range t.Columns {
			if c == nil || !c.Stored() {
				continue
			}
			dt, err := duckType(c.Type)
			if err != nil {
				errs = append(errs, fmt.Errorf("table %s: column %s: %v", t.Name, c.Name, err))
				continue
			}
			key := strings.ToLower(c.Name)
			if prev, ok := seen[key]; ok {
				if prev.table == t {
					errs = append(errs, fmt.Errorf("table %s: columns %s and %s differ only in case, which DuckDB does not tell apart",
						t.Name, prev.name, c.Name))
				} else if prev.typ != c.Type {
					errs = append(errs, fmt.Errorf("tables %s and %s both read relation %q but declare column %s as %s and %s",
						prev.table.Name, t.Name, r.displayName(), c.Name, prev.typ, c.Type))
				}
				continue
			}
			col := column{name: c.Name, typ: c.Type, duckType: dt, table: t}
			seen[key] = col
			r.columns = append(r.columns, col)
		}
	}
	if len(r.columns) == 0 && len(errs) == 0 {
		errs = append(errs, fmt.Errorf("table %s declares no stored columns, so there is nothing to read from its data file", r.tableNames()))
	}
	return errors.Join(errs...)
}

// load creates r in the database.
func load(ctx context.Context, conn *sql.Conn, r *relation) error {
	if err := createNamespace(ctx, conn, r.name); err != nil {
		return fmt.Errorf("table %s: creating relation %q: %v", r.tables[0].Name, r.displayName(), err)
	}
	if _, err := os.Stat(r.file); err != nil {
		return fmt.Errorf("table %s: data file: %v", r.tables[0].Name, err)
	}
	if strings.ContainsAny(r.file, "*?[") {
		return fmt.Errorf("table %s: data file %s: DuckDB would read a name with *, ? or [ as a pattern; rename the file",
			r.tables[0].Name, r.file)
	}
	if strings.EqualFold(filepath.Ext(r.file), ".parquet") {
		return loadParquet(ctx, conn, r)
	}
	return loadCSV(ctx, conn, r)
}

// createNamespace creates the catalog and schema a qualified relation
// name needs.
func createNamespace(ctx context.Context, conn *sql.Conn, name []string) error {
	switch len(name) {
	case 2:
		_, err := conn.ExecContext(ctx, "CREATE SCHEMA IF NOT EXISTS "+quoteIdent(name[0]))
		return err
	case 3:
		if !strings.EqualFold(name[0], "memory") {
			if _, err := conn.ExecContext(ctx, "ATTACH IF NOT EXISTS ':memory:' AS "+quoteIdent(name[0])); err != nil {
				return err
			}
		}
		_, err := conn.ExecContext(ctx, "CREATE SCHEMA IF NOT EXISTS "+quoteName(name[:2]))
		return err
	}
	return nil
}
