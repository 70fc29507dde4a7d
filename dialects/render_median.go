package dialects

import (
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/planner/plan"
)

// Exact medians on engines without a median aggregate (SQLite, MySQL and
// MariaDB, SQL Server, BigQuery, Trino: engine-facts.md §7) are computed with
// window functions, which all of them have (§6): a CTE over the rows
// numbers each row's value within its cell (ROW_NUMBER, NULLs last) and
// counts the cell's non-NULL values n; the cell's median is the mean of
// the values whose number r has n <= 2r <= n + 2, the middle one of an
// odd count or the middle two of an even one: the continuous median (the
// 0.5 quantile with linear interpolation, as DuckDB's median and
// percentile_cont(0.5) compute it). Ties need no order among themselves:
// tied rows hold the same value. The test is written without division
// and subtraction, as MySQL's / is fractional and its ROW_NUMBER
// unsigned. The count is a window over the same ordering as the number,
// framed to the whole partition: a plain COUNT(x) OVER (PARTITION BY ..)
// beside them gave MariaDB 10.11 wrong row numbers in another window of
// the same SELECT (checked). Each grouping set of a cells CTE partitions
// by the keys it keeps, so total rows get their own numbering; a GROUP BY
// GROUPING SETS picks the set's mean by the grouping id.

// cellAgg is an aggregate column of a cells CTE: sql ("agg AS name") is
// the same in every grouping set, or, when bySet is set, the expression
// differs by set (a median numbered within each set's cells).
type cellAgg struct {
	sql   string
	name  string
	bySet map[uint64]string
}

// plainAggs wraps aggregate columns that are the same in every set.
func plainAggs(aggs []string) []cellAgg {
	out := make([]cellAgg, len(aggs))
	for i, a := range aggs {
		out[i] = cellAgg{sql: a}
	}
	return out
}

// inSet is the column as a cells query of the one set mask computes it.
func (a cellAgg) inSet(mask uint64) string {
	if a.bySet == nil {
		return a.sql
	}
	return a.bySet[mask] + " AS " + a.name
}

// inGroupingSets is the column in a GROUP BY GROUPING SETS query: each
// set's expression, chosen by the grouping id gid.
func (a cellAgg) inGroupingSets(gid string, sets []uint64) string {
	if a.bySet == nil {
		return a.sql
	}
	var b strings.Builder
	b.WriteString("CASE " + gid)
	for _, s := range sets {
		fmt.Fprintf(&b, "\n      WHEN %d THEN %s", s, a.bySet[s])
	}
	return b.String() + "\n    END AS " + a.name
}

// rankedValue is a median to compute: the leaf's name and its value
// (rendered; NULL on a row that does not count).
type rankedValue struct {
	name, value string
}

// ranks renders the CTE over from (a quoted relation) that keeps the
// columns cols (unquoted names) and adds, for each value, the value and
// its number and count within each partition of parts (quoted keys; none
// for one partition of all rows). It returns the CTE's name and the
// median of value i in partition j, an aggregate over the CTE.
func (r *renderer) ranks(base, from string, cols []string, vals []rankedValue, parts [][]string) (string, func(i, j int) (string, error), error) {
	taken := map[string]bool{}
	var sel []string
	for _, c := range cols {
		if !taken[c] {
			taken[c] = true
			sel = append(sel, r.q(c))
		}
	}
	fresh := func(n string) string {
		c := n
		for i := 2; taken[c]; i++ {
			c = fmt.Sprintf("%s_%d", n, i)
		}
		taken[c] = true
		return r.q(c)
	}
	type ranked struct {
		value          string
		number, counts []string
	}
	rk := make([]ranked, len(vals))
	for i, v := range vals {
		value := fresh(v.name + "_median_value")
		sel = append(sel, v.value+" AS "+value)
		rk[i].value = value
		// The windows read the value's expression: a column named in the
		// same SELECT list cannot be read there.
		count, err := r.agg("count", false, v.value)
		if err != nil {
			return "", nil, err
		}
		for j, p := range parts {
			suffix := ""
			if len(parts) > 1 {
				suffix = fmt.Sprintf("_%d", j)
			}
			over := "ORDER BY " + strings.Join(OrderKey(r.d, v.value, false), ", ")
			if len(p) > 0 {
				over = "PARTITION BY " + strings.Join(p, ", ") + " " + over
			}
			num, cnt := fresh(v.name+"_median_number"+suffix), fresh(v.name+"_median_count"+suffix)
			sel = append(sel, "ROW_NUMBER() OVER ("+over+") AS "+num,
				count+" OVER ("+over+" ROWS BETWEEN UNBOUNDED PRECEDING AND UNBOUNDED FOLLOWING) AS "+cnt)
			rk[i].number = append(rk[i].number, num)
			rk[i].counts = append(rk[i].counts, cnt)
		}
	}
	name := r.cteName(base + "_ranks")
	r.addCTE(name, "  SELECT\n    "+strings.Join(sel, ",\n    ")+"\n  FROM "+from)
	return name, func(i, j int) (string, error) {
		n, c := rk[i].number[j], rk[i].counts[j]
		return r.agg("avg", false, "CASE WHEN 2 * "+n+" BETWEEN "+c+" AND "+c+" + 2 THEN "+rk[i].value+" END")
	}, nil
}

