package report

import (
	"bufio"
	"encoding/csv"
	"io"
	"strings"
)

// writeCSV writes a header and one record per row with the values in full
// precision (no display formatting); NULL and rolled-up cells are empty,
// and a last column, rolled_up, holds the rolled-up column names joined by
// ";".
func writeCSV(w io.Writer, p *prepared) error {
	if err := checkKeys(p.cols); err != nil {
		return err
	}
	cw := csv.NewWriter(w)
	header := make([]string, 0, len(p.cols)+1)
	for _, c := range p.cols {
		header = append(header, c.Name)
	}
	if err := cw.Write(append(header, rolledUpKey)); err != nil {
		return err
	}
	for _, r := range p.rows {
		rec := make([]string, 0, len(r.cells)+1)
		for _, c := range r.cells {
			rec = append(rec, c.raw)
		}
		if err := cw.Write(append(rec, strings.Join(r.rolledUp, ";"))); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}

// writeJSON writes an array with one object per row, one object per line.
// Keys are the column names in order, then rolled_up: the list of the
// row's rolled-up group columns ([] for a detail row). Rolled-up and NULL
// values are null; numbers are JSON numbers (decimals exactly, floats in
// their shortest form, NaN and infinities as null); dates are
// "YYYY-MM-DD" and timestamps RFC 3339.
func writeJSON(w io.Writer, p *prepared) error {
	if err := checkKeys(p.cols); err != nil {
		return err
	}
	bw := bufio.NewWriter(w)
	if len(p.rows) == 0 {
		bw.WriteString("[]\n")
		return bw.Flush()
	}
	keys := make([]string, len(p.cols))
	for i, c := range p.cols {
		keys[i] = jsonString(c.Name)
	}
	bw.WriteString("[\n")
	for i, r := range p.rows {
		bw.WriteString("  {")
		for j, c := range r.cells {
			bw.WriteString(keys[j])
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
		if i < len(p.rows)-1 {
			bw.WriteByte(',')
		}
		bw.WriteByte('\n')
	}
	bw.WriteString("]\n")
	return bw.Flush()
}
