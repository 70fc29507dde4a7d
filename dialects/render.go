package dialects

import (
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/planner"
)

// GroupingColumn is the name of the result column that tells total rows
// apart: a bit mask of the rolled-up groups, as SQL's GROUPING(g1, ..., gn)
// computes it (the last group is the lowest bit; 0 on detail rows).
const GroupingColumn = "grouping_id"

// Render prints a plan as one SQL statement for the dialect.
func Render(p *planner.Plan, d Dialect) (string, error) {
	r := &renderer{p: p, d: d, names: map[string]bool{}}
	return r.render()
}

type renderer struct {
	p     *planner.Plan
	d     Dialect
	b     strings.Builder
	names map[string]bool
	// cells maps each scan to its grouped CTE's name.
	cells map[*planner.Scan]string
	// keys is the CTE that lists every cell when several scans are joined.
	keys  string
	multi bool
}

func (r *renderer) q(name string) string { return r.d.Ident(name) }

// cteName picks a CTE name that no relation of the model uses.
func (r *renderer) cteName(base string) string {
	rel := map[string]bool{}
	for _, s := range r.p.Scans {
		rel[strings.Join(s.Table.Relation, ".")] = true
		for _, l := range s.Joins {
			rel[strings.Join(l.To.Relation, ".")] = true
		}
	}
	for i := 1; ; i++ {
		cand := base
		if i > 1 {
			cand = fmt.Sprintf("%s_%d", base, i)
		}
		if !rel[cand] && !r.names[cand] {
			r.names[cand] = true
			return cand
		}
	}
}

func (r *renderer) render() (string, error) {
	q := r.p.Query
	if !r.d.Caps().GroupingSets && len(r.p.Sets) > 1 {
		return "", &UnsupportedError{Dialect: r.d.Name(), Construct: "grouping sets (total rows)",
			Hint: "ask for --totals none"}
	}
	r.cells = map[*planner.Scan]string{}
	r.multi = len(r.p.Scans) > 1
	var ctes []string
	for _, s := range r.p.Scans {
		rows, err := r.rowsCTE(s)
		if err != nil {
			return "", err
		}
		rowsName := r.cteName(s.Name + "_rows")
		ctes = append(ctes, r.q(rowsName)+" AS (\n"+rows+"\n)")
		cells, err := r.cellsCTE(s, rowsName)
		if err != nil {
			return "", err
		}
		r.cells[s] = r.cteName(s.Name + "_cells")
		ctes = append(ctes, r.q(r.cells[s])+" AS (\n"+cells+"\n)")
	}
	from := r.q(r.cells[r.p.Scans[0]])
	keyTable := from
	if r.multi {
		keys := r.cteName("cells")
		r.keys = keys
		var parts []string
		for _, s := range r.p.Scans {
			parts = append(parts, "  SELECT "+r.keyList("")+" FROM "+r.q(r.cells[s]))
		}
		ctes = append(ctes, r.q(keys)+" AS (\n"+strings.Join(parts, "\n  UNION\n")+"\n)")
		keyTable = r.q(keys)
		from = keyTable
		for _, s := range r.p.Scans {
			c := r.q(r.cells[s])
			conds := []string{c + "." + r.q(GroupingColumn) + " = " + keyTable + "." + r.q(GroupingColumn)}
			for _, g := range q.GroupNames {
				conds = append(conds, r.d.NullSafeEqual(c+"."+r.q(g), keyTable+"."+r.q(g)))
			}
			from += "\n  LEFT JOIN " + c + " ON " + strings.Join(conds, "\n    AND ")
		}
	}
	var cols []string
	for _, g := range q.GroupNames {
		cols = append(cols, r.qual(keyTable, g))
	}
	for _, o := range r.p.Outputs {
		e, err := r.expr(o.Expr)
		if err != nil {
			return "", err
		}
		if e == r.q(o.Name) || e == r.qual(from, o.Name) && !r.multi {
			cols = append(cols, e)
		} else {
			cols = append(cols, e+" AS "+r.q(o.Name))
		}
	}
	cols = append(cols, r.qual(keyTable, GroupingColumn))
	order := r.orderBy()
	body := "SELECT\n  " + strings.Join(cols, ",\n  ") + "\nFROM " + from
	if q.Limit > 0 {
		rank := "ROW_NUMBER() OVER (PARTITION BY " + r.qual(keyTable, GroupingColumn) + " ORDER BY " + strings.Join(order, ", ") + ") AS " + r.q("detail_rank")
		resName := r.cteName("result")
		inner := strings.Replace(body, "\nFROM ", ",\n  "+rank+"\nFROM ", 1)
		ctes = append(ctes, r.q(resName)+" AS (\n  "+strings.ReplaceAll(inner, "\n", "\n  ")+"\n)")
		var outCols []string
		for _, g := range q.GroupNames {
			outCols = append(outCols, r.q(g))
		}
		for _, o := range r.p.Outputs {
			outCols = append(outCols, r.q(o.Name))
		}
		outCols = append(outCols, r.q(GroupingColumn))
		body = "SELECT\n  " + strings.Join(outCols, ",\n  ") + "\nFROM " + r.q(resName) +
			"\nWHERE " + r.q(GroupingColumn) + " <> 0 OR " + r.q("detail_rank") + " <= " + fmt.Sprint(q.Limit)
		order = r.orderByNames()
	}
	sql := "WITH " + strings.Join(ctes, ",\n") + "\n" + body
	if len(order) > 0 {
		sql += "\nORDER BY " + strings.Join(order, ", ")
	}
	return sql, nil
}

