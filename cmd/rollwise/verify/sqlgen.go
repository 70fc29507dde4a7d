package verify

import (
	"context"
	"errors"
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner"
)

// This file turns wrong formulas into SQL. Formulas over measure
// expressions are planned and rendered by the planner and the dialect like
// any query. Formulas over rows (fan-out, dropped-unmatched) read a fact
// table through a relation of verify's own: a CTE that joins the fact rows
// the wrong way, which a copy of the model reads in place of the table's
// `at` relation.

// cells maps a cell key to the values of a result row, one per measure of
// the report (entries the variant does not compute are Null).
type cells map[string][]Value

// planSQL plans and renders a query.
func (v *verifier) planSQL(q *planner.Query) (string, error) {
	p, diags := planner.NewPlan(q)
	if diags.HasErrors() || p == nil {
		if errs := diags.Errors(); len(errs) > 0 {
			return "", errors.New(errs[0].Message)
		}
		return "", errors.New("the planner gave no plan")
	}
	return dialects.Render(p, v.in.Dialect)
}

// measureQuery is the report's query computing one measure with the
// expression e, under the given filters.
func (v *verifier) measureQuery(m *planner.Measure, e planner.Expr, filters []planner.Expr) *planner.Query {
	q := *v.in.Query
	q.Measures = []*planner.Measure{{Name: m.Name, Expr: e, Format: m.Format, Doc: m.Doc, Pos: m.Pos, Type: e.Type()}}
	q.Filters = filters
	return &q
}

// runCells runs SQL shaped as rollwise renders it, computing the measures
// at the given report positions, and reads its cells.
func (v *verifier) runCells(ctx context.Context, sql string, at []int) (cells, error) {
	res, err := v.run.Query(ctx, sql)
	if err != nil {
		return nil, err
	}
	names := make([]string, len(at))
	for i, j := range at {
		names[i] = v.names[j]
	}
	rows, err := readCells(res, v.n, names)
	if err != nil {
		return nil, err
	}
	out := cells{}
	for _, r := range rows {
		vals := make([]Value, len(v.names))
		for j := range vals {
			vals[j] = Null
		}
		for i, j := range at {
			vals[j] = r.vals[i]
		}
		out[cellKey(r.mask, r.keys)] = vals
	}
	return out, nil
}

// allMeasures lists every report position.
func (v *verifier) allMeasures() []int {
	at := make([]int, len(v.names))
	for i := range at {
		at[i] = i
	}
	return at
}

// rowsRelation picks a relation name no table of the model reads.
func (v *verifier) rowsRelation() string {
	taken := map[string]bool{}
	for _, t := range v.in.Model.Tables {
		taken[strings.ToLower(strings.Join(t.Relation, "."))] = true
		taken[strings.ToLower(t.Name)] = true
	}
	for i := 1; ; i++ {
		name := "rollwise_verify_rows"
		if i > 1 {
			name = fmt.Sprintf("%s_%d", name, i)
		}
		if !taken[name] {
			return name
		}
	}
}

// reload loads the model again from its sources, with table t reading
// relation rel.
func (v *verifier) reload(t *planner.Table, rel string) (*planner.Model, error) {
	if len(v.in.Sources) == 0 {
		return nil, errors.New("the model's sources are not at hand")
	}
	var files []*grammar.File
	found := false
	for _, s := range v.in.Sources {
		f, diags := grammar.Parse(s.Name, s.Text)
		if diags.HasErrors() || f == nil {
			return nil, fmt.Errorf("re-reading %s: %v", s.Name, diags.Err())
		}
		for _, td := range f.Tables {
			if td.Name.Name == t.Name {
				td.At = &grammar.StringLit{Pos: td.Pos, Value: rel}
				found = true
			}
		}
		files = append(files, f)
	}
	if !found {
		return nil, fmt.Errorf("table %s is not declared in the model's sources", t.Name)
	}
	m, diags := planner.Load(files)
	if diags.HasErrors() || m == nil {
		return nil, fmt.Errorf("re-reading the model: %v", diags.Err())
	}
	return m, nil
}

// throughRows runs the report's query with table t read from the rows
// that body (a SELECT of t's columns) returns.
func (v *verifier) throughRows(ctx context.Context, t *planner.Table, body string) (cells, error) {
	rel := v.rowsRelation()
	m, err := v.reload(t, rel)
	if err != nil {
		return nil, err
	}
	q, diags := m.NewQuery(planner.QuerySpec{Measures: v.names, By: v.in.Query.GroupNames,
		Where: v.in.Spec.Where, Totals: string(v.in.Query.Totals)})
	if diags.HasErrors() {
		return nil, fmt.Errorf("re-planning the query: %v", diags.Err())
	}
	sql, err := v.planSQL(q)
	if err != nil {
		return nil, err
	}
	return v.runCells(ctx, withCTE(sql, v.in.Dialect.Ident(rel), body), v.allMeasures())
}

