package reference

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"

	"github.com/shopspring/decimal"

	"github.com/rollwise/rollwise/planner/model"
)

// Data is a model with the rows of every table held in memory.
type Data struct {
	model  *model.Model
	tables map[*model.Table]*tableData
}

// tableData holds one table's stored values and, per row, the row that
// each link path reaches.
type tableData struct {
	t *model.Table
	// stored maps a stored column to its position in a row.
	stored map[*model.Column]int
	rows   [][]Value
	// reach[i] maps every table reachable from t along links to the row
	// that row i reaches there, or -1 where a link finds no match.
	reach []map[*model.Table]int
	// derived caches derived column values per row (set[i] says whether
	// vals[i] is computed).
	derived map[*model.Column]*derivedCache
}

type derivedCache struct {
	vals []Value
	set  []bool
	busy []bool
}

// Load reads every table of m from its CSV file (with dataDir set,
// dataDir/NAME.csv instead), each stored column in its declared type.
// Empty fields are NULL, and so are the texts the table declares with
// `with null`.
func Load(m *model.Model, dataDir string) (*Data, error) {
	if m == nil {
		return nil, errors.New("reference: no model")
	}
	d := &Data{model: m, tables: map[*model.Table]*tableData{}}
	var errs []error
	for _, t := range m.Tables {
		file := t.File
		if dataDir != "" {
			file = filepath.Join(dataDir, t.Name+".csv")
		}
		td, err := readTable(t, file)
		if err != nil {
			errs = append(errs, err)
			continue
		}
		d.tables[t] = td
	}
	if len(errs) > 0 {
		return nil, errors.Join(errs...)
	}
	for _, t := range m.Tables {
		if err := d.link(d.tables[t]); err != nil {
			errs = append(errs, err)
		}
	}
	return d, errors.Join(errs...)
}

// readTable reads one table's CSV file: a header row naming the columns
// (matched exactly, else without regard to case), then one record a row.
func readTable(t *model.Table, file string) (*tableData, error) {
	if file == "" {
		return nil, fmt.Errorf("table %s has no data file", t.Name)
	}
	f, err := os.Open(file)
	if err != nil {
		return nil, fmt.Errorf("table %s: %v", t.Name, err)
	}
	defer f.Close()
	r := csv.NewReader(f)
	r.FieldsPerRecord = -1
	header, err := r.Read()
	if err != nil {
		return nil, fmt.Errorf("table %s: %s: reading the header: %v", t.Name, file, err)
	}
	if len(header) > 0 {
		header[0] = strings.TrimPrefix(header[0], "\ufeff")
	}
	td := &tableData{t: t, stored: map[*model.Column]int{}, derived: map[*model.Column]*derivedCache{}}
	var cols []*model.Column
	var at []int
	for _, c := range t.Columns {
		if !c.Stored() {
			continue
		}
		pos := -1
		for i, h := range header {
			if strings.TrimSpace(h) == c.Name {
				pos = i
			}
		}
		if pos < 0 {
			for i, h := range header {
				if strings.EqualFold(strings.TrimSpace(h), c.Name) {
					pos = i
				}
			}
		}
		if pos < 0 {
			return nil, fmt.Errorf("table %s: %s: the header lacks column %s", t.Name, file, c.Name)
		}
		td.stored[c] = len(cols)
		cols = append(cols, c)
		at = append(at, pos)
	}
	for line := 2; ; line++ {
		rec, err := r.Read()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return nil, fmt.Errorf("table %s: %s: %v", t.Name, file, err)
		}
		row := make([]Value, len(cols))
		for i, c := range cols {
			if at[i] >= len(rec) {
				return nil, fmt.Errorf("%s:%d: the record has no field for %s", file, line, c)
			}
			field := rec[at[i]]
			if slices.Contains(t.NullTexts, field) {
				field = ""
			}
			v, err := parseField(field, c.Type)
			if err != nil {
				return nil, fmt.Errorf("%s:%d: column %s: %v", file, line, c, err)
			}
			row[i] = v
		}
		td.rows = append(td.rows, row)
	}
	return td, nil
}

// parseField reads one CSV field as a value of type t; "" is NULL.
func parseField(s string, t model.Type) (Value, error) {
	if s == "" {
		return nil, nil
	}
	switch t {
	case model.TypeInteger:
		d, err := decimal.NewFromString(strings.TrimSpace(s))
		if err != nil || !d.Equal(d.Truncate(0)) {
			return nil, fmt.Errorf("%q is not a whole number", s)
		}
		return d.Truncate(0), nil
	case model.TypeDecimal:
		d, err := decimal.NewFromString(strings.TrimSpace(s))
		if err != nil {
			return nil, fmt.Errorf("%q is not a decimal number", s)
		}
		return d, nil
	case model.TypeFloat:
		f, err := strconv.ParseFloat(strings.TrimSpace(s), 64)
		if err != nil {
			return nil, fmt.Errorf("%q is not a number", s)
		}
		return f, nil
	case model.TypeText:
		return s, nil
	case model.TypeDate:
		tm, err := parseTime(strings.TrimSpace(s))
		if err != nil {
			return nil, err
		}
		return truncate("day", tm), nil
	case model.TypeTimestamp:
		return parseTime(strings.TrimSpace(s))
	case model.TypeBoolean:
		return parseBool(s)
	}
	return nil, fmt.Errorf("type %s cannot be stored", t)
}

