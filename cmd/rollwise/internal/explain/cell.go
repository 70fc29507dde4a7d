package explain

import (
	"fmt"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/shopspring/decimal"

	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/reference"
)

// Cell is the cell to explain: one value per group column of the query,
// or the column rolled up.
type Cell struct {
	Values []reference.Value
	Rolled []bool
	// Default says no cell was named: every group column is rolled up.
	Default bool
}

// Pair is one T.C=v of --cell, as written.
type Pair struct{ Ref, Value string }

// UsageError is a --cell that is not spelled as it should be.
type UsageError struct{ Msg string }

func (e *UsageError) Error() string { return "--cell: " + e.Msg }

// cellExample is what --cell looks like.
const cellExample = `--cell "stores.region='North',sales.item='rose'"`

// SplitCell reads --cell text: T.C=v pairs separated by commas, values
// written as the language writes literals ('North', 12.5, 2026-01-31,
// null) or bare words for text. Commas and equals signs inside quotes or
// backquotes belong to the value or name.
func SplitCell(text string) ([]Pair, error) {
	var pieces []string
	start, quote := 0, rune(0)
	for i, r := range text {
		switch {
		case quote != 0:
			if r == quote {
				quote = 0
			}
		case r == '\'' || r == '`':
			quote = r
		case r == ',':
			pieces = append(pieces, text[start:i])
			start = i + 1
		}
	}
	if quote != 0 {
		return nil, &UsageError{Msg: fmt.Sprintf("%q has an unclosed %c; write %s", text, quote, cellExample)}
	}
	pieces = append(pieces, text[start:])
	var out []Pair
	for _, p := range pieces {
		eq := topLevelEquals(p)
		if eq < 0 || strings.TrimSpace(p[:eq]) == "" || strings.TrimSpace(p[eq+1:]) == "" {
			return nil, &UsageError{Msg: fmt.Sprintf("%q is not TABLE.COLUMN=VALUE; write %s (a group column of -b, its value as in the report, null for a NULL group)", strings.TrimSpace(p), cellExample)}
		}
		out = append(out, Pair{Ref: strings.TrimSpace(p[:eq]), Value: strings.TrimSpace(p[eq+1:])})
	}
	return out, nil
}

// topLevelEquals is the position of the first = outside backquotes, or -1.
func topLevelEquals(s string) int {
	inName := false
	for i, r := range s {
		switch {
		case r == '`':
			inName = !inName
		case r == '=' && !inName:
			return i
		}
	}
	return -1
}

// Resolve matches --cell pairs to q's group columns and reads each value
// in its column's type. A group column that no pair names is rolled up.
func Resolve(q *model.Query, pairs []Pair) (Cell, error) {
	c := Cell{Values: make([]reference.Value, len(q.Groups)), Rolled: make([]bool, len(q.Groups)), Default: len(pairs) == 0}
	for i := range c.Rolled {
		c.Rolled[i] = true
	}
	for _, p := range pairs {
		at := groupIndex(q, p.Ref)
		if at < 0 {
			return c, &UsageError{Msg: fmt.Sprintf("%s is not a group column of the query; group by it with -b %s, or name one of: %s",
				p.Ref, p.Ref, strings.Join(q.GroupNames, ", "))}
		}
		if !c.Rolled[at] {
			return c, &UsageError{Msg: fmt.Sprintf("%s is given twice; give each group column once", p.Ref)}
		}
		v, err := readValue(p.Value, q.Groups[at].Type)
		if err != nil {
			return c, &UsageError{Msg: fmt.Sprintf("%s is %s: %v", q.GroupNames[at], q.Groups[at].Type, err)}
		}
		c.Values[at], c.Rolled[at] = v, false
	}
	return c, nil
}

// groupIndex is the group of q that ref names (as written in -b, or as
// the language writes the column), or -1.
func groupIndex(q *model.Query, ref string) int {
	squeeze := func(s string) string { return strings.Join(strings.Fields(s), "") }
	for i, g := range q.Groups {
		if squeeze(ref) == squeeze(q.GroupNames[i]) || squeeze(ref) == model.Text(&model.ColRef{Col: g}) {
			return i
		}
	}
	return -1
}