func (r *renderer) qual(table, col string) string {
	if !r.multi {
		return r.q(col)
	}
	return table + "." + r.q(col)
}

func (r *renderer) keyList(prefix string) string {
	cols := []string{prefix + r.q(GroupingColumn)}
	for _, g := range r.p.Query.GroupNames {
		cols = append(cols, prefix+r.q(g))
	}
	return strings.Join(cols, ", ")
}

// orderBy sorts rows by the group values, NULLs last, each total row after
// its group; with --order, detail rows first, by the measure.
func (r *renderer) orderBy() []string {
	q := r.p.Query
	gid := r.qual(r.keyTableName(), GroupingColumn)
	var out []string
	if r.p.OrderBy != nil {
		if len(r.p.Sets) > 1 {
			out = append(out, "CASE WHEN "+gid+" = 0 THEN 0 ELSE 1 END")
		}
		dir := "ASC"
		if q.Desc {
			dir = "DESC"
		}
		out = append(out, r.q(r.p.OrderBy.Name)+" "+dir+r.nullsLast())
	}
	n := len(q.Groups)
	for i, g := range q.GroupNames {
		if len(r.p.Sets) > 1 {
			out = append(out, r.d.BitAnd(gid, fmt.Sprint(uint64(1)<<(n-1-i))))
		}
		out = append(out, r.qual(r.keyTableName(), g)+" ASC"+r.nullsLast())
	}
	return out
}

// orderByNames is orderBy over the result CTE's plain column names.
func (r *renderer) orderByNames() []string {
	multi := r.multi
	r.multi = false
	defer func() { r.multi = multi }()
	return r.orderBy()
}

func (r *renderer) keyTableName() string {
	if r.multi {
		return r.q(r.keys)
	}
	return ""
}

func (r *renderer) nullsLast() string {
	if r.d.Caps().NullsLast {
		return " NULLS LAST"
	}
	return ""
}