// withCTE puts a CTE in front of a statement.
func withCTE(sql, name, body string) string {
	cte := name + " AS (\n" + body + "\n)"
	if rest, ok := strings.CutPrefix(sql, "WITH "); ok {
		return "WITH " + cte + ",\n" + rest
	}
	return "WITH " + cte + "\n" + sql
}

// relation is a table's quoted relation name.
func relation(d dialects.Dialect, t *planner.Table) string {
	parts := t.Relation
	if len(parts) == 0 {
		parts = []string{t.Name}
	}
	q := make([]string, len(parts))
	for i, p := range parts {
		q[i] = d.Ident(p)
	}
	return strings.Join(q, ".")
}

// joinedRows selects the columns of t's rows joined along path (links
// leading away from t, each with join kind pathJoin) and then, when fan
// is set, to the rows of fan.From whose link points at the path's last
// table (join kind fanJoin): one row per match, as a handwritten join
// does.
func joinedRows(d dialects.Dialect, t *planner.Table, path []*planner.Link, pathJoin string, fan *planner.Link, fanJoin string) string {
	q := d.Ident
	alias := map[*planner.Table]string{t: "t0"}
	var b strings.Builder
	b.WriteString("  SELECT " + q("t0") + ".*\n  FROM " + relation(d, t) + " AS " + q("t0"))
	on := func(from, to string, fc, tc []*planner.Column) string {
		var conds []string
		for i := range fc {
			conds = append(conds, q(from)+"."+q(fc[i].Name)+" = "+q(to)+"."+q(tc[i].Name))
		}
		return strings.Join(conds, " AND ")
	}
	for i, l := range path {
		a := fmt.Sprintf("t%d", i+1)
		b.WriteString(fmt.Sprintf("\n  %s JOIN %s AS %s ON %s", pathJoin, relation(d, l.To), q(a),
			on(alias[l.From], a, l.FromCols, l.ToCols)))
		alias[l.To] = a
	}
	if fan != nil {
		b.WriteString(fmt.Sprintf("\n  %s JOIN %s AS %s ON %s", fanJoin, relation(d, fan.From), q("u"),
			on("u", alias[fan.To], fan.FromCols, fan.ToCols)))
	}
	return b.String()
}

// perRowSQL wraps a query that computes measure name once per row of an
// iteration table (grouped by the report's groups and the table's key)
// into one that adds and averages those values in every cell of the
// report, over the report's grouping sets.
func (v *verifier) perRowSQL(inner, name string) (string, error) {
	d := v.in.Dialect
	q := d.Ident
	sets := v.in.Plan.Sets
	if len(sets) > 1 && !d.Caps().GroupingSets {
		return "", fmt.Errorf("%s has no grouping sets", d.Name())
	}
	var keys []string
	for _, g := range v.in.Query.GroupNames {
		keys = append(keys, q(g))
	}
	cols := append([]string{}, keys...)
	m := q(name)
	cols = append(cols, "sum("+m+") AS "+q("rollwise_sum"), "avg("+m+") AS "+q("rollwise_avg"),
		"count("+m+") AS "+q("rollwise_count"))
	grouping := "0"
	if len(keys) > 0 && len(sets) > 1 {
		grouping = "GROUPING(" + strings.Join(keys, ", ") + ")"
	}
	cols = append(cols, grouping+" AS "+q(dialects.GroupingColumn))
	sql := "SELECT\n  " + strings.Join(cols, ",\n  ") + "\nFROM (\n" + inner + "\n) AS " + q("rollwise_per_row")
	switch {
	case len(keys) == 0:
	case len(sets) == 1:
		sql += "\nGROUP BY " + strings.Join(keys, ", ")
	default:
		var parts []string
		for _, mask := range sets {
			var in []string
			for i, k := range keys {
				if mask&(1<<(len(keys)-1-i)) == 0 {
					in = append(in, k)
				}
			}
			parts = append(parts, "("+strings.Join(in, ", ")+")")
		}
		sql += "\nGROUP BY GROUPING SETS (" + strings.Join(parts, ", ") + ")"
	}
	return sql, nil
}

// refText writes a column as a --by reference, backquoting names that
// are not plain identifiers.
func refText(c *planner.Column) string {
	return identText(c.Table.Name) + "." + identText(c.Name)
}

func identText(s string) string {
	plain := s != ""
	for i, c := range s {
		plain = plain && (c == '_' || c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || i > 0 && c >= '0' && c <= '9')
	}
	if plain {
		return s
	}
	return "`" + s + "`"
}
