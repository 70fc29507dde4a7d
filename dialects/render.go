package dialects

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
)

// GroupingColumn is the name of the result column that tells total rows
// apart: a bit mask of the rolled-up groups, as SQL's GROUPING(g1, ..., gn)
// computes it (the last group is the lowest bit; 0 on detail rows).
const GroupingColumn = "grouping_id"

// Render prints a plan as one SQL statement for the dialect, exactly.
func Render(p *plan.Plan, d *Dialect) (string, error) {
	sql, _, err := RenderWith(p, d, Options{})
	return sql, err
}

// Options are the choices of one rendering that are not the dialect's.
type Options struct {
	// Approximate allows the dialect to answer approximately what it
	// cannot answer exactly, or only slowly (the user's --approximate): a
	// median by the engine's approximate median aggregate where it has no
	// exact one (Render computes it exactly with window functions
	// otherwise), a function the engine computes differently.
	Approximate bool
}

// RenderWith prints a plan as one SQL statement for the dialect with the
// options. caution says what is approximate when the statement uses an
// approximation ("" when it is exact), so that the output can say so.
func RenderWith(p *plan.Plan, d *Dialect, o Options) (sql, caution string, err error) {
	r := &renderer{p: p, d: d, approximate: o.Approximate, names: map[string]bool{}, cte: map[*plan.Rel]string{},
		keyRel: map[*plan.Context]string{}, froms: map[*plan.Context]fromClause{}, rename: map[string]string{},
		rows: map[string][]*sharedRows{}, derived: map[*model.Table]*derivedRel{}}
	spelled := map[string]string{}
	for _, o := range p.Outputs {
		spelled[o.Name] = o.Name
	}
	if err := r.renameKeys(p.Root, spelled); err != nil {
		return "", "", err
	}
	sql, err = r.render()
	return sql, strings.Join(r.notes, "; "), err
}

type renderer struct {
	p *plan.Plan
	d *Dialect
	// approximate is Options.Approximate; notes say what was approximated.
	approximate bool
	notes       []string
	names       map[string]bool
	ctes        []string
	// cte names the CTE holding each relation's cells; keyRel the CTE
	// holding each context's rows.
	cte    map[*plan.Rel]string
	keyRel map[*plan.Context]string
	// froms holds each context's FROM clause, built once its CTEs are.
	froms map[*plan.Context]fromClause
	// ctx is the context whose expressions are being rendered.
	ctx *plan.Context
	// iter is the iteration table of the scan being rendered; found are
	// the tables its inner joins reach, which every row finds.
	iter  *model.Table
	found map[*model.Table]bool
	// rename spells key columns for dialects that need it (columnName).
	rename map[string]string
	// rows holds the rows CTEs of each FROM clause (see rowsOf).
	rows map[string][]*sharedRows
	// layer is the layering whose later layers are being rendered, or nil.
	layer *layering
	// derived holds each table's CTE of shared derived columns (nil when
	// it has none); useDerived those the scan being rendered reads.
	derived    map[*model.Table]*derivedRel
	useDerived map[*model.Table]*derivedRel
}

func (r *renderer) q(name string) string {
	if n, ok := r.rename[name]; ok {
		name = n
	}
	return r.d.Ident(name)
}

// renameKeys spells every key column of the plan as the dialect needs.
// Two names the dialect would spell alike (plants.family and
// plants__family on BigQuery) are refused: the SQL could not tell them
// apart, nor a key spelled as a measure is named. spelled maps each
// spelling to the name it stands for.
func (r *renderer) renameKeys(ctx *plan.Context, spelled map[string]string) error {
	if r.d.columnName == nil {
		return nil
	}
	for _, k := range ctx.Keys {
		n := r.d.columnName(k.Name)
		if prev, ok := spelled[n]; ok && prev != k.Name {
			return &UnsupportedError{Dialect: r.d.Name(), Construct: fmt.Sprintf("both %s and %s", prev, k.Name),
				Hint: fmt.Sprintf("its column names hold letters, digits and _ only, and both are spelled %s; rename one of them", n)}
		}
		spelled[n] = k.Name
		r.rename[k.Name] = n
	}
	for _, rel := range ctx.Rels {
		if rel.Per != nil {
			if err := r.renameKeys(rel.Per.Sub, spelled); err != nil {
				return err
			}
		}
	}
	return nil
}

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

func (r *renderer) addCTE(name, body string) {
	r.ctes = append(r.ctes, r.cteSQL(name, body))
}

