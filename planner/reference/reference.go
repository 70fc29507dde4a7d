// Package reference is rollwise's reference evaluator: it computes a
// query's result from a resolved model and rows held in memory, cell by
// cell, exactly as language.md defines a value, with simple loops and no
// SQL. It shares no planning code with the SQL path (planner/plan and
// the dialects), so that the two can disagree: the differential tests run
// both on random models and data and compare their rows. It imports only
// grammar and planner/model, which TestReferenceImportsOnlyTheModel
// checks.
//
// What a value means, as implemented here:
//
//   - A result row's cell is its group values (T.C = v for every group
//     column not rolled up, NULL-safe) plus every filter conjunct.
//   - An aggregate sees the rows of its iteration table that satisfy every
//     constraint of the cell, reaching dimension columns along links; a
//     row whose link finds no match reads NULL for every column of the
//     tables beyond it (derived columns included). A constraint on a
//     column the iteration table cannot reach is an error.
//   - Narrowing (m where P) adds P to the cell as a filter; cell edits
//     change the cell (see cell.edit); per-grain aggregates evaluate their
//     measure in the cell plus one grouping per group (see perAgg).
//   - A total row is the cell with the rolled-up groupings left out.
//   - The rows: one per combination of group values occurring in the
//     iteration rows (under the query's filters) of at least one requested
//     measure, plus the total rows of the totals mode; a grand total row
//     (or the one row of a query without groups) always exists.
//   - Exact numbers (integer, decimal) are computed exactly; float results
//     (averages, ratios, statistics) are computed exactly where the inputs
//     are exact and rounded once.
package reference

import (
	"fmt"
	"slices"
	"sort"

	"github.com/rollwise/rollwise/planner/model"
)

// Row is one result row: each group reference as written, each measure's
// name, and rolled_up, shaped as `rollwise run --format json` writes them
// (see JSON).
type Row struct {
	// Groups holds the group values (nil where rolled up or NULL).
	Groups []Value
	// Measures holds one value per query measure.
	Measures []Value
	// RolledUp marks the rolled-up groups.
	RolledUp []bool
}

// Result is a query's rows in order.
type Result struct {
	Query *model.Query
	Rows  []Row
}

// Evaluate loads the model's data (see Load) and runs the query.
func Evaluate(m *model.Model, q *model.Query, dataDir string) (*Result, error) {
	d, err := Load(m, dataDir)
	if err != nil {
		return nil, err
	}
	return d.Run(q)
}

// Run computes the query's rows.
func (d *Data) Run(q *model.Query) (*Result, error) {
	if q == nil {
		return nil, fmt.Errorf("reference: no query")
	}
	ev := newEvaluator(d)
	var filters cell
	for _, f := range q.Filters {
		filters = filters.with(filterOn(f))
	}
	combos, err := ev.combinations(q, filters)
	if err != nil {
		return nil, err
	}
	n := len(q.Groups)
	var rows []Row
	for _, rolled := range groupingSets(q.Totals, n) {
		seen := map[string]bool{}
		for _, combo := range combos {
			g := make([]Value, n)
			for i := range g {
				if !rolled[i] {
					g[i] = combo[i]
				}
			}
			k := tupleKey(g)
			if seen[k] {
				continue
			}
			seen[k] = true
			rows = append(rows, Row{Groups: g, RolledUp: rolled})
		}
		if !slices.Contains(rolled, false) && len(seen) == 0 {
			rows = append(rows, Row{Groups: make([]Value, n), RolledUp: rolled})
		}
	}
	for i := range rows {
		c := filters
		for j, g := range q.Groups {
			if !rows[i].RolledUp[j] {
				c = c.with(groupOn(g, rows[i].Groups[j]))
			}
		}
		for _, m := range q.Measures {
			v, err := ev.measure(m.Expr, c)
			if err != nil {
				return nil, fmt.Errorf("measure %s: %w", m.Name, err)
			}
			rows[i].Measures = append(rows[i].Measures, v)
		}
	}
	rows, err = order(q, rows)
	if err != nil {
		return nil, err
	}
	return &Result{Query: q, Rows: rows}, nil
}