// rowsCTE selects, for each row of the scan's table that passes the
// filters, its group values and the inputs of its aggregates.
func (r *renderer) rowsCTE(s *planner.Scan) (string, error) {
	q := r.p.Query
	var cols []string
	for i, g := range q.Groups {
		e, err := r.expr(&planner.ColRef{Col: g})
		if err != nil {
			return "", err
		}
		cols = append(cols, e+" AS "+r.q(q.GroupNames[i]))
	}
	for _, in := range s.Inputs {
		e, err := r.expr(in.Expr)
		if err != nil {
			return "", err
		}
		cols = append(cols, e+" AS "+r.q(in.Name))
	}
	if len(cols) == 0 {
		cols = append(cols, "1 AS "+r.q("one"))
	}
	sql := "  SELECT\n    " + strings.Join(cols, ",\n    ") + "\n  FROM " + r.relation(s.Table) + " AS " + r.q(s.Table.Name)
	for _, l := range s.Joins {
		var conds []string
		for i := range l.FromCols {
			conds = append(conds, r.q(l.From.Name)+"."+r.q(l.FromCols[i].Name)+" = "+r.q(l.To.Name)+"."+r.q(l.ToCols[i].Name))
		}
		sql += "\n  LEFT JOIN " + r.relation(l.To) + " AS " + r.q(l.To.Name) + " ON " + strings.Join(conds, " AND ")
	}
	if len(s.Where) > 0 {
		var conds []string
		for _, w := range s.Where {
			e, err := r.expr(w)
			if err != nil {
				return "", err
			}
			conds = append(conds, e)
		}
		sql += "\n  WHERE " + strings.Join(conds, "\n    AND ")
	}
	return sql, nil
}

func (r *renderer) relation(t *planner.Table) string {
	var parts []string
	for _, p := range t.Relation {
		parts = append(parts, r.q(p))
	}
	return strings.Join(parts, ".")
}

// cellsCTE aggregates the scan's rows in every cell of the grouping sets.
func (r *renderer) cellsCTE(s *planner.Scan, rows string) (string, error) {
	q := r.p.Query
	var keys []string
	for _, g := range q.GroupNames {
		keys = append(keys, r.q(g))
	}
	cols := append([]string{}, keys...)
	switch {
	case len(keys) > 0 && len(r.p.Sets) > 1:
		cols = append(cols, "GROUPING("+strings.Join(keys, ", ")+") AS "+r.q(GroupingColumn))
	default:
		cols = append(cols, "0 AS "+r.q(GroupingColumn))
	}
	for _, l := range s.Leaves {
		arg := ""
		if l.Arg != nil {
			arg = r.q(l.Arg.Name)
		}
		if l.Func == "median" && !r.d.Caps().ExactMedian {
			return "", &UnsupportedError{Dialect: r.d.Name(), Construct: "an exact median"}
		}
		if l.Filter != nil && !r.d.Caps().FilterClause {
			if arg == "" {
				arg = "1"
			}
			arg = "CASE WHEN " + r.q(l.Filter.Name) + " THEN " + arg + " END"
		}
		a, err := r.d.Agg(l.Func, l.Distinct, arg)
		if err != nil {
			return "", err
		}
		if l.Filter != nil && r.d.Caps().FilterClause {
			a += " FILTER (WHERE " + r.q(l.Filter.Name) + ")"
		}
		cols = append(cols, a+" AS "+r.q(l.Name))
	}
	sql := "  SELECT\n    " + strings.Join(cols, ",\n    ") + "\n  FROM " + r.q(rows)
	switch {
	case len(keys) == 0:
	case len(r.p.Sets) == 1:
		sql += "\n  GROUP BY " + strings.Join(keys, ", ")
	default:
		var sets []string
		n := len(keys)
		for _, mask := range r.p.Sets {
			var in []string
			for i, k := range keys {
				if mask&(1<<(n-1-i)) == 0 {
					in = append(in, k)
				}
			}
			sets = append(sets, "("+strings.Join(in, ", ")+")")
		}
		sql += "\n  GROUP BY GROUPING SETS (" + strings.Join(sets, ", ") + ")"
	}
	return sql, nil
}
