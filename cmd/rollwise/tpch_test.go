package main

import (
	"bytes"
	"context"
	"database/sql"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/rollwise/rollwise/cmd/internal/tpch"
)

// TPC-H as an outside check. The queries are those of the TPC Benchmark H
// (Decision Support) Standard Specification, Revision 2.17.1, clause 2.4
// ("Queries and Refresh Functions": for query N, 2.4.N.2 is the functional
// query definition, 2.4.N.3 the substitution parameters and 2.4.N.4 the
// validation values). testdata/tpch/queries/qN.sql hold those query texts
// with their validation values; testdata/tpch/queries.json says which
// rollwise query reproduces each one. On the same DuckDB data (scale factor
// 0.01, generated once into tpch.CacheDir), each rollwise query, run
// through the command line in-process with --data and --format json, must
// return the rows the query text returns: money and counts exactly (the
// columns are DECIMAL(15,2), and their sums are exact decimals in both),
// averages and ratios within approxTolerance. queries.json's derived
// checks (SQL we wrote from a TPC-H query, queries/derived/) cover totals,
// cell edits and per-grain measures, which no TPC-H query has.

// tpchDir is testdata/tpch.
var tpchDir = filepath.Join("..", "..", "testdata", "tpch")

// tpchCheck is one rollwise query of queries.json and the SQL file whose
// rows it must return.
type tpchCheck struct {
	ID       string   `json:"id"`
	SQL      string   `json:"sql"`
	Status   string   `json:"status"`
	Models   []string `json:"models"`
	Measures []string `json:"measures"`
	By       []string `json:"by"`
	Where    string   `json:"where"`
	Totals   string   `json:"totals"`
	Order    string   `json:"order"`
	Limit    int      `json:"limit"`
	// Substitute replaces text of the SQL file before it runs: another
	// value of a substitution parameter.
	Substitute map[string]string `json:"substitute"`
	Columns    []struct {
		SQL      string `json:"sql"`
		Rollwise string `json:"rollwise"`
	} `json:"columns"`
	Alternatives []tpchCheck `json:"alternatives"`
}

// tpchFile is testdata/tpch/queries.json.
type tpchFile struct {
	Models  []string    `json:"models"`
	Queries []tpchCheck `json:"queries"`
	Derived []tpchCheck `json:"derived"`
}

// readTPCHChecks reads a JSON file of checks, fills in what alternatives
// inherit from their query (SQL file, status, models) and returns every
// check with a name for its subtest.
func readTPCHChecks(t testing.TB, name string) []tpchCheck {
	t.Helper()
	b, err := os.ReadFile(filepath.Join(tpchDir, name))
	if err != nil {
		t.Fatal(err)
	}
	var f tpchFile
	if err := json.Unmarshal(b, &f); err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	var out []tpchCheck
	for _, q := range f.Queries {
		if len(q.Models) == 0 {
			q.Models = f.Models
		}
		for i, alt := range q.Alternatives {
			alt.ID = fmt.Sprintf("%s/alternative_%d_%s", q.ID, i+1, strings.Join(alt.Measures, "_"))
			alt.SQL = q.SQL
			if alt.Status == "" {
				alt.Status = q.Status
			}
			if len(alt.Models) == 0 {
				alt.Models = q.Models
			}
			out = append(out, alt)
		}
		q.Alternatives = nil
		out = append(out, q)
	}
	for _, d := range f.Derived {
		d.ID = "derived/" + d.ID
		if len(d.Models) == 0 {
			d.Models = f.Models
		}
		out = append(out, d)
	}
	slices.SortStableFunc(out, func(a, b tpchCheck) int { return strings.Compare(a.ID, b.ID) })
	return out
}

// args is the rollwise command line of the check, reading data from dir.
func (c tpchCheck) args(dir string) []string {
	a := []string{"run"}
	for _, m := range c.Models {
		a = append(a, filepath.Join(tpchDir, m))
	}
	a = append(a, "--data", dir, "-m", strings.Join(c.Measures, ","))
	if len(c.By) > 0 {
		a = append(a, "-b", strings.Join(c.By, ","))
	}
	if c.Where != "" {
		a = append(a, "-w", c.Where)
	}
	if c.Totals != "" {
		a = append(a, "--totals", c.Totals)
	}
	if c.Order != "" {
		a = append(a, "--order", c.Order)
	}
	if c.Limit > 0 {
		a = append(a, "--limit", strconv.Itoa(c.Limit))
	}
	return a
}

