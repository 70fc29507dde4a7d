package verify

import (
	"context"
	"errors"
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/pipeline"
	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/planner/model"
)

// This file turns wrong formulas into SQL. Formulas over measure
// expressions are planned and rendered by the pipeline like any query.
// Formulas over rows (fan-out, dropped-unmatched) read a fact table
// through a relation of verify's own: a CTE that joins the fact rows the
// wrong way, which the model's table reads in place of its `at` relation
// while the query is planned (planSQLAt).

// cells maps a cell key to the values of a result row, one per measure of
// the report (entries the variant does not compute are Null).
type cells map[string][]Value

// planSQL plans and renders a query as every command does
// (pipeline.Render); the error of a query the planner refuses is its
// first error's message.
func (v *verifier) planSQL(q *model.Query) (string, error) {
	c, diags, err := pipeline.Render(v.in.Model, q, pipeline.Options{Dialect: v.in.Dialect})
	if errs := diags.Errors(); len(errs) > 0 {
		return "", errors.New(errs[0].Message)
	}
	if err != nil {
		return "", err
	}
	return c.SQL, nil
}

// measureQuery is the report's query computing one measure with the
// expression e, under the given filters.
func (v *verifier) measureQuery(m *model.Measure, e model.Expr, filters []model.Expr) *model.Query {
	q := *v.in.Query
	q.Measures = []*model.Measure{{Name: m.Name, Expr: e, Format: m.Format, Doc: m.Doc, Pos: m.Pos, Type: e.Type()}}
	q.Filters = filters
	return &q
}

