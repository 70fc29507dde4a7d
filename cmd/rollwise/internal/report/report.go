// Package report writes query results for people (aligned tables,
// Markdown) and for machines (CSV, JSON).
//
// A result row is either a detail row or a total row: a total row has one
// or more group columns rolled up (it is the measures re-evaluated without
// grouping on them). People see the rolled-up cells labelled "Total" (or
// "All" in the grand total, where every group column is rolled up);
// machines get them as NULL plus the row's list of rolled-up columns, so
// that a total is never confused with a genuine NULL group value.
package report

import (
	"errors"
	"fmt"
	"io"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// Column describes one column of a result.
type Column struct {
	// Name is the column's heading and JSON key: the group reference as
	// written (e.g. "plants.family") or the measure name.
	Name string
	// Group marks a group column (a --by column), which total rows roll up.
	Group bool
	// Format says how a measure's values are shown in the table and
	// markdown formats.
	Format model.Format
	// Type is the column's type where known: a date column shows its
	// values as dates, a timestamp column as timestamps. Unknown
	// (TypeNull), Write shows a column as dates when all its time values
	// fall on midnight UTC.
	Type model.Type
	// Period is "month", "quarter" or "year" for a column whose values
	// are known to be the starts of such periods (date_trunc): the table
	// and markdown formats show 2024-01, 2024-Q1 or 2024; JSON and CSV
	// keep the ISO date.
	Period string
}

// Row is one result row.
type Row struct {
	// Values holds one value per column: nil, int64, float64,
	// decimal.Decimal, string, bool or time.Time (other integer and float
	// types are accepted too). The values of rolled-up columns are ignored.
	Values []any
	// RolledUp names the group columns rolled up in this row; empty for a
	// detail row.
	RolledUp []string
}

// Table is a query result to write.
type Table struct {
	Columns []Column
	Rows    []Row
}

// Options say how to write a table.
type Options struct {
	// Format is one of table, csv, json, markdown; "" means table.
	Format string
	// Color makes total rows bold in the table format (ANSI escapes).
	Color bool
	// Width, when positive, is the terminal width: the table format
	// wraps its widest text columns to fit. Numbers are never cut.
	Width int
	// Title and Cautions head the html format's page (the other formats
	// leave cautions to stderr); Omitted counts the rows of the result
	// left out of the table given, which the page mentions.
	Title    string
	Cautions []string
	Omitted  int
}

// The output formats.
const (
	FormatTable    = "table"
	FormatCSV      = "csv"
	FormatJSON     = "json"
	FormatMarkdown = "markdown"
	FormatHTML     = "html"
)

// Formats lists the valid output format names.
func Formats() []string {
	return []string{FormatTable, FormatCSV, FormatJSON, FormatMarkdown, FormatHTML}
}

// ValidFormat returns nil when s names an output format, and otherwise an
// error that lists the valid names.
func ValidFormat(s string) error {
	for _, f := range Formats() {
		if s == f {
			return nil
		}
	}
	return fmt.Errorf("unknown format %q: valid formats are %s", s, strings.Join(Formats(), ", "))
}

// Write writes t to w in the format o.Format.
func Write(w io.Writer, t *Table, o Options) error {
	if t == nil {
		return errors.New("report: no table")
	}
	if o.Format == FormatHTML {
		return writeHTML(w, t, o)
	}
	s, err := newStream(w, t.Columns, o, dateColumns(t))
	if err != nil {
		return err
	}
	for _, r := range t.Rows {
		if err := s.Row(r); err != nil {
			return err
		}
	}
	return s.Close()
}

// prepared is a run of validated rows with every cell rendered in every
// form: all the rows of a CSV or JSON output one at a time, or a chunk of
// the table and Markdown formats.
type prepared struct {
	cols []Column
	// numeric marks columns whose values are all numbers (right-aligned).
	numeric []bool
	rows    []preparedRow
}

// preparedRow is a validated row.
type preparedRow struct {
	cells    []cell
	rolledUp []string
	// grand marks the grand total: every group column rolled up.
	grand bool
}

// cell is one value in the forms the writers need.
type cell struct {
	rolled bool
	null   bool
	json   string // a JSON literal
	raw    string // full-precision text for CSV; "" for NULL
	show   string // display text for people
}

// numberCells marks the cells that hold numbers, for alignment.
type numberCells []bool

// prepareRow validates row r (the n-th) and renders its cells; number
// says which of them are numbers.
func (s *Stream) prepareRow(n int, r Row) (preparedRow, numberCells, error) {
	if len(r.Values) != len(s.cols) {
		return preparedRow{}, nil, fmt.Errorf("report: row %d has %d values for %d columns", n, len(r.Values), len(s.cols))
	}
	rolled := map[string]bool{}
	for _, name := range r.RolledUp {
		if !s.groups[name] {
			return preparedRow{}, nil, fmt.Errorf("report: row %d rolls up %q, which is not a group column", n, name)
		}
		rolled[name] = true
	}
	pr := preparedRow{cells: make([]cell, len(s.cols)), rolledUp: r.RolledUp}
	pr.grand = len(rolled) > 0 && len(rolled) == len(s.groups)
	number := make(numberCells, len(s.cols))
	for j, c := range s.cols {
		if c.Group && rolled[c.Name] {
			pr.cells[j] = cell{rolled: true, null: true, json: "null"}
			continue
		}
		v, err := renderValue(r.Values[j], c, s.dates[j])
		if err != nil {
			return preparedRow{}, nil, fmt.Errorf("report: row %d, column %s: %v", n, c.Name, err)
		}
		pr.cells[j] = v.cell
		number[j] = v.number
	}
	return pr, number, nil
}

// checkKeys refuses column names that would make CSV headers or JSON keys
// ambiguous.
func checkKeys(cols []Column) error {
	seen := map[string]bool{rolledUpKey: true}
	for _, c := range cols {
		if seen[c.Name] {
			if c.Name == rolledUpKey {
				return fmt.Errorf("report: a column is named %q, which the csv and json formats use for the rolled-up columns", rolledUpKey)
			}
			return fmt.Errorf("report: two columns are named %q", c.Name)
		}
		seen[c.Name] = true
	}
	return nil
}

// rolledUpKey is the name of the rolled-up list in CSV and JSON.
const rolledUpKey = "rolled_up"

// Count spells a count for people: "1 view", "2 views". noun is the
// singular and takes an "s" in the plural.
func Count(n int, noun string) string {
	if n == 1 {
		return "1 " + noun
	}
	return fmt.Sprintf("%d %ss", n, noun)
}
