package engine

import (
	"errors"
	"io"
	"os"
	"slices"
	"time"

	"github.com/rollwise/rollwise/planner/model"
)

// plainCheckMax bounds the size of a CSV file that csvPlain reads; a
// larger file is checked by the SQL conditions alone.
const plainCheckMax = 4 << 20

// csvPlain reports whether every value of r's file in a column that
// loadCSV reads as text (readsAsText) is NULL or spelled plainly
// (plainValue), so that the SQL checks (textRefused) could refuse none of
// them and loadCSV can leave them out: on small files, building those
// conditions costs DuckDB four times what reading the file does. Any
// doubt (a large file, a record Go's CSV reader refuses, a field count
// unlike the header's) answers false, and the SQL checks run. at and
// nulls are as in loadCSV.
//
// Go's CSV reader and DuckDB's read_csv, as csvReader sets it up, split
// a file alike (RFC 4180: comma, double quotes doubled inside quotes);
// both read a quoted empty field or NULL text as NULL (DuckDB's
// allow_quoted_nulls). Were they to differ on a field, the value DuckDB
// casts would be one Go did not see; a cast that fails still sends the
// load to diagnoseCSV, as without this check.
func csvPlain(r *relation, at []int, nulls []string) bool {
	var cols []int
	for i, c := range r.columns {
		if readsAsText(c.typ) {
			cols = append(cols, i)
		}
	}
	if len(cols) == 0 {
		return true
	}
	if fi, err := os.Stat(r.file); err != nil || fi.Size() > plainCheckMax {
		return false
	}
	cr, f, err := csvRecords(r.file)
	if err != nil {
		return false
	}
	defer f.Close()
	cr.ReuseRecord = true
	if _, err := cr.Read(); err != nil { // the header row
		return false
	}
	for {
		rec, err := cr.Read()
		if err != nil {
			return errors.Is(err, io.EOF)
		}
		for _, i := range cols {
			v := rec[at[i]]
			if v != "" && !slices.Contains(nulls, v) && !plainValue(v, r.columns[i].typ) {
				return false
			}
		}
	}
}

// plainValue reports whether v is a value of type t in the plainest
// spelling, which textRefused never refuses and the cast reads exactly:
// an integer of at most 18 digits (below 2^63); a decimal of at most
// DecimalWidth-DecimalScale digits before the point and DecimalScale
// after; a float of at most 15 digits on each side of the point (far
// from overflow); a timestamp YYYY-MM-DD or YYYY-MM-DD HH:MM:SS of a
// real day and time, years 0001 to 9999, without offset. A minus sign
// may lead a number. TestPlainValuesPassTheSQLChecks runs the SQL checks
// on such values.
func plainValue(v string, t model.Type) bool {
	switch t {
	case model.TypeInteger:
		return plainNumber(v, 18, 0)
	case model.TypeDecimal:
		return plainNumber(v, DecimalWidth-DecimalScale, DecimalScale)
	case model.TypeFloat:
		return plainNumber(v, 15, 15)
	case model.TypeTimestamp:
		layout := time.DateOnly
		if len(v) != len(layout) {
			layout = time.DateTime
		}
		if len(v) != len(layout) {
			return false
		}
		for i := range len(v) {
			if isDigit(layout[i]) != isDigit(v[i]) || !isDigit(v[i]) && v[i] != layout[i] {
				return false
			}
		}
		ts, err := time.Parse(layout, v)
		return err == nil && ts.Year() >= 1
	}
	return false
}

// plainNumber reports whether v is an optional minus sign, 1 to whole
// digits and, when places > 0, optionally a point and 1 to places
// digits.
func plainNumber(v string, whole, places int) bool {
	if len(v) > 0 && v[0] == '-' {
		v = v[1:]
	}
	n := digits(v)
	if n == 0 || n > whole {
		return false
	}
	v = v[n:]
	if v == "" {
		return true
	}
	if v[0] != '.' || places == 0 {
		return false
	}
	m := digits(v[1:])
	return m > 0 && m <= places && m == len(v)-1
}

// digits counts the ASCII digits v starts with.
func digits(v string) int {
	n := 0
	for n < len(v) && isDigit(v[n]) {
		n++
	}
	return n
}

func isDigit(b byte) bool { return '0' <= b && b <= '9' }
