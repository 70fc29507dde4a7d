// Package tpch writes TPC-H data as Parquet files, as an outside check for
// rollwise: the TPC-H queries have a published meaning, so a rollwise query
// that reproduces one can be compared with the query's SQL text run on the
// same data.
//
// The rows come from github.com/pingcap/go-tpc/tpch/dbgen (a Go port of the
// TPC-H dbgen 2.4.0) and are written through an embedded DuckDB: each table
// is appended to a staging table, then copied to DIR/<table>.parquet. A
// manifest (ManifestFile) written last marks a complete set of files for one
// scale factor; Generate does nothing when it finds one for the asked scale.
//
// The generator keeps its state in package variables; see dbgen.go for what
// that means and how this package copes. In short: Generate may be called
// any number of times, with any scale factors, from any goroutines (runs are
// serialised); the same scale factor always gives the same rows; the first
// run in a process spends about 8 s and 300 MiB building dbgen's text pool,
// which stays in memory; and while rows are made, os.Stdout is sent to the
// null device because the generator prints progress lines.
package tpch

import (
	"context"
	"database/sql"
	"database/sql/driver"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"runtime/debug"
	"strconv"
	"time"

	"github.com/duckdb/duckdb-go/v2"
	"github.com/pingcap/go-tpc/tpch/dbgen"
)

// ManifestFile is the name of the manifest inside a data folder.
const ManifestFile = "tpchgen.json"

// manifestFormat changes whenever the files this package writes change
// (types, columns, generator fixes), so that older caches are rewritten.
const manifestFormat = 1

// Manifest describes a complete set of generated files.
type Manifest struct {
	Format    int             `json:"format"`
	SF        float64         `json:"sf"`
	Generator string          `json:"generator"`
	Seconds   float64         `json:"seconds"`
	Tables    []ManifestTable `json:"tables"`
}

// ManifestTable is one generated file.
type ManifestTable struct {
	Name  string `json:"name"`
	File  string `json:"file"`
	Rows  int64  `json:"rows"`
	Bytes int64  `json:"bytes"`
}

// Rows returns the row count of the named table, or -1.
func (m *Manifest) Rows(table string) int64 {
	for _, t := range m.Tables {
		if t.Name == table {
			return t.Rows
		}
	}
	return -1
}

// ReadManifest reads the manifest of dir.
func ReadManifest(dir string) (*Manifest, error) {
	b, err := os.ReadFile(filepath.Join(dir, ManifestFile))
	if err != nil {
		return nil, err
	}
	var m Manifest
	if err := json.Unmarshal(b, &m); err != nil {
		return nil, fmt.Errorf("tpch: %s: %w", filepath.Join(dir, ManifestFile), err)
	}
	return &m, nil
}

// Complete reports whether dir holds a complete set of files for scale
// factor sf: a manifest of the current format for sf, and every table's
// file present with the size the manifest records.
func Complete(dir string, sf float64) bool {
	m, err := ReadManifest(dir)
	if err != nil || m.Format != manifestFormat || m.SF != sf || len(m.Tables) != len(Tables) {
		return false
	}
	for _, t := range m.Tables {
		st, err := os.Stat(filepath.Join(dir, t.File))
		if err != nil || st.Size() != t.Bytes {
			return false
		}
	}
	return true
}

