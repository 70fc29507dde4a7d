package report

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"strings"
	"testing"
	"time"

	"github.com/rollwise/rollwise/planner/model"
)

// countingWriter records when the first byte arrived, counted in rows
// handed to the stream.
type countingWriter struct {
	bytes.Buffer
	rowsAtFirstWrite int
	rows             *int
}

func (w *countingWriter) Write(p []byte) (int, error) {
	if w.Len() == 0 && len(p) > 0 {
		w.rowsAtFirstWrite = *w.rows
	}
	return w.Buffer.Write(p)
}

func (w *countingWriter) WriteString(s string) (int, error) { return w.Write([]byte(s)) }

// streamRows writes n rows (a name whose width grows past row 1,500 and
// an integer) to a stream in format f.
func streamRows(t *testing.T, f string, n int) (*countingWriter, string) {
	t.Helper()
	rows := 0
	w := &countingWriter{rows: &rows}
	s, err := NewStream(w, []Column{{Name: "name", Group: true, Type: model.TypeText}, {Name: "n", Type: model.TypeInteger}}, Options{Format: f})
	if err != nil {
		t.Fatal(err)
	}
	for i := 1; i <= n; i++ {
		name := fmt.Sprintf("r%d", i)
		if i == 1500 {
			name = "a much longer label than the first thousand had"
		}
		rows = i
		if err := s.Row(Row{Values: []any{name, int64(i)}}); err != nil {
			t.Fatal(err)
		}
	}
	if err := s.Close(); err != nil {
		t.Fatal(err)
	}
	return w, w.String()
}

// CSV and JSON write as rows come (the first bytes leave after a few
// rows, not at the end), and read back as every row in order.
func TestMachineFormatsStream(t *testing.T) {
	w, out := streamRows(t, FormatCSV, 5000)
	if w.rowsAtFirstWrite == 0 || w.rowsAtFirstWrite > 1000 {
		t.Errorf("csv: the first bytes were written after %d rows", w.rowsAtFirstWrite)
	}
	recs, err := csv.NewReader(strings.NewReader(out)).ReadAll()
	if err != nil || len(recs) != 5001 || recs[5000][1] != "5000" || recs[1500][0] != "a much longer label than the first thousand had" {
		t.Errorf("csv: %d records, %v", len(recs), err)
	}
	w, out = streamRows(t, FormatJSON, 5000)
	if w.rowsAtFirstWrite == 0 || w.rowsAtFirstWrite > 1000 {
		t.Errorf("json: the first bytes were written after %d rows", w.rowsAtFirstWrite)
	}
	var got []map[string]any
	if err := json.Unmarshal([]byte(out), &got); err != nil || len(got) != 5000 || got[4999]["n"] != 5000.0 {
		t.Errorf("json: %d rows, %v", len(got), err)
	}
}

// The table format holds BufferRows rows to size its columns, writes them,
// and goes on with the same widths: every line has its rule at the same
// place, the header comes once, and the longer name of row 1,500 wraps
// instead of pushing its line out of line.
func TestTableFormatStreamsInChunks(t *testing.T) {
	w, out := streamRows(t, FormatTable, 2500)
	if w.rowsAtFirstWrite != BufferRows {
		t.Errorf("the first bytes were written after %d rows, want %d", w.rowsAtFirstWrite, BufferRows)
	}
	lines := strings.Split(strings.TrimSuffix(out, "\n"), "\n")
	rule := strings.Index(lines[0], "│")
	for i, l := range lines {
		if j := strings.Index(l, "│"); j != rule && !strings.HasPrefix(l, "─") {
			t.Fatalf("line %d %q has its rule at %d, the header at %d", i+1, l, j, rule)
		}
	}
	if strings.Count(out, " name ") != 1 || !strings.Contains(out, "r2500 │") || !strings.Contains(out, "│ 2500") {
		t.Errorf("header or last row wrong:\n%s", out[len(out)-200:])
	}
	if len(lines) <= 2502 {
		t.Errorf("%d lines: the long name did not wrap", len(lines))
	}
	_, md := streamRows(t, FormatMarkdown, 1200)
	if n := strings.Count(md, "| --- |") + strings.Count(md, "|---"); n > 1 || !strings.Contains(md, "| r1200 ") {
		t.Errorf("markdown: %d header rules, or no last row:\n%s", n, md[len(md)-200:])
	}
}

// A column's declared type decides between a date and a timestamp, so a
// streamed timestamp column at midnight is still a timestamp.
func TestStreamShowsDeclaredTypes(t *testing.T) {
	midnight := time.Date(2026, 1, 1, 0, 0, 0, 0, time.UTC)
	var b bytes.Buffer
	s, _ := NewStream(&b, []Column{{Name: "d", Type: model.TypeDate}, {Name: "ts", Type: model.TypeTimestamp}}, Options{Format: FormatCSV})
	s.Row(Row{Values: []any{midnight, midnight}}) //nolint:errcheck // checked below
	s.Close()                                     //nolint:errcheck // checked below
	if got := b.String(); got != "d,ts,rolled_up\n2026-01-01,2026-01-01T00:00:00Z,\n" {
		t.Errorf("got %q", got)
	}
}