// cteSQL is one entry of the WITH list: name AS (body).
func (r *renderer) cteSQL(name, body string) string {
	return r.q(name) + " AS (\n" + body + "\n)"
}

func (r *renderer) render() (string, error) {
	q := r.p.Query
	root := r.p.Root
	if err := r.context(root); err != nil {
		return "", err
	}
	r.ctx = root
	var exprs []model.Expr
	var names []string
	for _, o := range r.p.Outputs {
		exprs = append(exprs, o.Expr)
		names = append(names, o.Name)
	}
	values, err := r.layers(root, exprs, names)
	if err != nil {
		return "", err
	}
	from, single := r.from(root)
	var cols []string
	for _, k := range root.Keys {
		cols = append(cols, r.keyCol(root, k.Name))
	}
	for i, o := range r.p.Outputs {
		if e := values[i]; e == r.q(o.Name) {
			cols = append(cols, e)
		} else {
			cols = append(cols, e+" AS "+r.q(o.Name))
		}
	}
	cols = append(cols, r.keyCol(root, GroupingColumn))
	body := "SELECT\n  " + strings.Join(cols, ",\n  ") + "\nFROM " + from
	if len(r.p.Order) == 0 && q.Limit == 0 {
		order := r.orderBy(single)
		sql := "WITH " + strings.Join(r.ctes, ",\n") + "\n" + body
		if len(order) > 0 {
			sql += "\nORDER BY " + strings.Join(order, ", ")
		}
		return sql, nil
	}
	return r.sorted(body)
}

// context renders the CTEs of every relation of ctx, and of its key
// relation.
func (r *renderer) context(ctx *plan.Context) error {
	var ranges []*plan.Rel
	for _, rel := range ctx.Rels {
		var err error
		switch {
		case rel.Scan != nil && rel.Scan.Range != nil && rel.Scan.Range.Cells != nil:
			// the cells of an outer context, rendered before this one
			err = r.rangeScan(rel.Scan.Range.Cells, rel)
		case rel.Scan != nil && rel.Scan.Range != nil, rel.Per != nil && rel.Per.AfterCells:
			// after the context's rows, which its cells are
			ranges = append(ranges, rel)
		case rel.Scan != nil:
			err = r.scan(ctx, rel)
		case rel.Window != nil:
			// spelled inline where it is used (see window)
		case rel.Shift != nil:
			// after its source's cells
			ranges = append(ranges, rel)
		default:
			err = r.per(ctx, rel)
		}
		if err != nil {
			return err
		}
	}
	if len(ctx.Bases) == 1 {
		r.keyRel[ctx] = r.cte[ctx.Bases[0]]
	} else {
		name := r.cteName(prefix(ctx.Name, "cells"))
		var parts []string
		for _, b := range ctx.Bases {
			cols := []string{r.q(GroupingColumn)}
			for _, k := range ctx.Keys {
				cols = append(cols, r.q(k.Name))
			}
			parts = append(parts, "  SELECT "+strings.Join(cols, ", ")+" FROM "+r.q(r.cte[b]))
		}
		r.addCTE(name, strings.Join(parts, "\n  UNION\n"))
		r.keyRel[ctx] = name
	}
	for _, rel := range ranges {
		if err := r.later(ctx, rel); err != nil {
			return err
		}
	}
	r.froms[ctx] = r.joinRels(ctx)
	return nil
}

func prefix(ctx, name string) string {
	if ctx == "" {
		return name
	}
	return ctx + "_" + name
}

// fromClause is a context's FROM clause. single reports that there is
// only the key relation, whose columns need no qualifier.
type fromClause struct {
	sql    string
	single bool
}

// from is ctx's FROM clause (and whether it is single), as context built
// it: every expression of ctx asks for it.
func (r *renderer) from(ctx *plan.Context) (string, bool) {
	f := r.froms[ctx]
	return f.sql, f.single
}

// joinRels joins every relation of ctx to its key relation.
func (r *renderer) joinRels(ctx *plan.Context) fromClause {
	key := r.q(r.keyRel[ctx])
	from := key
	joined := 0
	for _, rel := range ctx.Rels {
		name := r.cte[rel]
		if name == r.keyRel[ctx] || rel.Window != nil || rel.Feeds {
			continue
		}
		joined++
		from += "\n  LEFT JOIN " + r.q(name) + " ON " + r.joinOn(ctx, key, rel)
	}
	return fromClause{sql: from, single: joined == 0 && len(ctx.Bases) == 1}
}