// runCells runs SQL shaped as rollwise renders it, computing the measures
// at the given report positions, and reads its cells.
func (v *verifier) runCells(ctx context.Context, sql string, at []int) (cells, error) {
	res, err := v.run.Query(ctx, sql, nil)
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

// planSQLAt plans and renders q with table t read from relation rel:
// the model itself is rewritten, t pointed at rel, for as long as the
// planner and the renderer read it, then pointed back.
func (v *verifier) planSQLAt(q *model.Query, t *model.Table, rel string) (string, error) {
	old := t.Relation
	t.Relation = []string{rel}
	defer func() { t.Relation = old }()
	return v.planSQL(q)
}

// throughRows runs the report's query with table t read from the rows
// that body (a SELECT of t's columns) returns. With weight set, body also
// returns that column, the number of times each row is repeated, and the
// measures over t are computed as if every row were repeated that many
// times: sums and counts weighted, distinct counts, minimums and maximums
// unchanged. has marks the measures it computes: a median or a standard
// deviation cannot be weighted.
func (v *verifier) throughRows(ctx context.Context, t *model.Table, body, weight string) (cells, []bool, error) {
	rel := v.rowsRelation()
	q := *v.in.Query
	has := v.every()
	if weight != "" {
		// The weight is a column of the rows body returns, not of the
		// model's table: it exists only in this query.
		w := &model.Column{Table: t, Name: weight, Type: model.TypeInteger, Pos: t.Pos}
		var ms []*model.Measure
		for j, x := range q.Measures {
			e, ok := weighted(x, t, w)
			has[j] = ok
			ms = append(ms, &model.Measure{Name: x.Name, Expr: e, Format: x.Format, Doc: x.Doc, Pos: x.Pos, Type: e.Type()})
		}
		q.Measures = ms
	}
	sql, err := v.planSQLAt(&q, t, rel)
	if err != nil {
		return nil, nil, err
	}
	c, err := v.runCells(ctx, withCTE(sql, v.in.Dialect.Ident(rel), body), v.allMeasures())
	return c, has, err
}

// weighted rewrites the aggregates over t so that each row counts w times.
// ok is false when an aggregate cannot be weighted (median, stddev,
// variance).
func weighted(m *model.Measure, t *model.Table, w *model.Column) (model.Expr, bool) {
	ok := true
	e := rewrite(m.Expr, func(x model.Expr) model.Expr {
		a, isAgg := x.(*model.Agg)
		if !isAgg || a.Table != t {
			return x
		}
		wref := &model.ColRef{Pos: a.Pos, Col: w}
		zero := &model.Lit{Pos: a.Pos, T: model.TypeInteger, Text: "0"}
		// weightIf is w where arg is not NULL.
		weightIf := func(arg model.Expr) model.Expr {
			return &model.CaseExpr{Pos: a.Pos, T: model.TypeInteger, Whens: []model.WhenArm{{
				Cond: &model.IsNullExpr{Pos: a.Pos, X: arg, Not: true}, Then: wref}}}
		}
		sum := func(arg model.Expr, t model.Type) *model.Agg {
			c := *a
			c.Func, c.Distinct, c.Arg, c.T = "sum", false, arg, t
			return &c
		}
		orZero := func(e model.Expr) model.Expr {
			return &model.Func{Pos: a.Pos, Name: "coalesce", Args: []model.Expr{e, zero}, T: model.TypeInteger}
		}
		switch {
		case a.Distinct || a.Func == "min" || a.Func == "max":
			return x
		case a.Func == "count" && a.Arg == nil:
			return orZero(sum(wref, model.TypeInteger))
		case a.Func == "count":
			return orZero(sum(weightIf(a.Arg), model.TypeInteger))
		case a.Func == "sum":
			return sum(&model.BinOp{Pos: a.Pos, Op: "*", L: a.Arg, R: wref, T: a.Arg.Type()}, a.T)
		case a.Func == "avg":
			num := sum(&model.BinOp{Pos: a.Pos, Op: "*", L: a.Arg, R: wref, T: a.Arg.Type()}, a.Arg.Type())
			return &model.BinOp{Pos: a.Pos, Op: "/", L: num, R: sum(weightIf(a.Arg), model.TypeInteger), T: model.TypeFloat}
		}
		ok = false
		return x
	})
	return e, ok
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
func relation(d *dialects.Dialect, t *model.Table) string {
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
// leading away from t, each with join kind join), as a handwritten query
// that inner-joins its dimensions does.
func joinedRows(d *dialects.Dialect, t *model.Table, path []*model.Link, join string) string {
	b, _ := pathJoins(d, t, path, join)
	return "  SELECT " + d.Ident("t0") + ".*\n" + b
}

// fannedRows selects the columns of t's rows, joined along path, with one
// more column, weight: how many rows of fan.From point at the path's last
// table through the link fan. A join to fan.From would repeat each row
// that many times; with join INNER, rows without any are dropped, and
// with LEFT they count once. Each pair of also adds a condition between a
// column of fan.From and one of t (a join on store and day).
func fannedRows(d *dialects.Dialect, t *model.Table, path []*model.Link, fan *model.Link, also []columnPair, join, weight string) string {
	q := d.Ident
	b, alias := pathJoins(d, t, path, "LEFT")
	var keys, conds []string
	for i, c := range fan.FromCols {
		keys = append(keys, q(c.Name))
		conds = append(conds, q("u")+"."+q(c.Name)+" = "+q(alias[fan.To])+"."+q(fan.ToCols[i].Name))
	}
	for _, p := range also {
		keys = append(keys, q(p.fan.Name))
		conds = append(conds, q("u")+"."+q(p.fan.Name)+" = "+q("t0")+"."+q(p.row.Name))
	}
	w := q("u") + "." + q("rollwise_n")
	if join == "LEFT" {
		w = "COALESCE(" + w + ", 1)"
	}
	return "  SELECT " + q("t0") + ".*, " + w + " AS " + q(weight) + "\n" + b +
		fmt.Sprintf("\n  %s JOIN (SELECT %s, count(*) AS %s FROM %s GROUP BY %s) AS %s ON %s",
			join, strings.Join(keys, ", "), q("rollwise_n"), relation(d, fan.From), strings.Join(keys, ", "), q("u"),
			strings.Join(conds, " AND "))
}

// pathJoins writes the FROM clause of t joined along path, and the alias
// of each table.
func pathJoins(d *dialects.Dialect, t *model.Table, path []*model.Link, join string) (string, map[*model.Table]string) {
	q := d.Ident
	alias := map[*model.Table]string{t: "t0"}
	var b strings.Builder
	b.WriteString("  FROM " + relation(d, t) + " AS " + q("t0"))
	for i, l := range path {
		a := fmt.Sprintf("t%d", i+1)
		var conds []string
		for k := range l.FromCols {
			conds = append(conds, q(alias[l.From])+"."+q(l.FromCols[k].Name)+" = "+q(a)+"."+q(l.ToCols[k].Name))
		}
		b.WriteString(fmt.Sprintf("\n  %s JOIN %s AS %s ON %s", join, relation(d, l.To), q(a), strings.Join(conds, " AND ")))
		alias[l.To] = a
	}
	return b.String(), alias
}

// perRowSQL wraps a query that computes measure name once per row of an
// iteration table (grouped by the report's groups and the table's key)
// into one that adds and averages those values in every cell of the
// report, over the report's grouping sets as the renderer spells them in
// the dialect (dialects.GroupingSetsSQL), with the grouping column last.
func (v *verifier) perRowSQL(inner, name string) string {
	d := v.in.Dialect
	q := d.Ident
	var keys []string
	for _, g := range v.in.Query.GroupNames {
		keys = append(keys, q(g))
	}
	m := q(name)
	aggs := []string{"sum(" + m + ") AS " + q("rollwise_sum"), "avg(" + m + ") AS " + q("rollwise_avg"),
		"count(" + m + ") AS " + q("rollwise_count")}
	cells := dialects.GroupingSetsSQL(d, keys, v.in.Plan.Sets, aggs, "(\n"+inner+"\n) AS "+q("rollwise_per_row"))
	cols := append(append([]string{}, keys...), q("rollwise_sum"), q("rollwise_avg"), q("rollwise_count"), q(dialects.GroupingColumn))
	return "SELECT " + strings.Join(cols, ", ") + "\nFROM (\n" + cells + "\n) AS " + q("rollwise_cells")
}

// refText writes a column as a --by reference, backquoting names that
// are not plain identifiers.
func refText(c *model.Column) string {
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
