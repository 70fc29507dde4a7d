package dialects

import (
	"fmt"
	"slices"
	"strings"
)

// sorted finishes a statement whose rows are sorted by a measure or cut by
// --limit. The report's rows go to a CTE; then:
//
//   - with total rows in a hierarchy (rollup, all), each group is sorted by
//     the measure at its own subtotal, level by level, and each subtotal
//     stays after its group; without, detail rows are sorted by the measure
//     and total rows follow;
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
	hier := r.p.OrderBy != nil && n > 1 && slices.Contains(r.p.Sets, uint64(1))
	var keys []string
	if hier {
		var extra []string
		for i := 0; i < n-1; i++ {
			anc := uint64(1)<<(n-1-i) - 1
			hi := (uint64(1)<<n - 1) &^ anc
			part := []string{r.d.BitAnd(r.q(GroupingColumn), fmt.Sprint(hi))}
			for _, g := range q.GroupNames[:i+1] {
				part = append(part, r.q(g))
			}
			name := fmt.Sprintf("sort_%d", i+1)
			// The subtotal of a row's group at level i is the row of its
			// partition (the same groups 0..i, rolled up or not) where
			// every later group is rolled up: with --totals all an earlier
			// group may be rolled up too, so the test reads only the later
			// groups' bits.
			extra = append(extra, "max(CASE WHEN "+r.d.BitAnd(r.q(GroupingColumn), fmt.Sprint(anc))+" = "+fmt.Sprint(anc)+" THEN "+
				r.q(r.p.OrderBy.Name)+" END) OVER (PARTITION BY "+strings.Join(part, ", ")+") AS "+r.q(name))
		}
		next := r.cteName("result_sorted")
		r.addCTE(next, "  SELECT\n    "+strings.Join(append(append([]string{}, cols...), extra...), ",\n    ")+"\n  FROM "+r.q(prev))
		for i := 1; i < n; i++ {
			cols = append(cols, r.q(fmt.Sprintf("sort_%d", i)))
		}
		prev = next
		for i, g := range q.GroupNames {
			keys = append(keys, r.d.BitAnd(r.q(GroupingColumn), fmt.Sprint(uint64(1)<<(n-1-i))))
			if i < n-1 {
				keys = append(keys, OrderKey(r.d, r.q(fmt.Sprintf("sort_%d", i+1)), q.Desc)...)
			} else {
				keys = append(keys, OrderKey(r.d, r.q(r.p.OrderBy.Name), q.Desc)...)
			}
			keys = append(keys, OrderKey(r.d, r.q(g), false)...)
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
