package verify

import (
	"context"
	"fmt"
	"sort"
	"strings"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/engine"
	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/grammar"
)

// resultRow is one row of either side: group values, the rolled-up groups
// as a GROUPING() mask, and one value per measure.
type resultRow struct {
	keys []any
	mask uint64
	// known is false for a handwritten row whose NULL keys could be
	// totals or genuine NULL groups; mask is then 0.
	known bool
	vals  []Value
}

// cellKey identifies a cell: the mask and the values of the groups that
// are not rolled up.
func cellKey(mask uint64, keys []any) string {
	n := len(keys)
	parts := make([]string, 0, n+1)
	parts = append(parts, fmt.Sprint(mask))
	for i, k := range keys {
		if mask&(1<<(n-1-i)) != 0 {
			parts = append(parts, "*")
			continue
		}
		parts = append(parts, keyText(k))
	}
	return strings.Join(parts, "\x1f")
}

// readCells reads a result shaped as rollwise renders it: the n group
// columns, one column per measure, and the grouping column.
func readCells(res *engine.Result, n int, names []string) ([]resultRow, error) {
	want := n + len(names) + 1
	if len(res.Columns) != want || res.Columns[want-1] != dialects.GroupingColumn {
		return nil, fmt.Errorf("the compiled result has columns %v, expected %d groups, %s and %s",
			res.Columns, n, strings.Join(names, ", "), dialects.GroupingColumn)
	}
	var rows []resultRow
	for _, raw := range res.Rows {
		r := resultRow{keys: raw[:n], known: true}
		for j := range names {
			val, ok := valueOf(raw[n+j])
			if !ok {
				return nil, fmt.Errorf("measure %s holds %T, not a number", names[j], raw[n+j])
			}
			r.vals = append(r.vals, val)
		}
		switch g := raw[want-1].(type) {
		case int64:
			r.mask = uint64(g)
		case nil:
		default:
			return nil, fmt.Errorf("the grouping column holds %T", g)
		}
		rows = append(rows, r)
	}
	return rows, nil
}

// handwritten is the handwritten result, read into rows.
type handwritten struct {
	rows []resultRow
	// groupCols are the SQL's columns for the --by references.
	groupCols []string
	// masks is set when a grouping column tells the totals apart.
	masks []uint64
	notes []string
}

func (h *handwritten) anyNullKey() bool {
	for _, r := range h.rows {
		for _, k := range r.keys {
			if k == nil {
				return true
			}
		}
	}
	return false
}

// runHandwritten runs the handwritten SQL and reads its rows.
func (v *verifier) runHandwritten(ctx context.Context) (*handwritten, error) {
	// The one statement CheckQuery let through, cut after its end only,
	// so that the engine's line numbers are the file's.
	res, err := v.run.Query(ctx, v.stmt, nil)
	if err != nil {
		return nil, &SQLError{Name: v.in.SQLName, Err: err}
	}
	lay, err := mapColumns(res.Columns, v.in.Query.GroupNames, v.names, v.in.Spec.Map, v.in.Spec.GroupingColumn)
	if err != nil {
		return nil, err
	}
	h := &handwritten{}
	for _, i := range lay.groups {
		h.groupCols = append(h.groupCols, res.Columns[i])
	}
	if len(lay.unused) > 0 {
		h.notes = append(h.notes, fmt.Sprintf("not compared: the SQL's column(s) %s", strings.Join(lay.unused, ", ")))
	}
	single := len(v.in.Plan.Sets) == 1 && v.in.Plan.Sets[0] == 0
	for rn, raw := range res.Rows {
		r := resultRow{known: single || lay.gcol >= 0}
		for _, i := range lay.groups {
			r.keys = append(r.keys, raw[i])
		}
		for j, i := range lay.measures {
			val, ok := valueOf(raw[i])
			if !ok {
				return nil, inputErr("the SQL's column %s, compared with measure %s, holds %s (row %d), not a number; compare a numeric column (--map %s=COLUMN) or cast it in the SQL",
					res.Columns[i], v.names[j], describe(raw[i]), rn+1, v.names[j])
			}
			r.vals = append(r.vals, val)
		}
		if lay.gcol >= 0 {
			mask, err := readMask(raw[lay.gcol], v.n)
			if err != nil {
				return nil, inputErr("--grouping-column %s, row %d: %v", res.Columns[lay.gcol], rn+1, err)
			}
			r.mask = mask
			for i := range r.keys {
				if mask&(1<<(v.n-1-i)) != 0 && r.keys[i] != nil {
					h.notes = appendOnce(h.notes, fmt.Sprintf("the SQL's rows rolled up on %s still show a value in %s; it was ignored",
						v.in.Query.GroupNames[i], res.Columns[lay.groups[i]]))
				}
			}
			h.masks = append(h.masks, mask)
		}
		h.rows = append(h.rows, r)
	}
	return h, nil
}