// leafRanked is a median leaf's value on a row of a CTE whose columns col
// names: its argument, where its filter holds.
func (r *renderer) leafRanked(l *plan.Leaf, col func(string) string) rankedValue {
	v := r.q(col(l.Arg.Name))
	if l.Filter != nil {
		v = "CASE WHEN " + r.d.Truth(r.q(col(l.Filter.Name))) + " THEN " + v + " END"
	}
	return rankedValue{name: l.Name, value: v}
}

// scanMedians computes a scan's medians with windows where the dialect
// needs it (windowMedians): it renders the ranks CTE over the scan's rows
// (rowsName, whose columns col names) and returns the relation the cells
// CTE reads and the medians' columns by leaf. Without medians to compute
// so, it returns the rows CTE and nil.
func (r *renderer) scanMedians(rel *plan.Rel, rowsName string, col func(string) string) (string, map[*plan.Leaf]cellAgg, error) {
	s := rel.Scan
	var meds []*plan.Leaf
	for _, l := range s.Leaves {
		if l.Func == "median" && r.windowMedians() {
			meds = append(meds, l)
		}
	}
	if len(meds) == 0 {
		return r.q(rowsName), nil, nil
	}
	var cols []string
	for _, k := range s.Keys {
		cols = append(cols, k.Name)
	}
	for _, l := range s.Leaves {
		if l.Func == "median" {
			continue
		}
		for _, in := range []*plan.Input{l.Arg, l.Filter} {
			if in != nil {
				cols = append(cols, col(in.Name))
			}
		}
	}
	var vals []rankedValue
	for _, l := range meds {
		vals = append(vals, r.leafRanked(l, col))
	}
	var keys []string
	for _, k := range s.Keys {
		keys = append(keys, r.q(k.Name))
	}
	sets := rel.Sets
	if len(keys) == 0 || len(sets) == 0 {
		sets = []uint64{setOf(sets)}
	}
	parts := make([][]string, len(sets))
	for j, set := range sets {
		parts[j] = keptKeys(keys, set)
	}
	name, median, err := r.ranks(rel.Name, r.q(rowsName), cols, vals, parts)
	if err != nil {
		return "", nil, err
	}
	out := map[*plan.Leaf]cellAgg{}
	for i, l := range meds {
		a := cellAgg{name: r.q(l.Name), bySet: map[uint64]string{}}
		for j, set := range sets {
			m, err := median(i, j)
			if err != nil {
				return "", nil, err
			}
			a.bySet[set] = m
		}
		out[l] = a
	}
	return r.q(name), out, nil
}

// setOf is the one set of a cells CTE with at most one (0 for none).
func setOf(sets []uint64) uint64 {
	if len(sets) == 1 {
		return sets[0]
	}
	return 0
}

// perMedians computes the medians of a per-grain relation with windows
// where the dialect needs it: over the groups CTE (columns cols), each
// leaf's value where its condition cond holds, numbered within the
// relation's cells (the grouping id and keys). It returns the relation the
// aggregate reads and the medians' aggregates by leaf.
func (r *renderer) perMedians(rel *plan.Rel, groups string, cols []string, cond map[*plan.PerLeaf]string, keys []string) (string, map[*plan.PerLeaf]string, error) {
	var meds []*plan.PerLeaf
	var vals []rankedValue
	for _, l := range rel.Per.Leaves {
		if l.Func == "median" && r.windowMedians() {
			v := r.q(l.Value.Name)
			if c := cond[l]; c != "" {
				v = "CASE WHEN " + c + " THEN " + v + " END"
			}
			meds = append(meds, l)
			vals = append(vals, rankedValue{name: l.Name, value: v})
		}
	}
	if len(meds) == 0 {
		return r.q(groups), nil, nil
	}
	part := append([]string{r.q(GroupingColumn)}, keys...)
	name, median, err := r.ranks(rel.Name, r.q(groups), cols, vals, [][]string{part})
	if err != nil {
		return "", nil, err
	}
	out := map[*plan.PerLeaf]string{}
	for i, l := range meds {
		m, err := median(i, 0)
		if err != nil {
			return "", nil, err
		}
		out[l] = m
	}
	return r.q(name), out, nil
}