// joinOn is the condition that joins rel's cells to ctx's rows (key is
// the quoted key relation).
func (r *renderer) joinOn(ctx *plan.Context, key string, rel *plan.Rel) string {
	c := r.q(r.cte[rel])
	var conds []string
	if len(rel.Sets) > 1 {
		conds = append(conds, c+"."+r.q(GroupingColumn)+" = "+r.gidMap(ctx, rel, key+"."+r.q(GroupingColumn)))
	}
	for _, i := range rel.Keys {
		k := r.q(ctx.Keys[i].Name)
		conds = append(conds, r.d.NullSafeEqual(c+"."+k, key+"."+k))
	}
	if len(conds) == 0 {
		conds = []string{"1 = 1"}
	}
	return strings.Join(conds, "\n    AND ")
}

// gidMap spells the relation's grouping id for the context's grouping id.
func (r *renderer) gidMap(ctx *plan.Context, rel *plan.Rel, gid string) string {
	identity := true
	for _, s := range ctx.Sets {
		identity = identity && rel.GidOf[s] == s
	}
	if identity {
		return gid
	}
	b := append(make([]byte, 0, len(gid)+16*len(ctx.Sets)+9), "CASE "+gid...)
	for _, set := range ctx.Sets {
		b = strconv.AppendUint(append(b, " WHEN "...), set, 10)
		b = strconv.AppendUint(append(b, " THEN "...), rel.GidOf[set], 10)
	}
	return string(append(b, " END"...))
}

// keyCol is a key column (or the grouping column) of ctx's rows.
func (r *renderer) keyCol(ctx *plan.Context, name string) string {
	if _, single := r.from(ctx); single {
		return r.q(name)
	}
	return r.q(r.keyRel[ctx]) + "." + r.q(name)
}

// orderBy sorts rows by the group values, NULLs last, each total row after
// its group; with --order, detail rows first, by the keys in turn.
func (r *renderer) orderBy(plain bool) []string {
	q := r.p.Query
	col := func(name string) string {
		if plain {
			return r.q(name)
		}
		return r.keyCol(r.p.Root, name)
	}
	gid := col(GroupingColumn)
	var out []string
	if len(r.p.Order) > 0 && len(r.p.Sets) > 1 {
		out = append(out, "CASE WHEN "+gid+" = 0 THEN 0 ELSE 1 END")
	}
	keyed := map[string]bool{}
	for _, k := range r.p.Order {
		if k.Output != nil {
			out = append(out, OrderKey(r.d, r.q(k.Output.Name), k.Desc)...)
		} else {
			out = append(out, OrderKey(r.d, col(k.Group), k.Desc)...)
			keyed[k.Group] = true
		}
	}
	n := len(q.Groups)
	for i, g := range q.GroupNames {
		if len(r.p.Sets) > 1 {
			out = append(out, r.d.BitAnd(gid, fmt.Sprint(uint64(1)<<(n-1-i))))
		}
		if !keyed[g] {
			out = append(out, OrderKey(r.d, col(g), false)...)
		}
	}
	return out
}

// scan renders a scan's rows CTE (group values and aggregate inputs of
// each row that passes the filters) and cells CTE (the aggregates in every
// cell of its grouping sets).
func (r *renderer) scan(ctx *plan.Context, rel *plan.Rel) error {
	s := rel.Scan
	rowsName, col, err := r.scanRows(rel)
	if err != nil {
		return err
	}
	from, medians, err := r.scanMedians(rel, rowsName, col)
	if err != nil {
		return err
	}
	var aggs []cellAgg
	for _, l := range s.Leaves {
		if m, ok := medians[l]; ok {
			aggs = append(aggs, m)
			continue
		}
		a, err := r.leafAgg(l, "", col)
		if err != nil {
			return err
		}
		aggs = append(aggs, cellAgg{sql: a})
	}
	var keys []string
	for _, k := range s.Keys {
		keys = append(keys, r.q(k.Name))
	}
	r.cte[rel] = r.cteName(rel.Name + "_cells")
	r.addCTE(r.cte[rel], groupingSets(r.d, keys, rel.Sets, aggs, from))
	return nil
}

// leafAgg spells a scan's aggregate over its rows CTE, whose columns col
// names (qualified by from when set).
func (r *renderer) leafAgg(l *plan.Leaf, from string, col func(string) string) (string, error) {
	arg := ""
	if l.Arg != nil {
		arg = from + r.q(col(l.Arg.Name))
	}
	filter := ""
	if l.Filter != nil {
		filter = r.d.Truth(from + r.q(col(l.Filter.Name)))
	}
	a, err := r.filteredAgg(l.Func, l.Distinct, arg, filter)
	return a + " AS " + r.q(l.Name), err
}