// sqlText reads the check's SQL file and applies its substitutions.
func (c tpchCheck) sqlText() (string, error) {
	b, err := os.ReadFile(filepath.Join(tpchDir, c.SQL))
	if err != nil {
		return "", err
	}
	text := string(b)
	keys := make([]string, 0, len(c.Substitute))
	for k := range c.Substitute {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	for _, k := range keys {
		if !strings.Contains(text, k) {
			return "", fmt.Errorf("%s: substitute %q: the text does not hold it", c.SQL, k)
		}
		text = strings.ReplaceAll(text, k, c.Substitute[k])
	}
	return text, nil
}

// orderColumn is the index of the SQL column holding the --order measure
// of a `ties` check, or -1.
func (c tpchCheck) orderColumn() int {
	if c.Status != "ties" {
		return -1
	}
	m := strings.Fields(c.Order)
	for i, col := range c.Columns {
		if len(m) > 0 && col.Rollwise == m[0] {
			return i
		}
	}
	return -1
}

// runRollwise runs the command line in-process and decodes its JSON rows.
func runRollwise(args []string) ([]map[string]any, error) {
	var out, errb bytes.Buffer
	if code := Main(append(args, "--format", "json"), strings.NewReader(""), &out, &errb); code != 0 {
		return nil, fmt.Errorf("rollwise %s: exit %d\n%s", shellQuote(args), code, errb.String())
	}
	dec := json.NewDecoder(&out)
	dec.UseNumber()
	var rows []map[string]any
	if err := dec.Decode(&rows); err != nil {
		return nil, fmt.Errorf("rollwise %s: bad JSON: %v", shellQuote(args), err)
	}
	return rows, nil
}

// shellQuote prints a command line as one could paste it into a shell.
func shellQuote(args []string) string {
	q := make([]string, len(args))
	for i, a := range args {
		if a == "" || strings.ContainsAny(a, " '\"*()<>=,;$") {
			q[i] = "'" + strings.ReplaceAll(a, "'", `'\''`) + "'"
		} else {
			q[i] = a
		}
	}
	return strings.Join(q, " ")
}

// rollwiseTable picks the mapped columns, in the SQL's column order, out
// of rollwise's JSON rows.
func (c tpchCheck) rollwiseTable(rows []map[string]any) ([][]cellValue, error) {
	var out [][]cellValue
	for i, r := range rows {
		var vals []cellValue
		for _, col := range c.Columns {
			raw, ok := r[col.Rollwise]
			if !ok {
				return nil, fmt.Errorf("row %d has no column %q: %v", i+1, col.Rollwise, r)
			}
			v, err := jsonValue(raw)
			if err != nil {
				return nil, fmt.Errorf("row %d, %s: %v", i+1, col.Rollwise, err)
			}
			vals = append(vals, v)
		}
		out = append(out, vals)
	}
	return out, nil
}

// sqlTable runs a query and returns its rows; the result's column names
// must be the check's SQL columns.
func (c tpchCheck) sqlTable(ctx context.Context, db *sql.DB, text string) ([][]cellValue, error) {
	rows, err := db.QueryContext(ctx, text)
	if err != nil {
		return nil, err
	}
	defer rows.Close()
	cols, err := rows.Columns()
	if err != nil {
		return nil, err
	}
	var want []string
	for _, col := range c.Columns {
		want = append(want, col.SQL)
	}
	if !slices.Equal(cols, want) {
		return nil, fmt.Errorf("%s returns columns %v; queries.json maps %v", c.SQL, cols, want)
	}
	var out [][]cellValue
	raw := make([]any, len(cols))
	ptrs := make([]any, len(cols))
	for i := range raw {
		ptrs[i] = &raw[i]
	}
	for rows.Next() {
		if err := rows.Scan(ptrs...); err != nil {
			return nil, err
		}
		vals := make([]cellValue, len(cols))
		for i, v := range raw {
			if vals[i], err = sqlValue(v); err != nil {
				return nil, fmt.Errorf("%s: column %s: %v", c.SQL, cols[i], err)
			}
		}
		out = append(out, vals)
	}
	return out, rows.Err()
}

// tpchPlannerIssues lists checks skipped because the planner gets them
// wrong, each with the smallest query that shows it. Empty means every
// check of queries.json passes.
var tpchPlannerIssues = map[string]string{}

// openTPCH generates scale factor sf into its cache folder (once) and opens
// a DuckDB with one view per TPC-H table, for the SQL texts.
func openTPCH(t testing.TB, ctx context.Context, sf float64) (string, *sql.DB) {
	t.Helper()
	dir := tpch.CacheDir(sf)
	start := time.Now()
	if err := tpch.Generate(ctx, dir, sf); err != nil {
		t.Fatal(err)
	}
	t.Logf("TPC-H scale factor %v in %s, ready in %.1fs", sf, dir, time.Since(start).Seconds())
	db, err := sql.Open("duckdb", "")
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { db.Close() })
	if err := tpch.CreateViews(ctx, db, dir); err != nil {
		t.Fatal(err)
	}
	return dir, db
}

