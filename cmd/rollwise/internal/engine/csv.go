package engine

import (
	"bufio"
	"bytes"
	"cmp"
	"context"
	"database/sql"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"os"
	"slices"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// loadCSV creates r as a table filled from its CSV file: comma-separated,
// double quotes, a header row naming the columns. Only the stored columns
// are kept, in their declared types; empty fields are NULL.
//
// Numbers and timestamps are read as text and cast after a check
// (textRefused) that the text is spelled as one and the cast does not
// round: DuckDB would read 3.5 as the integer 4, 1.2345678 as 1.234568,
// 0x10 as 16, 1e400 as an infinity, and its CSV reader an unreadable
// timestamp as NULL. Timestamps with a time zone offset are converted to
// UTC. The checks are left out when Go has found every such value
// plainly spelled (csvPlain). Any failure is diagnosed by diagnoseCSV,
// which names the file, line, column and value.
func loadCSV(ctx context.Context, conn *sql.Conn, r *relation) error {
	header, err := readHeader(r.file)
	if err != nil {
		return fmt.Errorf("table %s: %v", r.tables[0].Name, err)
	}
	at, err := matchHeader(r, header)
	if err != nil {
		return err
	}
	nulls, err := r.nullTexts()
	if err != nil {
		return err
	}
	readTypes := make([]string, len(header))
	for i := range readTypes {
		readTypes[i] = "VARCHAR"
	}
	plain := csvPlain(r, at, nulls)
	selects := make([]string, len(r.columns))
	for i, c := range r.columns {
		field := fieldName(at[i])
		if readsAsText(c.typ) && plain {
			selects[i] = textParsed(field, c) + " AS " + quoteIdent(c.name)
			continue
		}
		if readsAsText(c.typ) {
			selects[i] = fmt.Sprintf("CASE WHEN %s THEN error('rollwise: value refused') ELSE %s END AS %s",
				textRefused(field, c), textParsed(field, c), quoteIdent(c.name))
			continue
		}
		readTypes[at[i]] = c.duckType
		selects[i] = field + " AS " + quoteIdent(c.name)
	}
	q := fmt.Sprintf("CREATE TABLE %s AS SELECT %s FROM %s", r.sqlName(), strings.Join(selects, ", "), csvReader(r.file, readTypes, nulls))
	if _, err := conn.ExecContext(ctx, q); err != nil {
		if derr := diagnoseCSV(ctx, conn, r, at, len(header), nulls); derr != nil {
			return derr
		}
		return fmt.Errorf("table %s: %s: %s", r.tables[0].Name, r.file, firstParagraph(err.Error()))
	}
	return nil
}

// parseType is the type a text value of column c is parsed as. Timestamps
// are parsed with their time zone offset, if any, and then held in UTC
// (DuckDB's TIMESTAMP would drop the offset).
func parseType(c column) string {
	if c.typ == model.TypeTimestamp {
		return "TIMESTAMPTZ"
	}
	return c.duckType
}

// scaleOf is the number of decimal places a column of type t holds.
func scaleOf(t model.Type) int {
	if t == model.TypeDecimal {
		return DecimalScale
	}
	return 0
}

// fieldName is the name the CSV reader gives the field at position i.
func fieldName(i int) string { return fmt.Sprintf("c%d", i) }

// csvReader is a read_csv call with every setting explicit, so that
// nothing is guessed from the data: types[i] is the type of field i, and
// the empty field and each of nulls read as NULL.
func csvReader(file string, types, nulls []string) string {
	cols := make([]string, len(types))
	for i, t := range types {
		cols[i] = quoteString(fieldName(i)) + ": " + quoteString(t)
	}
	nullstr := []string{quoteString("")}
	for _, n := range nulls {
		nullstr = append(nullstr, quoteString(n))
	}
	return fmt.Sprintf("read_csv(%s, header = true, auto_detect = false, delim = ',', quote = '\"', escape = '\"', nullstr = [%s], columns = {%s})",
		quoteString(file), strings.Join(nullstr, ", "), strings.Join(cols, ", "))
}

// nullTexts are the texts that stand for NULL in r's file, as its tables
// declare them (`with null "NA"`). Tables that read one file must agree,
// or one of them would read a value the other reads as NULL.
func (r *relation) nullTexts() ([]string, error) {
	first := r.tables[0]
	for _, t := range r.tables[1:] {
		a, b := slices.Sorted(slices.Values(first.NullTexts)), slices.Sorted(slices.Values(t.NullTexts))
		if !slices.Equal(a, b) {
			return nil, fmt.Errorf("tables %s and %s read %s but declare different NULL texts (%q and %q); give both the same `with null` list",
				first.Name, t.Name, r.file, first.NullTexts, t.NullTexts)
		}
	}
	return first.NullTexts, nil
}

var utf8BOM = []byte{0xEF, 0xBB, 0xBF}

// csvRecords opens a CSV file for reading its records, after a UTF-8
// byte order mark if it starts with one; the caller closes f.
func csvRecords(path string) (cr *csv.Reader, f *os.File, err error) {
	f, err = os.Open(path)
	if err != nil {
		return nil, nil, err
	}
	br := bufio.NewReader(f)
	if b, err := br.Peek(len(utf8BOM)); err == nil && bytes.Equal(b, utf8BOM) {
		br.Discard(len(utf8BOM)) //nolint:errcheck // the bytes are buffered
	}
	return csv.NewReader(br), f, nil
}

// readHeader reads the header row of a CSV file.
func readHeader(path string) ([]string, error) {
	cr, f, err := csvRecords(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	cr.FieldsPerRecord = -1
	rec, err := cr.Read()
	if errors.Is(err, io.EOF) {
		return nil, fmt.Errorf("%s is empty; it needs a header row naming the columns", path)
	}
	if err != nil {
		return nil, fmt.Errorf("%s: reading the header row: %v", path, err)
	}
	return rec, nil
}

// matchHeader finds each stored column of r in the header: at[i] is the
// field position of r.columns[i]. A name matches exactly or, failing that,
// without regard to case (as DuckDB matches names), if only one does.
func matchHeader(r *relation, header []string) ([]int, error) {
	at := make([]int, len(r.columns))
	var missing []string
	var errs []error
	for i, c := range r.columns {
		var exact, folded []int
		for j, h := range header {
			if h == c.name {
				exact = append(exact, j)
			} else if strings.EqualFold(h, c.name) {
				folded = append(folded, j)
			}
		}
		found := exact
		if len(found) == 0 {
			found = folded
		}
		switch len(found) {
		case 0:
			missing = append(missing, c.name)
		case 1:
			at[i] = found[0]
		default:
			errs = append(errs, fmt.Errorf("table %s: %s: the header has column %s %d times", c.table.Name, r.file, c.name, len(found)))
		}
	}
	if len(missing) > 0 {
		noun := "column"
		if len(missing) > 1 {
			noun = "columns"
		}
		errs = append(errs, fmt.Errorf("table %s: %s: the header row lacks %s %s (it has: %s)",
			r.tableNames(), r.file, noun, strings.Join(missing, ", "), strings.Join(header, ", ")))
	}
	return at, errors.Join(errs...)
}

// maxBadValues caps the values one load error lists; the rest are counted.
const maxBadValues = 20

// diagnoseCSV explains why loading r failed: it reads every stored column
// as text into a temporary table and finds the values (in file order) that
// their declared types cannot hold exactly, so that a dirty file is
// reported whole in one run: up to maxBadValues values, each with its
// line, column and what to write instead, and a count of all of them. It
// returns nil when it finds none, or an error of its own when even text
// cannot be read (a malformed file).
func diagnoseCSV(ctx context.Context, conn *sql.Conn, r *relation, at []int, fields int, nulls []string) error {
	types := make([]string, fields)
	for i := range types {
		types[i] = "VARCHAR"
	}
	selects := make([]string, len(r.columns))
	for i := range r.columns {
		selects[i] = fmt.Sprintf("%s AS k%d", fieldName(at[i]), i)
	}
	const check = "rollwise_csv_check"
	q := fmt.Sprintf("CREATE OR REPLACE TEMP TABLE %s AS SELECT %s FROM %s", check, strings.Join(selects, ", "), csvReader(r.file, types, nulls))
	if _, err := conn.ExecContext(ctx, q); err != nil {
		return fmt.Errorf("table %s: %s: %s", r.tables[0].Name, r.file, firstParagraph(err.Error()))
	}
	defer conn.ExecContext(context.WithoutCancel(ctx), "DROP TABLE IF EXISTS "+check) //nolint:errcheck // best effort

	var bad []badValue
	total := 0
	for i, c := range r.columns {
		if c.typ == model.TypeText {
			continue
		}
		k := fmt.Sprintf("k%d", i)
		where := fmt.Sprintf("%s IS NOT NULL AND (%s)", k, textRefused(k, c))
		found, err := badCSVValues(ctx, conn, c, i, fmt.Sprintf("SELECT rowid, %s, %s, %s FROM %s WHERE %s ORDER BY rowid LIMIT %d",
			k, textUnreadable(k, c), textNumeric(k), check, where, maxBadValues))
		if err == nil && len(found) == maxBadValues {
			var n int
			err = conn.QueryRowContext(ctx, "SELECT count(*) FROM "+check+" WHERE "+where).Scan(&n)
			total += n - len(found)
		}
		if err != nil {
			return fmt.Errorf("table %s: %s: checking column %s: %s", r.tables[0].Name, r.file, c.name, firstParagraph(err.Error()))
		}
		total += len(found)
		bad = append(bad, found...)
	}
	if total == 0 {
		return nil
	}
	slices.SortFunc(bad, func(a, b badValue) int { return cmp.Or(cmp.Compare(a.row, b.row), cmp.Compare(a.at, b.at)) })
	lines := make([]string, 0, maxBadValues)
	for _, b := range bad[:min(len(bad), maxBadValues)] {
		// rowid counts data records from 0; the header is line 1. (A
		// quoted field spanning lines would shift this.)
		lines = append(lines, fmt.Sprintf("%s:%d: column %s.%s (%s): %s", r.file, b.row+2, b.col.table.Name, b.col.name, b.col.typ, b.explain()))
	}
	if total == 1 {
		return errors.New(lines[0])
	}
	head := fmt.Sprintf("%s: %d values cannot be loaded", r.file, total)
	if total > len(lines) {
		head += fmt.Sprintf("; the first %d in file order", len(lines))
	}
	return errors.New(head + ":\n  " + strings.Join(lines, "\n  "))
}

// badCSVValues runs q, which selects rowid, value, unreadable and numeric
// of the refused values of column c (the at-th stored column).
func badCSVValues(ctx context.Context, conn *sql.Conn, c column, at int, q string) ([]badValue, error) {
	rows, err := conn.QueryContext(ctx, q)
	if err != nil {
		return nil, err
	}
	defer rows.Close()
	var out []badValue
	for rows.Next() {
		b := badValue{col: c, at: at, csv: true}
		if err := rows.Scan(&b.row, &b.value, &b.unreadable, &b.numeric); err != nil {
			return nil, err
		}
		out = append(out, b)
	}
	return out, rows.Err()
}

// badValue is a CSV value its column's type cannot hold exactly.
type badValue struct {
	col        column
	at         int // the column's place among the relation's stored columns
	row        int64
	value      string
	unreadable bool // not a value of the type as written (textUnreadable)
	numeric    bool // spelled as a number (textNumeric)
	csv        bool // read from a CSV file, where `with null` applies
}

// explain says what is wrong with the value and what to do.
func (b *badValue) explain() string {
	v := b.value
	if !b.unreadable {
		// The value converts, but not exactly.
		switch b.col.typ {
		case model.TypeInteger:
			return fmt.Sprintf("%q is not a whole number; declare the column decimal or float to keep the fraction", v)
		case model.TypeDecimal:
			return fmt.Sprintf("%q has more than %d decimal places; decimal columns hold exactly %d (%s) and rollwise does not round data (declare the column float if approximate values will do)",
				v, DecimalScale, DecimalScale, DecimalType)
		case model.TypeFloat:
			return fmt.Sprintf("%q is out of range for float (64-bit, at most about 1.8e308); write inf if an infinity is meant", v)
		}
		return fmt.Sprintf("%q would change when stored as %s", v, b.col.typ)
	}
	if b.csv && missingMark(v) {
		return b.explainAs() + fmt.Sprintf("; if %q stands for a missing value, declare it on the table: with null %q", v, v)
	}
	return b.explainAs()
}

// missingMark reports whether v looks like a mark for a missing value
// (NA, n/a, -, ?, null, none): short, with no digit.
func missingMark(v string) bool {
	return len(v) <= 8 && !strings.ContainsAny(v, "0123456789")
}

// explainAs says that an unreadable value is not of the column's type and
// how to write one that is.
func (b *badValue) explainAs() string {
	v := b.value
	switch b.col.typ {
	case model.TypeInteger:
		if b.numeric {
			return fmt.Sprintf("%q is out of range for integer (64 bits); declare the column decimal", v)
		}
		return fmt.Sprintf("cannot read %q as a whole number (write decimal digits, as 1000)", v)
	case model.TypeDecimal:
		if b.numeric {
			return fmt.Sprintf("%q is out of range for decimal (at most %d digits before the point)", v, DecimalWidth-DecimalScale)
		}
		return fmt.Sprintf("cannot read %q as a decimal (write digits with an optional point, as 1234.50)", v)
	case model.TypeFloat:
		return fmt.Sprintf("cannot read %q as a float (write digits with an optional point and exponent, as 1.5e3)", v)
	case model.TypeDate:
		return fmt.Sprintf("cannot read %q as a date (write YYYY-MM-DD)", v)
	case model.TypeTimestamp:
		return fmt.Sprintf("cannot read %q as a timestamp (write YYYY-MM-DD HH:MM:SS, optionally with an offset from +14:00 to -14:00)", v)
	case model.TypeBoolean:
		return fmt.Sprintf("cannot read %q as a boolean (write true or false)", v)
	}
	return fmt.Sprintf("cannot read %q as %s", v, b.col.typ)
}