// readValue reads a --cell value as a value of type t.
func readValue(s string, t model.Type) (reference.Value, error) {
	if strings.EqualFold(s, "null") {
		return nil, nil
	}
	quoted := len(s) >= 2 && s[0] == '\'' && s[len(s)-1] == '\''
	if quoted {
		s = strings.ReplaceAll(s[1:len(s)-1], "''", "'")
	}
	switch t {
	case model.TypeText:
		return s, nil
	case model.TypeInteger, model.TypeDecimal:
		d, err := decimal.NewFromString(s)
		if err != nil {
			return nil, fmt.Errorf("%q is not a number; write digits, as 12 or 12.5", s)
		}
		if t == model.TypeInteger && !d.Equal(d.Truncate(0)) {
			return nil, fmt.Errorf("%q is not a whole number", s)
		}
		return d, nil
	case model.TypeFloat:
		f, err := strconv.ParseFloat(s, 64)
		if err != nil {
			return nil, fmt.Errorf("%q is not a number; write digits, as 12.5", s)
		}
		return f, nil
	case model.TypeBoolean:
		switch strings.ToLower(s) {
		case "true":
			return true, nil
		case "false":
			return false, nil
		}
		return nil, fmt.Errorf("%q is not a boolean; write true or false", s)
	case model.TypeDate, model.TypeTimestamp:
		s = strings.TrimSpace(strings.TrimPrefix(strings.TrimPrefix(s, "timestamp "), "date "))
		s = strings.Trim(s, "'")
		for _, layout := range []string{time.DateOnly, "2006-01-02 15:04:05.999999999", "2006-01-02T15:04:05.999999999", "2006-01-02 15:04", time.RFC3339Nano} {
			if tm, err := time.Parse(layout, s); err == nil {
				return tm.UTC(), nil
			}
		}
		return nil, fmt.Errorf("%q is not a date; write YYYY-MM-DD (or YYYY-MM-DD HH:MM:SS for a timestamp)", s)
	}
	return nil, fmt.Errorf("cannot name a value of this type")
}

// MaxListed bounds the cells a missing cell's error lists.
const MaxListed = 5

// NotFoundError is a cell that the report does not have.
type NotFoundError struct{ Msg string }

func (e *NotFoundError) Error() string { return e.Msg }

// Check returns a *NotFoundError when the report of q has no row for the
// cell: no detail row has its group values (a total cell exists when one
// of the rows it covers does; the grand total always does).
func Check(d *reference.Data, q *model.Query, c Cell) error {
	named := false
	for _, r := range c.Rolled {
		named = named || !r
	}
	if !named {
		return nil
	}
	combos, err := d.Probe().Combinations(q)
	if err != nil {
		return err
	}
	words := func(vals []reference.Value) string {
		var parts []string
		for i, name := range q.GroupNames {
			if c.Rolled[i] {
				continue
			}
			if vals[i] == nil {
				parts = append(parts, name+"=null")
			} else {
				parts = append(parts, name+"="+reference.Literal(vals[i]))
			}
		}
		return strings.Join(parts, ",")
	}
	want := words(c.Values)
	exist := map[string]bool{}
	for _, combo := range combos {
		exist[words(combo)] = true
	}
	if exist[want] {
		return nil
	}
	var listed []string
	for w := range exist {
		listed = append(listed, w)
	}
	sort.Strings(listed)
	more := ""
	if len(listed) > MaxListed {
		more = fmt.Sprintf(" (and %d more)", len(listed)-MaxListed)
		listed = listed[:MaxListed]
	}
	var cols []string
	for i, name := range q.GroupNames {
		if !c.Rolled[i] {
			cols = append(cols, name)
		}
	}
	msg := fmt.Sprintf("the report of %s has no cell %s; its group columns are %s",
		q.Measures[0].Name, want, strings.Join(q.GroupNames, ", "))
	if len(listed) == 0 {
		return &NotFoundError{Msg: msg + ", and it has no detail rows"}
	}
	return &NotFoundError{Msg: fmt.Sprintf("%s; cells that exist, by %s: --cell \"%s\"%s",
		msg, strings.Join(cols, ", "), strings.Join(listed, "\", \""), more)}
}