// scanRows renders a scan's rows CTE (group values and aggregate inputs of
// each row that passes the filters): its name, and the names of its
// columns.
func (r *renderer) scanRows(rel *plan.Rel) (string, func(string) string, error) {
	s := rel.Scan
	r.iter, r.found = s.Table, map[*model.Table]bool{}
	defer func() { r.iter, r.found = nil, nil }()
	for _, l := range s.Joins {
		r.found[l.To] = s.Inner[l]
	}
	use, err := r.derivedSources(s)
	if err != nil {
		return "", nil, err
	}
	r.useDerived = use
	defer func() { r.useDerived = nil }()
	var cols []rowCol
	for _, k := range s.Keys {
		e, err := r.value(k.RowExpr())
		if err != nil {
			return "", nil, err
		}
		cols = append(cols, rowCol{name: k.Name, expr: e, key: true})
	}
	for _, in := range s.Inputs {
		e, err := r.value(in.Expr)
		if err != nil {
			return "", nil, err
		}
		c, ok := in.Expr.(*model.ColRef)
		cols = append(cols, rowCol{name: in.Name, expr: e, computed: !ok || !c.Col.Stored()})
	}
	rows := "\n  FROM " + r.source(s.Table) + " AS " + r.q(s.Table.Name)
	for _, l := range s.Joins {
		var conds []string
		for i := range l.FromCols {
			from := r.q(l.From.Name) + "." + r.q(l.FromCols[i].Name)
			if m, moved := r.p.Moves[l]; moved {
				// a copy of a calendar, joined on the moved date (back)
				from = r.moveBy(from, m.N, m.Unit, l.FromCols[i].Type)
			}
			conds = append(conds, from+" = "+r.q(l.To.Name)+"."+r.q(l.ToCols[i].Name))
		}
		join := "LEFT JOIN"
		if s.Inner[l] {
			join = "JOIN"
		}
		rows += "\n  " + join + " " + r.source(l.To) + " AS " + r.q(l.To.Name) + " ON " + strings.Join(conds, " AND ")
	}
	if len(s.Where) > 0 {
		var conds []string
		for _, w := range s.Where {
			e, err := r.pred(w)
			if err != nil {
				return "", nil, err
			}
			conds = append(conds, e)
		}
		rows += "\n  WHERE " + strings.Join(conds, "\n    AND ")
	}
	name, col := r.rowsOf(rel.Name, rows, len(s.Joins) > 0, cols)
	return name, col, nil
}

