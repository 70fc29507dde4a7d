package dialects

import (
	"fmt"
	"slices"
	"sort"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// RowQuery is the row-level query of a table: every row of its relation,
// once, with its stored columns and its derived columns computed.
type RowQuery struct {
	// SQL selects the table's columns in declaration order.
	SQL string
	// Columns are the table's columns, in the order SQL selects them.
	Columns []*model.Column
	// Joins are the links the derived columns follow, nearest first.
	Joins []*model.Link
	// Caution says what is approximate, where Options.Approximate let a
	// derived column be ("" when every column is exact).
	Caution string
}

// RenderRows renders the row-level query of table t. Derived columns are
// computed exactly as Render computes them in a query's scan; those that
// read other tables do so through LEFT JOINs along the links that lead
// there. Every link is many-to-one, so each row of t is kept and kept once
// (a row whose link finds nothing reads NULL for that table's columns).
func RenderRows(t *model.Table, d *Dialect, o Options) (*RowQuery, error) {
	joins, err := rowJoins(t)
	if err != nil {
		return nil, err
	}
	r := &renderer{d: d, approximate: o.Approximate}
	var cols []string
	for _, c := range t.Columns {
		if c.Stored() {
			cols = append(cols, r.q(t.Name)+"."+r.q(c.Name))
			continue
		}
		e, err := r.expr(c.Derived)
		if err != nil {
			return nil, fmt.Errorf("derived column %s: %w", c, err)
		}
		cols = append(cols, e+" AS "+r.q(c.Name))
	}
	sql := "SELECT\n  " + strings.Join(cols, ",\n  ") + "\nFROM " + r.relation(t) + " AS " + r.q(t.Name)
	for _, l := range joins {
		var conds []string
		for i := range l.FromCols {
			conds = append(conds, r.q(l.From.Name)+"."+r.q(l.FromCols[i].Name)+" = "+r.q(l.To.Name)+"."+r.q(l.ToCols[i].Name))
		}
		sql += "\n  LEFT JOIN " + r.relation(l.To) + " AS " + r.q(l.To.Name) + " ON " + strings.Join(conds, " AND ")
	}
	return &RowQuery{SQL: sql, Columns: t.Columns, Joins: joins, Caution: strings.Join(r.notes, "; ")}, nil
}

// rowJoins lists the links t's derived columns follow, nearest first (so
// each join reads only tables joined before it), ties by table name.
func rowJoins(t *model.Table) ([]*model.Link, error) {
	reach := model.Reach(t)
	var links []*model.Link
	for _, c := range t.Columns {
		if c.Stored() {
			continue
		}
		for _, used := range model.Columns(c.Derived) {
			path, ok := reach[used.Table]
			if !ok {
				return nil, fmt.Errorf("derived column %s reads %s, and no link leads from %s to %s",
					c, used, t.Name, used.Table.Name)
			}
			for _, l := range path {
				if !slices.Contains(links, l) {
					links = append(links, l)
				}
			}
		}
	}
	depth := func(l *model.Link) int { return len(reach[l.To]) }
	sort.SliceStable(links, func(i, j int) bool {
		if depth(links[i]) != depth(links[j]) {
			return depth(links[i]) < depth(links[j])
		}
		return links[i].To.Name < links[j].To.Name
	})
	return links, nil
}

// UnmatchedRows is the statement that counts the rows of l's table whose
// link l finds no row of its target (a NULL link column finds none): 0
// where a link declared required keeps its promise.
func UnmatchedRows(l *model.Link, d *Dialect) string {
	r := &renderer{d: d}
	from, to := r.q("source"), r.q("target")
	var conds []string
	for i := range l.FromCols {
		conds = append(conds, from+"."+r.q(l.FromCols[i].Name)+" = "+to+"."+r.q(l.ToCols[i].Name))
	}
	return "SELECT count(*) FROM " + r.relation(l.From) + " AS " + from +
		" LEFT JOIN " + r.relation(l.To) + " AS " + to + " ON " + strings.Join(conds, " AND ") +
		" WHERE " + to + "." + r.q(l.ToCols[0].Name) + " IS NULL"
}

// RepeatedRows are the statements that find the values of cols that occur
// on more than one row of t's relation: Count selects how many such
// values there are and how many rows hold them (0 and NULL where every
// value is on one row at most); Example selects the most repeated one
// (its columns, then its number of rows). A key that a table declares,
// or a semiadditive column's key and date, must occur once.
func RepeatedRows(t *model.Table, cols []*model.Column, d *Dialect) (count, example string, err error) {
	r := &renderer{d: d}
	var names []string
	for _, c := range cols {
		names = append(names, r.q(c.Name))
	}
	group := " FROM " + r.relation(t) + " GROUP BY " + strings.Join(names, ", ") + " HAVING count(*) > 1"
	count = "SELECT count(*), sum(" + r.q("n") + ") FROM (SELECT count(*) AS " + r.q("n") + group + ") AS " + r.q("repeated")
	example, err = ApplyLimit(d, "SELECT "+strings.Join(names, ", ")+", count(*)"+group+
		" ORDER BY count(*) DESC, "+strings.Join(names, ", "), 1)
	return count, example, err
}
