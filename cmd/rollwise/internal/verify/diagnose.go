package verify

import (
	"context"
	"fmt"
	"slices"
	"sort"
	"strings"

	"github.com/shopspring/decimal"

	"github.com/rollwise/rollwise/planner/model"
)

// variant is a wrong formula computed on the data: its value in every
// cell where it has one.
type variant struct {
	name   string
	detail string
	// has marks the measures (report positions) the variant computes.
	has   []bool
	cells cells
	// perCell holds a cell-specific explanation, keyed by cell key and
	// measure position (see detailKey).
	perCell map[string]string
	// rows says how the variant changes the rows of the report: +1 when
	// it can add rows (a filter not applied), -1 when it can drop rows
	// (an inner join), 0 when it keeps them.
	rows int
}

func detailKey(cell string, j int) string { return fmt.Sprintf("%s\x1e%d", cell, j) }

// priority orders the diagnoses when several formulas give the same value:
// mistakes in what rows are read come before mistakes in how they are
// combined.
var priority = map[string]int{
	FilterIgnored: 1, FilterLeaked: 2, DroppedUnmatched: 3, FanOut: 4, ProductOfSums: 5,
	SumOfDistinctCounts: 6, SumOfRatios: 7, AverageOfRatios: 8, NullAsZero: 9,
}

// diagnose computes the wrong formulas that could explain what differs
// and names, for each difference and each row found on one side only,
// the first that fits.
func (v *verifier) diagnose(ctx context.Context) error {
	rep := v.rep
	if len(rep.Differences) == 0 && len(rep.SQLOnly) == 0 && len(rep.RollwiseOnly) == 0 {
		return nil
	}
	var vs []*variant
	vs = append(vs, v.queryFilterVariants(ctx)...)
	vs = append(vs, v.joinVariants(ctx)...)
	seen := map[int]bool{}
	for _, d := range rep.Differences {
		j := v.measureIndex(d.Measure)
		if !seen[j] {
			seen[j] = true
			vs = append(vs, v.measureVariants(ctx, j)...)
		}
	}
	if err := ctx.Err(); err != nil {
		return err
	}
	sort.SliceStable(vs, func(a, b int) bool { return priority[vs[a].name] < priority[vs[b].name] })
	// Every formula that fits an item, then the one to name: the formula
	// that fits the most items overall (one mistake usually shows in
	// several places; a coincidence rarely does), in priority order on a
	// tie.
	var diffFits, sqlFits, rwFits [][]fit
	score := map[string]int{}
	count := func(fs []fit) {
		seen := map[string]bool{}
		for _, f := range fs {
			for _, k := range []string{f.name, f.id} {
				if !seen[k] {
					seen[k] = true
					score[k]++
				}
			}
		}
	}
	for i := range rep.Differences {
		diffFits = append(diffFits, v.differenceFits(&rep.Differences[i], vs))
		count(diffFits[i])
	}
	for i := range rep.SQLOnly {
		sqlFits = append(sqlFits, v.sqlOnlyFits(&rep.SQLOnly[i], vs))
		count(sqlFits[i])
	}
	for i := range rep.RollwiseOnly {
		rwFits = append(rwFits, v.rollwiseOnlyFits(&rep.RollwiseOnly[i], vs))
		count(rwFits[i])
	}
	for i := range rep.Differences {
		d := &rep.Differences[i]
		d.Diagnosis, d.Explanation, d.AlsoFits = choose(diffFits[i], score)
	}
	for i := range rep.SQLOnly {
		u := &rep.SQLOnly[i]
		u.Diagnosis, u.Explanation, _ = choose(sqlFits[i], score)
	}
	for i := range rep.RollwiseOnly {
		u := &rep.RollwiseOnly[i]
		u.Diagnosis, u.Explanation, _ = choose(rwFits[i], score)
	}
	return nil
}

// fit is a formula that reproduces what the SQL shows; id tells the
// variants of one formula apart (an inner or a left join).
type fit struct{ name, id, detail string }

// choose picks the fit whose formula, then whose variant, fits the most
// items (the first on a tie) and lists the other formulas that fit.
func choose(fs []fit, score map[string]int) (name, detail string, also []string) {
	best := -1
	for i, f := range fs {
		b := fit{}
		if best >= 0 {
			b = fs[best]
		}
		if best < 0 || score[f.name] > score[b.name] || score[f.name] == score[b.name] && score[f.id] > score[b.id] {
			best = i
		}
	}
	if best < 0 {
		return "", "", nil
	}
	for _, f := range fs {
		if f.name != fs[best].name && !contains(also, f.name) {
			also = append(also, f.name)
		}
	}
	return fs[best].name, fs[best].detail, also
}