func appendOnce(list []string, s string) []string {
	for _, x := range list {
		if x == s {
			return list
		}
	}
	return append(list, s)
}

// describe shows a non-numeric value and its kind.
func describe(v any) string {
	k := keyKind(v)
	if k == "" {
		k = "a value"
	}
	return fmt.Sprintf("%s (%s)", strings.TrimSuffix(k, "s"), jsonKey(v))
}

// readMask reads a GROUPING() value over n groups.
func readMask(v any, n int) (uint64, error) {
	var m int64
	switch x := v.(type) {
	case int64:
		m = x
	default:
		val, ok := valueOf(v)
		if !ok || val.Null || !val.Exact || !val.Dec.IsInteger() {
			return 0, fmt.Errorf("%s is not a GROUPING() value", describe(v))
		}
		m = val.Dec.IntPart()
	}
	if m < 0 || n < 63 && m >= int64(1)<<n {
		return 0, fmt.Errorf("%d is not a GROUPING() value over the %d --by column(s)", m, n)
	}
	return uint64(m), nil
}

// layout says which handwritten column holds what.
type layout struct {
	groups   []int
	measures []int
	gcol     int
	unused   []string
}

// mapColumns finds the handwritten columns of the --by references (by
// their full table.column reference or their column name), of the
// measures (by name, or as --map says) and of the grouping column.
func mapColumns(cols, groups, measures []string, mp map[string]string, gname string) (*layout, error) {
	lay := &layout{gcol: -1}
	used := map[int]string{}
	claim := func(i int, what string) error {
		if prev, ok := used[i]; ok {
			return inputErr("the SQL's column %s would be both %s and %s; rename one with AS", cols[i], prev, what)
		}
		used[i] = what
		return nil
	}
	missing := func(what, name string) error {
		msg := fmt.Sprintf("the SQL has no column %s for %s; its columns are %s", name, what, strings.Join(cols, ", "))
		if near := grammar.Closest(name, cols); near != "" && near != name {
			msg += fmt.Sprintf("; did you mean %s?", near)
		}
		return inputErr("%s", msg)
	}
	bareCount := map[string]int{}
	for _, g := range groups {
		bareCount[strings.ToLower(bareName(g))]++
	}
	for _, g := range groups {
		if c, ok := mp[g]; ok {
			i, err := findColumn(cols, c)
			if err != nil {
				return nil, err
			}
			if i < 0 {
				return nil, missing(fmt.Sprintf("--by %s (--map %s=%s)", g, g, c), c)
			}
			if err := claim(i, "--by "+g); err != nil {
				return nil, err
			}
			lay.groups = append(lay.groups, i)
			continue
		}
		i, err := findColumn(cols, g)
		if err != nil {
			return nil, err
		}
		if i < 0 {
			b := bareName(g)
			if bareCount[strings.ToLower(b)] > 1 {
				return nil, inputErr("several --by columns are named %s; name the SQL's columns after the full reference, as in AS \"%s\"", b, g)
			}
			if i, err = findColumn(cols, b); err != nil {
				return nil, err
			}
		}
		if i < 0 {
			return nil, missing("--by "+g, fmt.Sprintf("%s (or %q)", bareName(g), g))
		}
		if err := claim(i, "--by "+g); err != nil {
			return nil, err
		}
		lay.groups = append(lay.groups, i)
	}
	for _, m := range measures {
		name, how := m, "measure "+m
		if c, ok := mp[m]; ok {
			name, how = c, fmt.Sprintf("measure %s (--map %s=%s)", m, m, c)
		}
		i, err := findColumn(cols, name)
		if err != nil {
			return nil, err
		}
		if i < 0 {
			if _, ok := mp[m]; !ok {
				how += fmt.Sprintf(" (--map %s=COLUMN names another column)", m)
			}
			return nil, missing(how, name)
		}
		if err := claim(i, how); err != nil {
			return nil, err
		}
		lay.measures = append(lay.measures, i)
	}
	if gname != "" {
		i, err := findColumn(cols, gname)
		if err != nil {
			return nil, err
		}
		if i < 0 {
			return nil, missing("--grouping-column", gname)
		}
		if err := claim(i, "--grouping-column"); err != nil {
			return nil, err
		}
		lay.gcol = i
	}
	for i, c := range cols {
		if _, ok := used[i]; !ok {
			lay.unused = append(lay.unused, c)
		}
	}
	return lay, nil
}