// combinations lists the distinct combinations of group values among the
// iteration rows of the query's measures that pass the filters.
func (ev *evaluator) combinations(q *model.Query, filters cell) ([][]Value, error) {
	var tables []*model.Table
	for _, m := range q.Measures {
		var err error
		if tables, err = iterationTables(m.Expr, tables, map[*model.Measure]bool{}); err != nil {
			return nil, fmt.Errorf("measure %s: %w", m.Name, err)
		}
	}
	var combos [][]Value
	seen := map[string]bool{}
	for _, t := range tables {
		td := ev.d.tables[t]
		if td == nil {
			return nil, fmt.Errorf("table %s is not loaded", t.Name)
		}
		for _, g := range q.Groups {
			if _, ok := reachable(td, g.Table); !ok {
				return nil, fmt.Errorf("cannot group by %s: %w", g, &errUnreachable{col: g, from: t})
			}
		}
		rows, err := ev.rowsOf(td, filters)
		if err != nil {
			return nil, err
		}
		for _, r := range rows {
			combo := make([]Value, len(q.Groups))
			for i, g := range q.Groups {
				if combo[i], err = ev.d.column(td, r, g); err != nil {
					return nil, err
				}
			}
			if k := tupleKey(combo); !seen[k] {
				seen[k] = true
				combos = append(combos, combo)
			}
		}
	}
	return combos, nil
}

// groupingSets lists, for a totals mode over n groups, which groups each
// set rolls up, the detail set first: none (detail only), grand (and
// everything rolled up), rollup (the last j groups rolled up, j = 1..n),
// all (every subset, fewest rolled up first).
func groupingSets(mode model.TotalsMode, n int) [][]bool {
	set := func(f func(i int) bool) []bool {
		out := make([]bool, n)
		for i := range out {
			out[i] = f(i)
		}
		return out
	}
	sets := [][]bool{set(func(int) bool { return false })}
	if n == 0 {
		return sets
	}
	switch mode {
	case model.TotalsGrand:
		sets = append(sets, set(func(int) bool { return true }))
	case model.TotalsRollup:
		for j := 1; j <= n; j++ {
			sets = append(sets, set(func(i int) bool { return i >= n-j }))
		}
	case model.TotalsAll:
		for k := 1; k <= n; k++ {
			for mask := 0; mask < 1<<n; mask++ {
				if popcount(mask) == k {
					sets = append(sets, set(func(i int) bool { return mask&(1<<i) != 0 }))
				}
			}
		}
	}
	return sets
}

func popcount(x int) int {
	n := 0
	for ; x != 0; x &= x - 1 {
		n++
	}
	return n
}