func (v *verifier) measureIndex(name string) int {
	for j, n := range v.names {
		if n == name {
			return j
		}
	}
	return -1
}

// note records a remark once.
func (v *verifier) note(format string, args ...any) {
	v.rep.Notes = appendOnce(v.rep.Notes, fmt.Sprintf(format, args...))
}

// differenceFits lists the formulas that give the SQL's value.
func (v *verifier) differenceFits(d *Difference, vs []*variant) []fit {
	j := v.measureIndex(d.Measure)
	key := cellKey(v.maskOf(d.Row), d.Row.Keys)
	tol := v.rep.Tolerance
	var out []fit
	for _, x := range vs {
		if j < 0 || !x.has[j] {
			continue
		}
		val, ok := x.cells[key]
		if !ok || !Agree(val[j], d.SQL, tol) || Agree(val[j], d.Rollwise, tol) {
			continue
		}
		detail := x.detail
		if s, ok := x.perCell[detailKey(key, j)]; ok {
			detail = s
		}
		out = append(out, fit{x.name, x.name + "\x00" + x.detail, fmt.Sprintf("%s, which gives %s", detail, val[j])})
	}
	if d.Rollwise.Null && d.SQL.isZero() {
		out = append(out, fit{NullAsZero, NullAsZero, "rollwise has no value in this cell (no rows, or only NULLs, to aggregate) and the SQL shows 0, as COALESCE(..., 0) or a zero-filled join does"})
	}
	return out
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// maskOf is the mask of a known row.
func (v *verifier) maskOf(id RowID) uint64 {
	var mask uint64
	for _, name := range id.RolledUp {
		for i, g := range v.in.Query.GroupNames {
			if g == name {
				mask |= 1 << (v.n - 1 - i)
			}
		}
	}
	return mask
}

// sqlOnlyFits lists the formulas that add the row with the SQL's
// values.
func (v *verifier) sqlOnlyFits(u *Unmatched, vs []*variant) []fit {
	var keys []string
	if u.Row.Known {
		keys = []string{cellKey(v.maskOf(u.Row), u.Row.Keys)}
	} else {
		var pattern uint64
		for i, k := range u.Row.Keys {
			if k == nil {
				pattern |= 1 << (v.n - 1 - i)
			}
		}
		for _, s := range v.in.Plan.Sets {
			if s&^pattern == 0 {
				keys = append(keys, cellKey(s, u.Row.Keys))
			}
		}
	}
	var out []fit
	for _, x := range vs {
		if x.rows <= 0 {
			continue
		}
		for _, key := range keys {
			vals, ok := x.cells[key]
			if !ok {
				continue
			}
			all := true
			for j := range v.names {
				all = all && x.has[j] && Agree(vals[j], u.Values[j], v.rep.Tolerance)
			}
			if all {
				out = append(out, fit{x.name, x.name + "\x00" + x.detail, "rollwise gives this row, with these values, when " + x.detail})
				break
			}
		}
	}
	return out
}

// rollwiseOnlyFits lists the formulas that lose the row.
func (v *verifier) rollwiseOnlyFits(u *Unmatched, vs []*variant) []fit {
	key := cellKey(v.maskOf(u.Row), u.Row.Keys)
	var out []fit
	for _, x := range vs {
		if x.rows >= 0 || x.cells == nil {
			continue
		}
		if _, ok := x.cells[key]; !ok {
			out = append(out, fit{x.name, x.name + "\x00" + x.detail, "the row disappears when " + x.detail})
		}
	}
	return out
}

// queryFilterVariants: the report's --where conjuncts not applied, one at
// a time and all together.
func (v *verifier) queryFilterVariants(ctx context.Context) []*variant {
	fs := v.in.Query.Filters
	var out []*variant
	try := func(keep []model.Expr, detail string) {
		q := *v.in.Query
		q.Filters = keep
		sql, err := v.planSQL(&q)
		if err == nil {
			var c cells
			if c, err = v.runCells(ctx, sql, v.allMeasures()); err == nil {
				out = append(out, &variant{name: FilterIgnored, detail: detail, has: v.every(), cells: c, rows: +1})
				return
			}
		}
		v.note("could not compute %s (%s): %v", FilterIgnored, detail, err)
	}
	for i, f := range fs {
		keep := append(append([]model.Expr{}, fs[:i]...), fs[i+1:]...)
		try(keep, fmt.Sprintf("the query filter `%s` is not applied", bare(f)))
	}
	if len(fs) > 1 {
		try(nil, "none of the query filters is applied")
	}
	return out
}

func (v *verifier) every() []bool {
	has := make([]bool, len(v.names))
	for i := range has {
		has[i] = true
	}
	return has
}

func (v *verifier) only(j int) []bool {
	has := make([]bool, len(v.names))
	has[j] = true
	return has
}

// joinVariants: for each table the measures iterate over, the report
// computed with that table's rows joined the wrong way: repeated by a
// table that links to a table they reach (fan-out), or cut by an inner
// join along a link they follow (dropped-unmatched).
func (v *verifier) joinVariants(ctx context.Context) []*variant {
	var tables []*model.Table
	for _, m := range v.measures {
		for _, t := range iterationTables(m) {
			if !containsTable(tables, t) {
				tables = append(tables, t)
			}
		}
	}
	var out []*variant
	try := func(t *model.Table, name, detail, body, weight string, rows int) {
		c, has, err := v.throughRows(ctx, t, body, weight)
		if err != nil {
			v.note("could not compute %s (%s): %v", name, detail, err)
			return
		}
		out = append(out, &variant{name: name, detail: detail, has: has, cells: c, rows: rows})
	}
	d := v.in.Dialect
	for _, t := range tables {
		reach := model.Reach(t)
		onPath := map[*model.Link]bool{}
		for _, p := range reach {
			for _, l := range p {
				onPath[l] = true
			}
		}
		weight := weightColumn(t)
		for _, u := range v.in.Model.Tables {
			for _, l := range u.Links {
				path, ok := reach[l.To]
				if u == t || onPath[l] || !ok {
					continue
				}
				for _, also := range alsoMatched(t, u, l) {
					on := l.String()
					for _, p := range also {
						on += " and " + p.String()
					}
					for _, kind := range []string{"INNER", "LEFT"} {
						detail := fmt.Sprintf("each %s row is repeated once per matching %s row (%s join of %s on %s)",
							t.Name, u.Name, map[string]string{"INNER": "an inner", "LEFT": "a left"}[kind], u.Name, on)
						rows := 0
						if kind == "INNER" {
							rows = -1
						}
						try(t, FanOut, detail, fannedRows(d, t, path, l, also, kind, weight), weight, rows)
					}
				}
			}
		}
		for _, l := range v.followedLinks(t, reach) {
			detail := fmt.Sprintf("%s rows whose link %s finds no match are dropped, as an inner join does", t.Name, l)
			try(t, DroppedUnmatched, detail, joinedRows(d, t, reach[l.To], "INNER"), "", -1)
		}
	}
	return out
}

// columnPair is a column of a fanning table matched with a column of the
// fact table's rows, beside the link (shifts.day = tills.day).
type columnPair struct{ fan, row *model.Column }

func (p columnPair) String() string { return p.fan.String() + " = " + p.row.String() }

// alsoMatched lists the ways handwritten SQL may join u to t's rows: along
// link l alone, or along l and one more pair of columns of the same name
// and type that neither table uses as its key (a join on store and day).
// Each way is a fan-out that repeats t's rows by a different count.
func alsoMatched(t, u *model.Table, l *model.Link) [][]columnPair {
	out := [][]columnPair{nil}
	for _, cu := range u.Columns {
		if !cu.Stored() || slices.Contains(l.FromCols, cu) || slices.Contains(u.Key, cu) {
			continue
		}
		ct := t.Column(cu.Name)
		if ct == nil || !ct.Stored() || ct.Type != cu.Type || slices.Contains(t.Key, ct) {
			continue
		}
		out = append(out, []columnPair{{fan: cu, row: ct}})
	}
	return out
}

// weightColumn picks a column name t does not have.
func weightColumn(t *model.Table) string {
	for i := 1; ; i++ {
		name := "rollwise_repeat"
		if i > 1 {
			name = fmt.Sprintf("%s_%d", name, i)
		}
		if t.Column(name) == nil {
			return name
		}
	}
}

func containsTable(list []*model.Table, t *model.Table) bool {
	for _, x := range list {
		if x == t {
			return true
		}
	}
	return false
}

// followedLinks lists the links rollwise follows from t for the report:
// towards the tables of its groups, its filters and the columns its
// aggregates over t read.
func (v *verifier) followedLinks(t *model.Table, reach map[*model.Table][]*model.Link) []*model.Link {
	var cols []*model.Column
	for _, g := range v.in.Query.Groups {
		cols = append(cols, g)
		if g.Derived != nil {
			cols = append(cols, model.Columns(g.Derived)...)
		}
	}
	for _, f := range v.in.Query.Filters {
		cols = append(cols, model.Columns(f)...)
	}
	for _, m := range v.measures {
		model.Walk(inline(m), func(x model.Expr) bool {
			if a, ok := x.(*model.Agg); ok && a.Table == t && a.Arg != nil {
				cols = append(cols, model.Columns(a.Arg)...)
			}
			return true
		})
	}
	var out []*model.Link
	for _, c := range cols {
		for _, l := range reach[c.Table] {
			if !containsLink(out, l) {
				out = append(out, l)
			}
		}
	}
	return out
}

func containsLink(list []*model.Link, l *model.Link) bool {
	for _, x := range list {
		if x == l {
			return true
		}
	}
	return false
}

// measureVariants: the wrong formulas of one measure.
func (v *verifier) measureVariants(ctx context.Context, j int) []*variant {
	m := v.measures[j]
	var out []*variant
	var fs []formula
	fs = append(fs, narrowingIgnored(m)...)
	fs = append(fs, filterLeaked(m)...)
	fs = append(fs, productOfSums(m)...)
	fs = append(fs, nullAsZero(m)...)
	for _, f := range fs {
		sql, err := v.planSQL(v.measureQuery(m, f.expr, v.in.Query.Filters))
		var c cells
		if err == nil {
			c, err = v.runCells(ctx, sql, []int{j})
		}
		if err != nil {
			v.note("could not compute %s for %s (%s): %v", f.name, m.Name, f.detail, err)
			continue
		}
		out = append(out, &variant{name: f.name, detail: f.detail, has: v.only(j), cells: c})
	}
	switch ratioKind(m) {
	case "ratio":
		out = append(out, v.overDetailRows(j, SumOfRatios, false)...)
		out = append(out, v.overDetailRows(j, AverageOfRatios, true)...)
		out = append(out, v.perRowVariants(ctx, j)...)
	case "distinct":
		out = append(out, v.overDetailRows(j, SumOfDistinctCounts, false)...)
	}
	return out
}

// overDetailRows adds (or averages) measure j's values over the detail
// rows each total row covers, as a handwritten rollup over a detail
// query does: once over rollwise's detail values and once over the SQL's
// own detail rows (which catches a total that adds rows already wrong).
func (v *verifier) overDetailRows(j int, name string, avg bool) []*variant {
	var comp []resultRow
	for _, r := range v.comp {
		if r.mask == 0 {
			comp = append(comp, r)
		}
	}
	return []*variant{v.overRows(j, name, avg, comp, ""), v.overRows(j, name, avg, v.sqlDetail(), " as the SQL shows them")}
}

// sqlDetail lists the SQL's detail rows: those known to be detail rows,
// matched with rollwise detail rows, or without any NULL group value.
func (v *verifier) sqlDetail() []resultRow {
	matched := map[int]bool{}
	for ci, hi := range v.pairs {
		if v.comp[ci].mask == 0 {
			matched[hi] = true
		}
	}
	var out []resultRow
	for hi, r := range v.hw.rows {
		noNull := true
		for _, k := range r.keys {
			noNull = noNull && k != nil
		}
		if matched[hi] || r.known && r.mask == 0 || !r.known && noNull {
			out = append(out, r)
		}
	}
	return out
}

// overRows computes, for each rollwise total row, the sum or average of
// measure j over the given detail rows in its cell.
func (v *verifier) overRows(j int, name string, avg bool, detail []resultRow, whose string) *variant {
	x := &variant{name: name, detail: "over the rows of the total" + whose, has: v.only(j), cells: cells{}, perCell: map[string]string{}}
	for _, r := range v.comp {
		if r.mask == 0 {
			continue
		}
		var vals []Value
		for _, d := range detail {
			if sameCell(r, d, v.n) && !d.vals[j].Null {
				vals = append(vals, d.vals[j])
			}
		}
		if len(vals) == 0 {
			continue
		}
		sum, total := addUp(vals)
		res, verb := sum, "adds"
		if avg {
			res, verb = floatValue(total/float64(len(vals))), "averages"
			if sum.Exact {
				f, _ := sum.Dec.DivRound(decimal.NewFromInt(int64(len(vals))), 20).Float64()
				res = floatValue(f)
			}
		}
		key := cellKey(r.mask, r.keys)
		out := make([]Value, len(v.names))
		out[j] = res
		x.cells[key] = out
		x.perCell[detailKey(key, j)] = fmt.Sprintf("the total %s %s over the %d rows it covers%s (%s)",
			verb, v.names[j], len(vals), whose, listValues(vals))
	}
	return x
}

// sameCell reports whether detail row d lies in total row r's cell.
func sameCell(r, d resultRow, n int) bool {
	for i := 0; i < n; i++ {
		if r.mask&(1<<(n-1-i)) == 0 && keyText(r.keys[i]) != keyText(d.keys[i]) {
			return false
		}
	}
	return true
}

// addUp sums values exactly when they are all exact, and as floats too.
func addUp(vals []Value) (Value, float64) {
	exact := true
	dec := decimal.Zero
	f := 0.0
	for _, x := range vals {
		exact = exact && x.Exact
		if x.Exact {
			dec = dec.Add(x.Dec)
		}
		f += x.F
	}
	if exact {
		return exactValue(dec), f
	}
	return floatValue(f), f
}

// listValues shows a few values.
func listValues(vals []Value) string {
	var parts []string
	for i, x := range vals {
		if i == 5 && len(vals) > 6 {
			parts = append(parts, fmt.Sprintf("... %d more", len(vals)-5))
			break
		}
		parts = append(parts, x.String())
	}
	return strings.Join(parts, ", ")
}

// perRowVariants: a ratio computed on each row of its iteration table and
// then added or averaged in each cell (AVG(price) for a weighted average
// price, SUM of per-row rates).
func (v *verifier) perRowVariants(ctx context.Context, j int) []*variant {
	m := v.measures[j]
	tables := iterationTables(m)
	if len(tables) != 1 || len(tables[0].Key) == 0 {
		return nil
	}
	t := tables[0]
	by := append([]string{}, v.in.Query.GroupNames...)
	for _, k := range t.Key {
		for _, g := range v.in.Query.Groups {
			if g == k {
				return nil // the report is already at the row grain
			}
		}
		by = append(by, refText(k))
	}
	q, diags := v.in.Model.NewQuery(model.Request{Measures: []string{m.Name}, By: by, Where: v.in.Spec.Where, Totals: "none"})
	if diags.HasErrors() {
		v.note("could not compute the per-row %s of %s: %v", m.Name, t.Name, diags.Err())
		return nil
	}
	inner, err := v.planSQL(q)
	var rows []resultRow
	if err == nil {
		res, qerr := v.run.Query(ctx, v.perRowSQL(inner, m.Name), nil)
		err = qerr
		if qerr == nil {
			rows, err = readCells(res, v.n, []string{"rollwise_sum", "rollwise_avg", "rollwise_count"})
		}
	}
	if err != nil {
		v.note("could not compute the per-row %s of %s: %v", m.Name, t.Name, err)
		return nil
	}
	sum := &variant{name: SumOfRatios, detail: "per " + t.Name + " row", has: v.only(j), cells: cells{}, perCell: map[string]string{}}
	avg := &variant{name: AverageOfRatios, detail: "per " + t.Name + " row", has: v.only(j), cells: cells{}, perCell: map[string]string{}}
	for _, r := range rows {
		key := cellKey(r.mask, r.keys)
		s, a := make([]Value, len(v.names)), make([]Value, len(v.names))
		s[j], a[j] = r.vals[0], r.vals[1]
		sum.cells[key], avg.cells[key] = s, a
		n := r.vals[2].String()
		sum.perCell[detailKey(key, j)] = fmt.Sprintf("%s is computed on each of the %s %s rows of the cell and added up", m.Name, n, t.Name)
		avg.perCell[detailKey(key, j)] = fmt.Sprintf("%s is computed on each of the %s %s rows of the cell and averaged", m.Name, n, t.Name)
	}
	return []*variant{sum, avg}
}