// Generate writes the eight TPC-H tables at scale factor sf into
// dir/<table>.parquet, unless Complete(dir, sf) already holds. Scale
// factors of 1 and more must be whole numbers; below 1 they must be
// multiples of 0.001 (the C dbgen's rule). Files are written under
// temporary names and renamed into place; the manifest comes last.
func Generate(ctx context.Context, dir string, sf float64) error {
	params, err := planScale(sf)
	if err != nil {
		return err
	}
	if Complete(dir, sf) {
		return nil
	}
	genMu.Lock()
	defer genMu.Unlock()
	if Complete(dir, sf) { // another goroutine made them while we waited
		return nil
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	if err := os.Remove(filepath.Join(dir, ManifestFile)); err != nil && !errors.Is(err, fs.ErrNotExist) {
		return err
	}
	start := time.Now()
	if err := initGenerator(); err != nil {
		return err
	}
	params.apply()
	m := &Manifest{Format: manifestFormat, SF: sf, Generator: generatorVersion()}
	tmp, err := writeTables(ctx, dir, m)
	defer func() {
		for _, f := range tmp {
			os.Remove(f) // left only after a failure
		}
	}()
	if err != nil {
		return err
	}
	for _, t := range m.Tables {
		if want := params.rows[t.Name]; want >= 0 && t.Rows != want {
			return fmt.Errorf("tpch: %s has %d rows, want %d at scale factor %v", t.Name, t.Rows, want, sf)
		}
	}
	for i, t := range m.Tables {
		if err := os.Rename(tmp[i], filepath.Join(dir, t.File)); err != nil {
			return err
		}
	}
	m.Seconds = time.Since(start).Seconds()
	b, err := json.MarshalIndent(m, "", "  ")
	if err != nil {
		return err
	}
	return writeFileAtomic(filepath.Join(dir, ManifestFile), append(b, '\n'))
}

// writeTables generates every table into temporary Parquet files in dir,
// fills m.Tables (in Tables order) and returns the temporary paths.
func writeTables(ctx context.Context, dir string, m *Manifest) ([]string, error) {
	connector, err := duckdb.NewConnector("", nil)
	if err != nil {
		return nil, err
	}
	defer connector.Close()
	db := sql.OpenDB(connector)
	defer db.Close()
	conn, err := connector.Connect(ctx)
	if err != nil {
		return nil, err
	}
	defer conn.Close()

	files := map[string]string{}
	rows := map[string]int64{}
	var tmp []string
	for _, step := range genSteps {
		if err := runStep(ctx, db, conn, step, rows); err != nil {
			return tmp, err
		}
		for _, name := range step.tables {
			path := filepath.Join(dir, fmt.Sprintf(".%s.%d.parquet.tmp", name, os.Getpid()))
			tmp = append(tmp, path)
			files[name] = path
			copySQL := fmt.Sprintf("COPY %s TO %s (FORMAT parquet, COMPRESSION zstd)", quoteIdent(name), quoteString(path))
			if _, err := db.ExecContext(ctx, copySQL); err != nil {
				return tmp, fmt.Errorf("tpch: writing %s: %w", name, err)
			}
			if _, err := db.ExecContext(ctx, "DROP TABLE "+quoteIdent(name)); err != nil {
				return tmp, err
			}
		}
	}
	ordered := make([]string, 0, len(Tables))
	for _, t := range Tables {
		st, err := os.Stat(files[t.Name])
		if err != nil {
			return tmp, err
		}
		ordered = append(ordered, files[t.Name])
		m.Tables = append(m.Tables, ManifestTable{Name: t.Name, File: t.Name + ".parquet", Rows: rows[t.Name], Bytes: st.Size()})
	}
	return ordered, nil
}

// runStep makes the staging tables of one step, runs the generator into
// them and records their row counts.
func runStep(ctx context.Context, db *sql.DB, conn driver.Conn, step genStep, rows map[string]int64) error {
	loaders := map[dbgen.Table]dbgen.Loader{}
	sinks := make([]*sink, len(step.tables))
	defer func() {
		for _, slot := range step.slots {
			dbgenTables[slot].loader = nil // let the appenders be collected
		}
		for _, s := range sinks {
			if s != nil && s.app != nil {
				s.app.Close()
			}
		}
	}()
	for i, name := range step.tables {
		if _, err := db.ExecContext(ctx, tableByName(name).createSQL()); err != nil {
			return err
		}
		app, err := duckdb.NewAppenderFromConn(conn, "", name)
		if err != nil {
			return err
		}
		sinks[i] = &sink{ctx: ctx, app: app, dates: map[string]time.Time{}}
		loaders[step.slots[i]] = loader{s: sinks[i], row: rowFuncs[name]}
	}
	genErr := runDbGen(loaders, []dbgen.Table{step.gen})
	for i, s := range sinks {
		if s.err != nil {
			return fmt.Errorf("tpch: generating %s: %w", step.tables[i], s.err)
		}
	}
	if genErr != nil {
		return fmt.Errorf("tpch: %w", genErr)
	}
	for i, s := range sinks {
		err := s.app.Close()
		s.app = nil
		if err != nil {
			return fmt.Errorf("tpch: appending to %s: %w", step.tables[i], err)
		}
		rows[step.tables[i]] = s.rows
	}
	return nil
}

func tableByName(name string) Table {
	for _, t := range Tables {
		if t.Name == name {
			return t
		}
	}
	return Table{}
}

// generatorVersion names the go-tpc module version this binary was built
// with, when the build information says.
func generatorVersion() string {
	const mod = "github.com/pingcap/go-tpc"
	if bi, ok := debug.ReadBuildInfo(); ok {
		for _, d := range bi.Deps {
			if d.Path == mod {
				return mod + " " + d.Version + " (tpch/dbgen, a port of TPC-H dbgen 2.4.0)"
			}
		}
	}
	return mod + " (tpch/dbgen, a port of TPC-H dbgen 2.4.0)"
}

// writeFileAtomic writes data to a temporary file beside path and renames it.
func writeFileAtomic(path string, data []byte) error {
	tmp := fmt.Sprintf("%s.%d.tmp", path, os.Getpid())
	if err := os.WriteFile(tmp, data, 0o644); err != nil {
		return err
	}
	if err := os.Rename(tmp, path); err != nil {
		os.Remove(tmp)
		return err
	}
	return nil
}

// CacheDir is the folder where tests and tools keep the generated files
// of scale factor sf between runs: <os.TempDir()>/rollwise-tpch/sf<sf>.
func CacheDir(sf float64) string {
	return filepath.Join(os.TempDir(), "rollwise-tpch", "sf"+strconv.FormatFloat(sf, 'g', -1, 64))
}

// CreateViews makes one view per TPC-H table in db, named after the table
// and reading dir/<table>.parquet, so that the specification's queries run
// unchanged. db must be a DuckDB database.
func CreateViews(ctx context.Context, db *sql.DB, dir string) error {
	abs, err := filepath.Abs(dir)
	if err != nil {
		return err
	}
	for _, t := range Tables {
		q := fmt.Sprintf("CREATE OR REPLACE VIEW %s AS SELECT * FROM read_parquet(%s)",
			quoteIdent(t.Name), quoteString(filepath.Join(abs, t.Name+".parquet")))
		if _, err := db.ExecContext(ctx, q); err != nil {
			return fmt.Errorf("tpch: view %s: %w", t.Name, err)
		}
	}
	return nil
}
