package dialects

import (
	"fmt"
	"slices"
	"strings"
)

// sorted finishes a statement whose rows are sorted by --order keys or cut
// by --limit. The report's rows go to a CTE; then:
//
//   - with total rows in a hierarchy (rollup, all), level by level: the
//     groups of level i are sorted by the keys that mean something there,
//     in the order given (each measure key at the group's own subtotal,
//     the key on group i itself), then by group i's value, and each
//     subtotal stays after its group; without a hierarchy, detail rows
//     are sorted by the keys and total rows follow;
//   - --limit N keeps the first N detail rows in that order, the total rows
//     of the groups they belong to, and the grand total. Without total rows
//     that is the first N rows: a LIMIT (TOP on SQL Server) on the final
//     SELECT, which an engine runs as a top-N (keeping N rows) rather than
//     sorting every row to number them.
func (r *renderer) sorted(body string) (string, error) {
	q := r.p.Query
	n := len(q.Groups)
	cols := r.resultColumns()
	prev := r.cteName("result")
	r.addCTE(prev, indent(body))
	hier := len(r.p.Order) > 0 && n > 1 && slices.Contains(r.p.Sets, uint64(1))
	var keys []string
	if hier {
		var extra []string
		// sortCols[i][k] is the column holding measure key k at the
		// subtotal of group i's level.
		sortCols := make([]map[int]string, n-1)
		for i := 0; i < n-1; i++ {
			anc := uint64(1)<<(n-1-i) - 1
			hi := (uint64(1)<<n - 1) &^ anc
			part := []string{r.d.BitAnd(r.q(GroupingColumn), fmt.Sprint(hi))}
			for _, g := range q.GroupNames[:i+1] {
				part = append(part, r.q(g))
			}
			sortCols[i] = map[int]string{}
			nth := 0
			for k, key := range r.p.Order {
				if key.Output == nil {
					continue
				}
				nth++
				name := fmt.Sprintf("sort_%d", i+1)
				if nth > 1 {
					name = fmt.Sprintf("sort_%d_%d", i+1, nth)
				}
				sortCols[i][k] = name
				// The subtotal of a row's group at level i is the row of
				// its partition (the same groups 0..i, rolled up or not)
				// where every later group is rolled up: with --totals all
				// an earlier group may be rolled up too, so the test reads
				// only the later groups' bits.
				extra = append(extra, "max(CASE WHEN "+r.d.BitAnd(r.q(GroupingColumn), fmt.Sprint(anc))+" = "+fmt.Sprint(anc)+" THEN "+
					r.q(key.Output.Name)+" END) OVER (PARTITION BY "+strings.Join(part, ", ")+") AS "+r.q(name))
			}
		}
		next := r.cteName("result_sorted")
		r.addCTE(next, "  SELECT\n    "+strings.Join(append(append([]string{}, cols...), extra...), ",\n    ")+"\n  FROM "+r.q(prev))
		for i := range sortCols {
			for k := range r.p.Order {
				if name, ok := sortCols[i][k]; ok {
					cols = append(cols, r.q(name))
				}
			}
		}
		prev = next
		for i, g := range q.GroupNames {
			keys = append(keys, r.d.BitAnd(r.q(GroupingColumn), fmt.Sprint(uint64(1)<<(n-1-i))))
			ownKey := false
			for k, key := range r.p.Order {
				switch {
				case key.Output != nil && i < n-1:
					keys = append(keys, OrderKey(r.d, r.q(sortCols[i][k]), key.Desc)...)
				case key.Output != nil:
					keys = append(keys, OrderKey(r.d, r.q(key.Output.Name), key.Desc)...)
				case key.Group == g:
					keys = append(keys, OrderKey(r.d, r.q(g), key.Desc)...)
					ownKey = true
				}
			}
			if !ownKey {
				keys = append(keys, OrderKey(r.d, r.q(g), false)...)
			}
		}
	} else {
		keys = r.orderBy(true)
	}
	where := ""
	limited := q.Limit > 0 && len(keys) > 0
	top := limited && len(r.p.Sets) == 1
	if limited && !top {
		next := r.cteName("result_ranked")
		// A running count rather than ROW_NUMBER(): DuckDB 1.5's
		// top_n_window_elimination rewrites "ROW_NUMBER() ... <= N" and
		// keeps the wrong rows when a sort key has NULLs
		// (testdata/differential/limit_topn_window). The two are equal
		// here: the keys make every row of a partition distinct.
		rank := "count(*) OVER (PARTITION BY " + r.q(GroupingColumn) + " ORDER BY " + strings.Join(keys, ", ") +
			" ROWS BETWEEN UNBOUNDED PRECEDING AND CURRENT ROW) AS " + r.q("detail_rank")
		r.addCTE(next, "  SELECT\n    "+strings.Join(append(append([]string{}, cols...), rank), ",\n    ")+"\n  FROM "+r.q(prev))
		cols = append(cols, r.q("detail_rank"))
		prev = next
		conds := []string{"(" + r.q(GroupingColumn) + " = 0 AND " + r.q("detail_rank") + " <= " + fmt.Sprint(q.Limit) + ")"}
		full := uint64(1)<<n - 1
		var keeps []string
		for _, set := range r.p.Sets {
			switch {
			case set == 0:
			case set == full:
				conds = append(conds, r.q(GroupingColumn)+" = "+fmt.Sprint(set))
			default:
				name := fmt.Sprintf("first_rank_%d", set)
				var part []string
				for i, g := range q.GroupNames {
					if set&(1<<(n-1-i)) == 0 {
						part = append(part, r.q(g))
					}
				}
				keeps = append(keeps, "min(CASE WHEN "+r.q(GroupingColumn)+" = 0 THEN "+r.q("detail_rank")+
					" END) OVER (PARTITION BY "+strings.Join(part, ", ")+") AS "+r.q(name))
				conds = append(conds, "("+r.q(GroupingColumn)+" = "+fmt.Sprint(set)+" AND "+r.q(name)+" <= "+fmt.Sprint(q.Limit)+")")
			}
		}
		if len(keeps) > 0 {
			next := r.cteName("result_kept")
			r.addCTE(next, "  SELECT\n    "+strings.Join(append(append([]string{}, cols...), keeps...), ",\n    ")+"\n  FROM "+r.q(prev))
			prev = next
		}
		where = "\nWHERE " + strings.Join(conds, "\n  OR ")
	}
	out := r.resultColumns()
	final := "SELECT\n  " + strings.Join(out, ",\n  ") + "\nFROM " + r.q(prev) + where
	if len(keys) > 0 {
		final += "\nORDER BY " + strings.Join(keys, ", ")
	}
	if top {
		// The keys order the rows totally (the group values tell any two
		// apart), so the first N are the ones the window form keeps.
		var err error
		if final, err = ApplyLimit(r.d, final, q.Limit); err != nil {
			return "", err
		}
	}
	return "WITH " + strings.Join(r.ctes, ",\n") + "\n" + final, nil
}

// resultColumns are the report's columns by their plain names.
func (r *renderer) resultColumns() []string {
	var cols []string
	for _, g := range r.p.Query.GroupNames {
		cols = append(cols, r.q(g))
	}
	for _, o := range r.p.Outputs {
		cols = append(cols, r.q(o.Name))
	}
	return append(cols, r.q(GroupingColumn))
}

func indent(s string) string { return "  " + strings.ReplaceAll(s, "\n", "\n  ") }