// TestTPCHEquivalence runs every check of queries.json at scale factor
// 0.01 (see the comment at the top of this file).
func TestTPCHEquivalence(t *testing.T) {
	t.Parallel()
	if testing.Short() {
		t.Skip("generates TPC-H data at scale factor 0.01 (about 8 s the first time); skipped with -short")
	}
	ctx, cancel := context.WithTimeout(context.Background(), 5*time.Minute)
	defer cancel()
	checks := readTPCHChecks(t, "queries.json")
	dir, db := openTPCH(t, ctx, 0.01)
	ran := 0
	for _, c := range checks {
		t.Run(c.ID, func(t *testing.T) {
			if why, ok := tpchPlannerIssues[c.ID]; ok {
				t.Skip(why)
			}
			ran++
			runTPCHCheck(ctx, t, c, db, cliRunner(dir))
		})
	}
	if ran < 9 {
		t.Errorf("only %d checks ran; queries.json maps at least the nine TPC-H queries", ran)
	}
	// The results above rely on the links tpch.roll declares required.
	code, msg := checkCmd(filepath.Join(tpchDir, "tpch.roll"), "--data", dir)
	if code != 0 || !strings.Contains(msg, "; on the data, 9 required links and 10 uniqueness promises hold") {
		t.Errorf("rollwise check tpch.roll --data %s: exit %d\n%s", dir, code, msg)
	}
}

// runTPCHCheck runs one check, with run computing rollwise's rows, and
// reports every difference.
func runTPCHCheck(ctx context.Context, t *testing.T, c tpchCheck, db *sql.DB, run func(tpchCheck) ([][]cellValue, error)) {
	t.Helper()
	text, err := c.sqlText()
	if err != nil {
		t.Fatal(err)
	}
	want, err := c.sqlTable(ctx, db, text)
	if err != nil {
		t.Fatalf("%s: %v", c.SQL, err)
	}
	got, err := run(c)
	if err != nil {
		t.Fatal(err)
	}
	if len(want) == 0 {
		t.Errorf("%s returns no rows: the check proves nothing", c.SQL)
	}
	diffs, ties := c.compare(got, want)
	if ties > 0 {
		t.Logf("%d rows tie on %s and were compared as sets", ties, c.Order)
	}
	if len(diffs) > 0 {
		t.Errorf("rollwise %s\ndiffers from %s:\n%s", shellQuote(c.args("DIR")), c.SQL, strings.Join(diffs, "\n"))
	}
}

// cliRunner computes a check's rows with the command line, run
// in-process, reading the data of dir.
func cliRunner(dir string) func(tpchCheck) ([][]cellValue, error) {
	return func(c tpchCheck) ([][]cellValue, error) {
		rows, err := runRollwise(c.args(dir))
		if err != nil {
			return nil, err
		}
		return c.rollwiseTable(rows)
	}
}

// compare compares rollwise's rows with the SQL's as the check's status
// says.
func (c tpchCheck) compare(got, want [][]cellValue) ([]string, int) {
	return compareResult(got, want, c.orderColumn(), c.Limit > 0)
}