// link works out, for every row of td, the row each table reachable along
// links holds for it. Links always match on stored columns of the table
// they leave; a NULL in any link column matches nothing.
func (d *Data) link(td *tableData) error {
	index := map[*model.Link]map[string]int{}
	for i := range td.rows {
		reach := map[*model.Table]int{td.t: i}
		type step struct {
			t   *model.Table
			row int
		}
		queue := []step{{td.t, i}}
		for len(queue) > 0 {
			at := queue[0]
			queue = queue[1:]
			for _, l := range at.t.Links {
				if _, seen := reach[l.To]; seen {
					continue
				}
				to := d.tables[l.To]
				if to == nil {
					return fmt.Errorf("table %s is not loaded", l.To.Name)
				}
				match := -1
				if at.row >= 0 {
					from := d.tables[at.t]
					vals := make([]Value, len(l.FromCols))
					null := false
					for k, c := range l.FromCols {
						pos, ok := from.stored[c]
						if !ok {
							return fmt.Errorf("link %s: %s is not a stored column", l, c)
						}
						vals[k] = from.rows[at.row][pos]
						null = null || vals[k] == nil
					}
					if !null {
						idx, err := keyIndex(index, l, to)
						if err != nil {
							return err
						}
						if r, ok := idx[tupleKey(vals)]; ok {
							match = r
						}
					}
				}
				reach[l.To] = match
				queue = append(queue, step{l.To, match})
			}
		}
		td.reach = append(td.reach, reach)
	}
	return nil
}

// keyIndex maps the key values of the link's target rows to row numbers.
// Keys are unique by declaration; where the data repeats one, the first
// row wins.
func keyIndex(cache map[*model.Link]map[string]int, l *model.Link, to *tableData) (map[string]int, error) {
	if idx, ok := cache[l]; ok {
		return idx, nil
	}
	idx := map[string]int{}
	for r, row := range to.rows {
		vals := make([]Value, len(l.ToCols))
		null := false
		for k, c := range l.ToCols {
			pos, ok := to.stored[c]
			if !ok {
				return nil, fmt.Errorf("link %s: %s is not a stored column", l, c)
			}
			vals[k] = row[pos]
			null = null || vals[k] == nil
		}
		if null {
			continue
		}
		k := tupleKey(vals)
		if _, dup := idx[k]; !dup {
			idx[k] = r
		}
	}
	cache[l] = idx
	return idx, nil
}

// errUnreachable says that a cell constraint or an expression reads a
// column that the iteration table cannot reach along links.
type errUnreachable struct {
	col  *model.Column
	from *model.Table
}

func (e *errUnreachable) Error() string {
	return fmt.Sprintf("%s cannot be reached from %s along links", e.col, e.from.Name)
}

// column reads column c for row i of td: stored values directly, derived
// ones computed from the row of c's table (NULL when the link path to
// that table finds no row).
func (d *Data) column(td *tableData, i int, c *model.Column) (Value, error) {
	r, ok := td.reach[i][c.Table]
	if !ok {
		return nil, &errUnreachable{col: c, from: td.t}
	}
	if r < 0 {
		return nil, nil
	}
	owner := d.tables[c.Table]
	if pos, ok := owner.stored[c]; ok {
		return owner.rows[r][pos], nil
	}
	if c.Derived == nil {
		return nil, fmt.Errorf("column %s is neither stored nor derived", c)
	}
	dc := owner.derived[c]
	if dc == nil {
		n := len(owner.rows)
		dc = &derivedCache{vals: make([]Value, n), set: make([]bool, n), busy: make([]bool, n)}
		owner.derived[c] = dc
	}
	if dc.set[r] {
		return dc.vals[r], nil
	}
	if dc.busy[r] {
		return nil, fmt.Errorf("derived column %s depends on itself", c)
	}
	dc.busy[r] = true
	v, err := d.row(owner, r, c.Derived)
	dc.busy[r] = false
	if err != nil {
		return nil, err
	}
	dc.vals[r], dc.set[r] = v, true
	return v, nil
}

// row evaluates a row expression for row i of td.
func (d *Data) row(td *tableData, i int, e model.Expr) (Value, error) {
	if c, ok := e.(*model.ColRef); ok {
		return d.column(td, i, c.Col)
	}
	v, ok, err := scalar(e, func(x model.Expr) (Value, error) { return d.row(td, i, x) })
	if !ok && err == nil {
		return nil, fmt.Errorf("%s cannot appear in a row expression", model.Text(e))
	}
	return v, err
}

// Unmatched counts the rows of l's table whose link l finds no row (a NULL
// link column included): none where a link declared required keeps its
// promise.
func (d *Data) Unmatched(l *model.Link) int {
	n := 0
	if td := d.tables[l.From]; td != nil {
		for _, reach := range td.reach {
			if reach[l.To] < 0 {
				n++
			}
		}
	}
	return n
}