// per renders a per-grain relation: its sub-context's CTEs, a CTE with
// the sub-context's values per group, and the aggregate of those values
// back at the relation's keys.
func (r *renderer) per(ctx *plan.Context, rel *plan.Rel) error {
	sub := rel.Per.Sub
	if err := r.context(sub); err != nil {
		return err
	}
	outer := r.ctx
	r.ctx = sub
	var exprs []model.Expr
	var names []string
	for _, v := range sub.Values {
		exprs = append(exprs, v.Expr)
		names = append(names, v.Name)
	}
	values, err := r.layers(sub, exprs, names)
	if err != nil {
		return err
	}
	from, _ := r.from(sub)
	var cols []string
	for _, k := range sub.Keys {
		cols = append(cols, r.keyCol(sub, k.Name))
	}
	cols = append(cols, r.keyCol(sub, GroupingColumn))
	for _, l := range rel.Per.Leaves {
		if ext, ok := extremeOf[l.Func]; ok {
			// latest, earliest: the per key's latest (earliest) value among
			// the groups of each cell of the relation.
			part := []string{r.keyCol(sub, GroupingColumn)}
			for j := range rel.Keys {
				part = append(part, r.keyCol(sub, sub.Keys[j].Name))
			}
			cols = append(cols, ext+"("+r.keyCol(sub, l.PerKeys[0].Name)+") OVER (PARTITION BY "+strings.Join(part, ", ")+") AS "+r.q(l.Name+"_at"))
		}
	}
	for i, v := range sub.Values {
		cols = append(cols, values[i]+" AS "+r.q(v.Name))
	}
	r.ctx = outer
	groups := r.cteName(sub.Name + "_groups")
	r.addCTE(groups, "  SELECT\n    "+strings.Join(cols, ",\n    ")+"\n  FROM "+strings.ReplaceAll(from, "\n", "\n  "))

	var keys []string
	for _, i := range rel.Keys {
		keys = append(keys, r.q(ctx.Keys[i].Name))
	}
	conds := map[*plan.PerLeaf]string{}
	for _, l := range rel.Per.Leaves {
		var cond []string
		for _, pk := range l.PerKeys {
			cond = append(cond, r.q(pk.Name)+" IS NOT NULL")
		}
		if l.Having != nil {
			cond = append(cond, r.d.Truth(r.q(l.Having.Name)))
		}
		if _, ok := extremeOf[l.Func]; ok {
			// the one group whose per key is the cell's latest (earliest)
			cond = append(cond, r.q(l.PerKeys[0].Name)+" = "+r.q(l.Name+"_at"))
		}
		conds[l] = strings.Join(cond, " AND ")
	}
	groupCols := []string{GroupingColumn}
	for _, k := range sub.Keys {
		groupCols = append(groupCols, k.Name)
	}
	for _, v := range sub.Values {
		groupCols = append(groupCols, v.Name)
	}
	for _, l := range rel.Per.Leaves {
		if _, ok := extremeOf[l.Func]; ok {
			groupCols = append(groupCols, l.Name+"_at")
		}
	}
	from, medians, err := r.perMedians(rel, groups, groupCols, conds, keys)
	if err != nil {
		return err
	}
	var aggs []string
	for _, l := range rel.Per.Leaves {
		a, ok := medians[l]
		if !ok {
			arg := ""
			if l.Value != nil {
				arg = r.q(l.Value.Name)
			}
			fn := l.Func
			if _, ok := extremeOf[fn]; ok {
				fn = "max"
			}
			var err error
			if a, err = r.filteredAgg(fn, false, arg, conds[l]); err != nil {
				return err
			}
		}
		aggs = append(aggs, a+" AS "+r.q(l.Name))
	}
	cols = append(append([]string{}, keys...), r.q(GroupingColumn))
	cols = append(cols, aggs...)
	body := "  SELECT\n    " + strings.Join(cols, ",\n    ") + "\n  FROM " + from +
		"\n  GROUP BY " + strings.Join(append([]string{r.q(GroupingColumn)}, keys...), ", ")
	r.cte[rel] = r.cteName(rel.Name)
	r.addCTE(r.cte[rel], body)
	return nil
}

// extremeOf maps the per-grain aggregates of time edits (`D = latest`,
// `D = earliest`) to the window function that finds their group.
var extremeOf = map[string]string{"latest": "MAX", "earliest": "MIN"}

// window spells an edited aggregate as a window over the context's own
// cells (the base scan's cells are the context's rows): each cell's value
// combines the cells of its grouping set that share the keys the edit
// keeps; for a window time edit, those of its period (to date) that come
// no later by the time key (NULL keys apart), NULL where E is NULL.
func (r *renderer) window(ctx *plan.Context, w *plan.WindowRel, column string) (string, error) {
	col := func(name string) string {
		if _, single := r.from(ctx); single {
			return r.q(name)
		}
		return r.q(r.keyRel[ctx]) + "." + r.q(name)
	}
	part := []string{col(GroupingColumn)}
	for _, i := range w.Partition {
		part = append(part, col(ctx.Keys[i].Name))
	}
	order := ""
	if t := w.Time; t != nil {
		key := ctx.Keys[t.Order]
		at := col(key.Name)
		if t.Kind == model.EditToDate {
			part = append(part, r.d.DateTrunc(t.Unit, at, key.Col.Type))
		} else {
			part = append(part, "CASE WHEN "+at+" IS NULL THEN 1 ELSE 0 END")
		}
		order = " ORDER BY " + at + " RANGE BETWEEN UNBOUNDED PRECEDING AND CURRENT ROW"
	}
	for _, p := range w.Parts {
		if p.Name != column {
			continue
		}
		sql := p.Func + "(" + col(p.Source) + ") OVER (PARTITION BY " + strings.Join(part, ", ") + order + ")"
		if w.Time == nil {
			return sql, nil
		}
		e, err := r.expr(w.Time.E)
		return "CASE WHEN " + e + " IS NOT NULL THEN " + sql + " END", err
	}
	return "", fmt.Errorf("internal error: no window column %s", column)
}

func (r *renderer) relation(t *model.Table) string {
	var parts []string
	for _, p := range t.Relation {
		parts = append(parts, r.q(p))
	}
	return strings.Join(parts, ".")
}
