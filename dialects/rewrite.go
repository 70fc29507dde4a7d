package dialects

import (
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// The rewrites below replace a construct an engine lacks by one it has,
// with the same meaning. Each takes the pieces the renderer already has
// (rendered SQL text, quoted names) and returns SQL text; each returns
// exactly the renderer's own spelling on an engine that has the construct,
// so that calling it changes nothing there.

// GroupingSetsSQL renders the aggregation of from over the grouping sets,
// in the layout of the renderer's cells CTE (two-space indented SELECT
// list, one clause a line). keys are the quoted group keys in --by order;
// sets are the grouping sets as masks of rolled-up keys (plan.Plan.Sets:
// bit 1<<(n-1-i) is key i, the detail set 0 first); aggs are the rendered
// aggregate columns ("sum(x) AS y"); from is the (quoted) relation. With
// one set the grouping id is that set's mask (a literal).
//
// With GROUPING SETS it is one SELECT with GROUP BY GROUPING SETS and the
// dialect's grouping id. Without (MySQL/MariaDB have only WITH ROLLUP and
// MariaDB no GROUPING(), SQLite neither: engine-facts.md §4), it is a UNION
// ALL of one GROUP BY per set, each branch carrying its mask as a literal
// grouping id and NULL for its rolled-up keys: the same rows, as a set
// with no keys aggregates every row into one row (also when there are
// none), as the empty grouping set does.
func GroupingSetsSQL(d *Dialect, keys []string, sets []uint64, aggs []string, from string) string {
	return groupingSets(d, keys, sets, plainAggs(aggs), from)
}

// groupingSets is GroupingSetsSQL with aggregate columns that may differ
// by grouping set (cellAgg).
func groupingSets(d *Dialect, keys []string, sets []uint64, aggs []cellAgg, from string) string {
	gid := d.Ident(GroupingColumn)
	if len(keys) == 0 || len(sets) <= 1 {
		id := setOf(sets)
		cols := append(append([]string{}, keys...), fmt.Sprintf("%d AS %s", id, gid))
		for _, a := range aggs {
			cols = append(cols, a.inSet(id))
		}
		return selectGrouped(cols, keys, len(aggs) > 0, from)
	}
	if d.caps.GroupingSets {
		id := d.GroupingID(keys)
		cols := append(append([]string{}, keys...), id+" AS "+gid)
		for _, a := range aggs {
			cols = append(cols, a.inGroupingSets(id, sets))
		}
		var groups []string
		for _, mask := range sets {
			groups = append(groups, "("+strings.Join(keptKeys(keys, mask), ", ")+")")
		}
		return "  SELECT\n    " + strings.Join(cols, ",\n    ") + "\n  FROM " + from +
			"\n  GROUP BY GROUPING SETS (" + strings.Join(groups, ", ") + ")"
	}
	return unionGroupingSets(d, keys, sets, aggs, from)
}

// unionGroupingSets is groupingSets's UNION ALL form, for engines
// without GROUPING SETS: one GROUP BY per set, the mask as a literal
// grouping id, NULL for rolled-up keys.
func unionGroupingSets(d *Dialect, keys []string, sets []uint64, aggs []cellAgg, from string) string {
	gid := d.Ident(GroupingColumn)
	n := len(keys)
	var branches []string
	for _, mask := range sets {
		var cols []string
		for i, k := range keys {
			if mask&(uint64(1)<<(n-1-i)) != 0 {
				cols = append(cols, "NULL AS "+k)
			} else {
				cols = append(cols, k)
			}
		}
		cols = append(cols, fmt.Sprintf("%d AS %s", mask, gid))
		for _, a := range aggs {
			cols = append(cols, a.inSet(mask))
		}
		branches = append(branches, selectGrouped(cols, keptKeys(keys, mask), len(aggs) > 0, from))
	}
	return strings.Join(branches, "\n  UNION ALL\n")
}

// selectGrouped is SELECT cols FROM from GROUP BY groupBy. Without group
// keys, the cell is the one row of all of from: an aggregate query gives
// it (also when from is empty), but a SELECT with no aggregate would give
// a row per row of from, so it then selects its constants from no table.
func selectGrouped(cols, groupBy []string, aggregates bool, from string) string {
	sql := "  SELECT\n    " + strings.Join(cols, ",\n    ")
	switch {
	case len(groupBy) > 0:
		sql += "\n  FROM " + from + "\n  GROUP BY " + strings.Join(groupBy, ", ")
	case aggregates:
		sql += "\n  FROM " + from
	}
	return sql
}

// keptKeys lists the keys a grouping set keeps (does not roll up).
func keptKeys(keys []string, mask uint64) []string {
	n := len(keys)
	var out []string
	for i, k := range keys {
		if mask&(uint64(1)<<(n-1-i)) == 0 {
			out = append(out, k)
		}
	}
	return out
}

// filteredAgg spells an aggregate (by agg) over the rows where filter (a rendered
// predicate, "" for none; a boolean column is made one with d.Truth)
// holds: agg(x) FILTER (WHERE f) where the engine has the clause, else
// agg(CASE WHEN f THEN x END), which the aggregates treat alike as they
// skip NULLs (engine-facts.md §5); count(*) becomes
// count(CASE WHEN f THEN 1 END). arg is "" for count(*).
func filteredAgg(d *Dialect, agg func(fn string, distinct bool, arg string) (string, error), fn string, distinct bool, arg, filter string) (string, error) {
	if filter == "" {
		return agg(fn, distinct, arg)
	}
	if d.caps.FilterClause {
		a, err := agg(fn, distinct, arg)
		if err != nil {
			return "", err
		}
		return a + " FILTER (WHERE " + filter + ")", nil
	}
	if arg == "" {
		arg = "1"
	}
	return agg(fn, distinct, "CASE WHEN "+filter+" THEN "+arg+" END")
}

// OrderKey returns the ORDER BY items that sort by expr, NULLs last:
// "x ASC NULLS LAST" where the engine has NULLS LAST, else a leading
// "CASE WHEN x IS NULL THEN 1 ELSE 0 END" (MySQL, MariaDB and SQL Server
// sort NULLs first ascending). The same items serve a window's ORDER BY.
func OrderKey(d *Dialect, expr string, desc bool) []string {
	dir := "ASC"
	if desc {
		dir = "DESC"
	}
	if d.caps.NullsLast {
		return []string{expr + " " + dir + " NULLS LAST"}
	}
	return []string{"CASE WHEN " + expr + " IS NULL THEN 1 ELSE 0 END", expr + " " + dir}
}

// ApplyLimit keeps the first n rows of a statement that starts with
// SELECT: SELECT TOP (n) on SQL Server (§10), a LIMIT clause elsewhere.
// A statement that does not start with SELECT (a WITH ... query) is
// returned with the limit as a tail, or with an error on a TOP dialect,
// where TOP belongs in the final SELECT: pass that SELECT instead.
func ApplyLimit(d *Dialect, stmt string, n int) (string, error) {
	top, tail := d.Limit(n)
	if top != "" {
		rest, ok := strings.CutPrefix(stmt, "SELECT")
		if !ok {
			return "", fmt.Errorf("internal error: %s puts TOP in a SELECT; the statement starts with %.20q", d.Name(), stmt)
		}
		return "SELECT " + top + rest, nil
	}
	return stmt + "\n" + tail, nil
}

// IsPredicate reports whether e renders as a predicate (a comparison,
// and/or/not, in, is null, a boolean literal, or a derived column defined
// as one) rather than as a value. The two are one thing on every engine
// but SQL Server, which cannot select a predicate or test a value: the
// renderer puts d.BoolValue around a predicate where a value is due, and
// d.Truth around a boolean value where a predicate is due.
func IsPredicate(e model.Expr) bool {
	switch e := e.(type) {
	case *model.BinOp:
		switch e.Op {
		case "and", "or", "=", "<>", "<", "<=", ">", ">=":
			return true
		}
	case *model.UnOp:
		return e.Op == "not"
	case *model.InExpr, *model.IsNullExpr:
		return true
	case *model.Lit:
		return e.T == model.TypeBoolean
	case *model.ColRef:
		return e.Col.Derived != nil && IsPredicate(e.Col.Derived)
	}
	return false
}
