package report

import (
	"bufio"
	"encoding/csv"
	"errors"
	"io"

	"github.com/jedib0t/go-pretty/v6/table"

	"github.com/rollwise/rollwise/planner/model"
)

// BufferRows is how many rows the table and Markdown formats hold before
// they write: their column widths and alignment are decided on the first
// BufferRows rows, and later rows are written BufferRows at a time with
// the same widths (a longer text value wraps in the table format). CSV
// and JSON write each row as it comes.
const BufferRows = 1000

// Stream writes a result row by row, so that a result of any size is
// written in bounded memory: NewStream, then Row for each row, then Close.
type Stream struct {
	w      io.Writer
	o      Options
	cols   []Column
	groups map[string]bool
	dates  []bool
	rows   int
	// CSV and JSON.
	bw *bufio.Writer
	cw *csv.Writer
	// The table and Markdown formats: the rows held, whether a chunk was
	// written, and the column settings the first chunk decided.
	held    []preparedRow
	numbers []numberCells
	written bool
	numeric []bool
	cfgs    []table.ColumnConfig
}

// NewStream starts writing a result with columns cols to w in the format
// o.Format. A column of type date shows dates, any other time values are
// timestamps.
func NewStream(w io.Writer, cols []Column, o Options) (*Stream, error) {
	if o.Format == FormatHTML {
		return nil, errors.New("report: the html format is written whole, by Write")
	}
	dates := make([]bool, len(cols))
	for j, c := range cols {
		dates[j] = c.Type == model.TypeDate
	}
	return newStream(w, cols, o, dates)
}

func newStream(w io.Writer, cols []Column, o Options, dates []bool) (*Stream, error) {
	if o.Format == "" {
		o.Format = FormatTable
	}
	if err := ValidFormat(o.Format); err != nil {
		return nil, err
	}
	s := &Stream{w: w, o: o, cols: cols, groups: map[string]bool{}, dates: dates}
	for _, c := range cols {
		if c.Group {
			s.groups[c.Name] = true
		}
	}
	switch o.Format {
	case FormatCSV:
		if err := checkKeys(cols); err != nil {
			return nil, err
		}
		s.cw = csv.NewWriter(w)
		if err := s.cw.Write(csvHeader(cols)); err != nil {
			return nil, err
		}
	case FormatJSON:
		if err := checkKeys(cols); err != nil {
			return nil, err
		}
		s.bw = bufio.NewWriter(w)
	}
	return s, nil
}

// Row writes (or, in the table and Markdown formats, holds) one row.
func (s *Stream) Row(r Row) error {
	s.rows++
	pr, number, err := s.prepareRow(s.rows, r)
	if err != nil {
		return err
	}
	switch s.o.Format {
	case FormatCSV:
		return s.cw.Write(csvRecord(pr))
	case FormatJSON:
		if s.rows == 1 {
			s.bw.WriteString("[\n")
		} else {
			s.bw.WriteString(",\n")
		}
		writeJSONRow(s.bw, s.cols, pr)
		return nil
	}
	s.held = append(s.held, pr)
	s.numbers = append(s.numbers, number)
	if len(s.held) == BufferRows {
		return s.flush()
	}
	return nil
}

// Close writes what is held and ends the output.
func (s *Stream) Close() error {
	switch s.o.Format {
	case FormatCSV:
		s.cw.Flush()
		return s.cw.Error()
	case FormatJSON:
		if s.rows == 0 {
			s.bw.WriteString("[]\n")
		} else {
			s.bw.WriteString("\n]\n")
		}
		return s.bw.Flush()
	}
	if len(s.held) > 0 || !s.written {
		return s.flush()
	}
	return nil
}

// flush writes the rows held as one chunk of the table or Markdown
// format; the first chunk decides alignment and widths, and carries the
// header.
func (s *Stream) flush() error {
	p := &prepared{cols: s.cols, rows: s.held}
	if !s.written {
		s.numeric = numericColumns(len(s.cols), s.held, s.numbers)
		p.numeric = s.numeric
		s.cfgs = chunkConfigs(p, s.o)
	}
	p.numeric = s.numeric
	var err error
	if s.o.Format == FormatMarkdown {
		err = writeMarkdown(s.w, p, !s.written)
	} else {
		err = writeTable(s.w, p, s.o, s.cfgs, !s.written)
	}
	s.written = true
	s.held, s.numbers = s.held[:0], s.numbers[:0]
	return err
}

// numericColumns marks the columns whose non-NULL values are all numbers
// (and that have one).
func numericColumns(n int, rows []preparedRow, numbers []numberCells) []bool {
	numeric := make([]bool, n)
	for j := range numeric {
		seen, all := false, true
		for i, r := range rows {
			if r.cells[j].null {
				continue
			}
			seen = true
			all = all && numbers[i][j]
		}
		numeric[j] = seen && all
	}
	return numeric
}