// order sorts the rows as the language orders a report:
//
//   - without --order, by each group in turn: its values ascending, NULLs
//     last, and its total rows right after them;
//   - with --order keys and totals in a hierarchy (rollup or all, two
//     groups or more), level by level: at each group, its total rows last,
//     then the groups by the keys in turn (a measure key at the group's
//     own subtotal, the row that rolls up every later group, and at the
//     last group the measure itself; a key on this group's column by its
//     value; keys on other groups' columns are skipped), then by the
//     group's value unless a key sorted by it. Each subtotal stays after
//     its group;
//   - with --order keys otherwise, the detail rows first, then the total
//     rows (the grand total, at most one), each by the keys in turn (NULLs
//     last in either direction), then by the other group values.
//
// --limit N keeps the first N detail rows, in that order, the total rows of
// the groups they belong to, and the grand total (docs/language.md).
func order(q *model.Query, rows []Row) ([]Row, error) {
	// at[k] is the index among the measures of measure key k, or -1.
	at := make([]int, len(q.Order))
	for k, key := range q.Order {
		at[k] = -1
		for i, m := range q.Measures {
			if key.Measure != nil && m == key.Measure {
				at[k] = i
			}
		}
		if key.Measure != nil && at[k] < 0 {
			return nil, fmt.Errorf("--order names %s, which the query does not ask for", key.Measure.Name)
		}
	}
	n := len(q.Groups)
	hier := len(q.Order) > 0 && n > 1 && (q.Totals == model.TotalsRollup || q.Totals == model.TotalsAll)
	var err error
	sortVal := map[int]func(r Row, i int) Value{}
	if hier {
		for k := range q.Order {
			if at[k] >= 0 {
				sortVal[k] = subtotalValues(rows, n, at[k])
			}
		}
	}
	keyed := map[int]bool{}
	for _, key := range q.Order {
		if key.Measure == nil {
			keyed[key.Group] = true
		}
	}
	cmp := func(a, b Row) int {
		if len(q.Order) > 0 && !hier {
			da, db := slices.Contains(a.RolledUp, true), slices.Contains(b.RolledUp, true)
			if da != db {
				return boolCmp(da, db)
			}
			for k, key := range q.Order {
				x, y := keyValues(a, b, key, at[k])
				if c := nullsLast(x, y, key.Desc, &err); c != 0 {
					return c
				}
			}
		}
		for i := range a.Groups {
			if a.RolledUp[i] != b.RolledUp[i] {
				return boolCmp(a.RolledUp[i], b.RolledUp[i])
			}
			if hier {
				for k, key := range q.Order {
					var x, y Value
					switch {
					case at[k] >= 0 && i < n-1:
						x, y = sortVal[k](a, i), sortVal[k](b, i)
					case at[k] >= 0:
						x, y = a.Measures[at[k]], b.Measures[at[k]]
					case key.Group == i:
						x, y = a.Groups[i], b.Groups[i]
					default:
						continue
					}
					if c := nullsLast(x, y, key.Desc, &err); c != 0 {
						return c
					}
				}
			}
			if keyed[i] {
				continue
			}
			if c := nullsLast(a.Groups[i], b.Groups[i], false, &err); c != 0 {
				return c
			}
		}
		return 0
	}
	sort.SliceStable(rows, func(i, j int) bool { return cmp(rows[i], rows[j]) < 0 })
	if err != nil {
		return nil, err
	}
	if q.Limit > 0 {
		var kept []Row
		for _, r := range rows {
			if !slices.Contains(r.RolledUp, true) && len(kept) < q.Limit {
				kept = append(kept, r)
			}
		}
		// A total row stays when it is the grand total or when one of the
		// kept detail rows belongs to its group.
		covers := func(total Row) bool {
			if !slices.Contains(total.RolledUp, false) {
				return true
			}
			for _, d := range kept {
				match := true
				for i := range total.Groups {
					if !total.RolledUp[i] && tupleKey(total.Groups[i:i+1]) != tupleKey(d.Groups[i:i+1]) {
						match = false
					}
				}
				if match {
					return true
				}
			}
			return false
		}
		var out []Row
		n := 0
		for _, r := range rows {
			switch {
			case !slices.Contains(r.RolledUp, true):
				if n < q.Limit {
					out = append(out, r)
				}
				n++
			case covers(r):
				out = append(out, r)
			}
		}
		rows = out
	}
	return rows, nil
}

// subtotalValues returns, for a row and a level i (below the last group),
// the value of measure ob at the row's subtotal of level i: the row with
// the same values of groups 0..i, rolled up where the row rolls them up
// (with --totals all an earlier group may be), that rolls up every group
// after i.
// keyValues are the values of one --order key in rows a and b: measure
// m's (at its index among the measures), or the key's group column's.
func keyValues(a, b Row, key model.OrderKey, m int) (Value, Value) {
	if m >= 0 {
		return a.Measures[m], b.Measures[m]
	}
	return a.Groups[key.Group], b.Groups[key.Group]
}

func subtotalValues(rows []Row, n, ob int) func(Row, int) Value {
	at := map[string]Value{}
	key := func(r Row, i int) string {
		return fmt.Sprint(i, r.RolledUp[:i+1]) + "|" + tupleKey(r.Groups[:i+1])
	}
	for _, r := range rows {
		for i := 0; i < n-1; i++ {
			if !slices.Contains(r.RolledUp[i+1:], false) {
				at[key(r, i)] = r.Measures[ob]
			}
		}
	}
	return func(r Row, i int) Value { return at[key(r, i)] }
}

func boolCmp(a, b bool) int {
	if a == b {
		return 0
	}
	if !a {
		return -1
	}
	return 1
}

// nullsLast compares two values, NULLs after everything in either
// direction.
func nullsLast(a, b Value, desc bool, errp *error) int {
	switch {
	case a == nil && b == nil:
		return 0
	case a == nil:
		return 1
	case b == nil:
		return -1
	}
	c, err := compare(a, b)
	if err != nil && *errp == nil {
		*errp = err
	}
	if desc {
		return -c
	}
	return c
}
