package report

import (
	"bufio"
	"strings"
)

// The CSV format: a header and one record per row with the values in
// full precision (no display formatting); NULL and rolled-up cells are
// empty, and a last column, rolled_up, holds the rolled-up column names
// joined by ";".

// csvHeader is the CSV header record.
func csvHeader(cols []Column) []string {
	header := make([]string, 0, len(cols)+1)
	for _, c := range cols {
		header = append(header, c.Name)
	}
	return append(header, rolledUpKey)
}

// csvRecord is a row's CSV record.
func csvRecord(r preparedRow) []string {
	rec := make([]string, 0, len(r.cells)+1)
	for _, c := range r.cells {
		rec = append(rec, c.raw)
	}
	return append(rec, strings.Join(r.rolledUp, ";"))
}

// The JSON format: an array with one object per row, one object per line.
// Keys are the column names in order, then rolled_up: the list of the
// row's rolled-up group columns ([] for a detail row). Rolled-up and NULL
// values are null; numbers are JSON numbers (decimals exactly, floats in
// their shortest form, NaN and infinities as null); dates are
// "YYYY-MM-DD" and timestamps RFC 3339.

// writeJSONRow writes one row's object, without the comma or line break
// that separate it from the next.
func writeJSONRow(bw *bufio.Writer, cols []Column, r preparedRow) {
	bw.WriteString("  {")
	for j, c := range r.cells {
		bw.WriteString(jsonString(cols[j].Name))
		bw.WriteString(": ")
		bw.WriteString(c.json)
		bw.WriteString(", ")
	}
	bw.WriteString(jsonString(rolledUpKey))
	bw.WriteString(": [")
	for k, name := range r.rolledUp {
		if k > 0 {
			bw.WriteString(", ")
		}
		bw.WriteString(jsonString(name))
	}
	bw.WriteString("]}")
}