// bareName is the column name of a table.column reference.
func bareName(ref string) string {
	if i := strings.LastIndex(ref, "."); i >= 0 {
		return strings.Trim(strings.TrimSpace(ref[i+1:]), "`")
	}
	return ref
}

// findColumn finds a column by exact name, then without regard to case
// (as SQL compares unquoted names); -1 when there is none.
func findColumn(cols []string, name string) (int, error) {
	for i, c := range cols {
		if c == name {
			return i, nil
		}
	}
	found := -1
	for i, c := range cols {
		if strings.EqualFold(c, name) {
			if found >= 0 {
				return 0, inputErr("the SQL has two columns named %s and %s; rename one with AS", cols[found], c)
			}
			found = i
		}
	}
	return found, nil
}

// alignment pairs rollwise rows with handwritten rows.
type alignment struct {
	pairs     map[int]int
	sqlOnly   []int
	rwOnly    []int
	ambiguous []ambiguous
}

// ambiguous is a set of handwritten rows and the rollwise rows they could
// be; pattern marks the --by columns whose NULLs are in doubt.
type ambiguous struct {
	pattern uint64
	hw      []int
	comp    []int
}

// align pairs the rows. A handwritten row whose mask is known matches the
// rollwise row of the same cell. Otherwise its NULL keys may be rolled-up
// groups or genuine NULL groups: it matches when exactly one rollwise row
// fits and no other handwritten row competes for it; when several fit,
// the rows are ambiguous.
func align(n int, sets []uint64, comp []resultRow, index map[string]int, h *handwritten) alignment {
	a := alignment{pairs: map[int]int{}}
	taken := map[int]bool{}
	type group struct {
		key     string
		pattern uint64
		keys    []any
		rows    []int
		known   bool
	}
	var order []*group
	byKey := map[string]*group{}
	for hi, r := range h.rows {
		var k string
		var pattern uint64
		if r.known {
			k = "k" + cellKey(r.mask, r.keys)
		} else {
			for i, x := range r.keys {
				if x == nil {
					pattern |= 1 << (n - 1 - i)
				}
			}
			k = "u" + cellKey(0, r.keys)
		}
		g := byKey[k]
		if g == nil {
			g = &group{key: k, pattern: pattern, keys: r.keys, known: r.known}
			byKey[k] = g
			order = append(order, g)
		}
		g.rows = append(g.rows, hi)
	}
	for _, g := range order {
		var cands []int
		if g.known {
			if ci, ok := index[g.key[1:]]; ok {
				cands = append(cands, ci)
			}
		} else {
			for _, s := range sets {
				if s&^g.pattern != 0 {
					continue
				}
				if ci, ok := index[cellKey(s, g.keys)]; ok {
					cands = append(cands, ci)
				}
			}
		}
		switch {
		case len(cands) == 0:
			a.sqlOnly = append(a.sqlOnly, g.rows...)
		case len(cands) == 1 && len(g.rows) == 1:
			a.pairs[cands[0]] = g.rows[0]
			taken[cands[0]] = true
		default:
			a.ambiguous = append(a.ambiguous, ambiguous{pattern: g.pattern, hw: g.rows, comp: cands})
			for _, ci := range cands {
				taken[ci] = true
			}
		}
	}
	for ci := range comp {
		if !taken[ci] {
			a.rwOnly = append(a.rwOnly, ci)
		}
	}
	sort.Ints(a.sqlOnly)
	return a
}
