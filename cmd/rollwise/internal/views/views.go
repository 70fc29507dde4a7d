// Package views turns a model into views for the warehouse, so that
// derived columns and measures are computed once, in the data source, for
// every consumer:
//
//   - a row-level view for each table with derived columns: the table's
//     stored columns and its derived ones, with LEFT JOINs along the links
//     the derived columns follow, so that every row of the table appears
//     exactly once;
//   - a measure view for each view block: its group columns and measures,
//     computed by the same planner and renderer as `rollwise run`, with
//     total rows where the block asks for them and a grouping column
//     (dialects.GroupingColumn) that tells them apart.
//
// Generate builds the views of a model; Set.Script prints them as one DDL
// script; Set.Files lays them out as one file per view plus a manifest;
// Write puts those files in a folder atomically and Check compares a
// folder with them.
package views

import (
	"fmt"
	"slices"
	"sort"
	"strings"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/pipeline"
	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
)

// Kind says what a view computes.
type Kind string

// The kinds of view.
const (
	// RowLevel views expose a table's rows with its derived columns.
	RowLevel Kind = "row-level"
	// Measures views compute the measures of a view block.
	Measures Kind = "measures"
)

// RowViewSuffix ends the name of a table's row-level view: the row-level
// view of table sales is sales_derived.
const RowViewSuffix = "_derived"

// Column is one column of a view.
type Column struct {
	Name string `json:"name"`
	// Type is the rollwise type of the column's values (integer, decimal,
	// float, text, date, timestamp, boolean). Each engine picks the width:
	// DuckDB sums integers as HUGEINT, for example.
	Type string `json:"type"`
	// From says where the values come from: "sales.qty" (a stored
	// column), "sales.line_total = ..." (a derived one), "group
	// plants.family", "measure revenue", or "grouping".
	From string `json:"from"`
}

// View is one generated view.
type View struct {
	// Name is the view's name; QualifiedName adds the schema if any.
	Name          string
	QualifiedName []string
	Kind          Kind
	// Source names what the view publishes: "table sales" or "view block
	// family_month".
	Source string
	// Reads lists the relations the view reads (schema.name), sorted.
	Reads   []string
	Columns []Column
	// Statements create or replace the view (no trailing semicolons).
	Statements []string
	// Text is the view's DDL with a header that lists its columns: the
	// content of its file.
	Text string
	// File is the name of its file in an --out folder.
	File string
}

// Options are the choices of `rollwise views`.
type Options struct {
	// Schema, if set, is the schema the views are created in (split at
	// dots, as `at` relations are); it must exist. Otherwise the views are created in the connection's current
	// schema.
	Schema string
	// Approximate lets a view compute approximately what the dialect
	// cannot compute exactly (as `rollwise run --approximate`); each view
	// that does says so in its header and in a caution.
	Approximate bool
}

// Set is the generated views of a model, in creation order: every view
// after the views it reads.
type Set struct {
	Dialect string
	Schema  string
	Views   []*View
	// Cautions are things the reader of the numbers should know, each
	// naming its view.
	Cautions []string
}

// Generate builds the views of model m for dialect d. Every problem is a
// diagnostic: a view block the planner cannot plan yet, a construct the
// dialect cannot express, two views with one name, views that read each
// other in a circle.
func Generate(m *model.Model, d *dialects.Dialect, o Options) (*Set, grammar.Diagnostics) {
	var diags grammar.Diagnostics
	var schema []string
	if o.Schema != "" {
		schema = strings.Split(o.Schema, ".")
		if slices.Contains(schema, "") {
			diags.Errorf(grammar.Pos{File: "--schema"}, "usage", "%q is not a schema name", o.Schema).
				Suggestion = "write a name such as analytics, or catalog.schema"
			return nil, diags
		}
	}
	g := &generator{d: d, approximate: o.Approximate, schema: schema, set: &Set{Dialect: d.Name(), Schema: o.Schema}}
	for _, t := range m.Tables {
		if hasDerived(t) {
			g.rowView(t, &diags)
		}
	}
	for _, v := range m.Views {
		g.measureView(m, v, &diags)
	}
	if diags.HasErrors() {
		return nil, diags
	}
	g.checkNames(&diags)
	if diags.HasErrors() {
		return nil, diags
	}
	if !g.order(&diags) {
		return nil, diags
	}
	g.fileNames()
	for _, v := range g.set.Views {
		script, err := dialects.Script(d, v.Statements)
		if err != nil {
			diags.Errorf(g.pos[v], "unsupported", "view %s: %v", v.Name, err)
			continue
		}
		v.Text = g.header[v] + script
	}
	if diags.HasErrors() {
		return nil, diags
	}
	return g.set, diags
}

// generator holds what Generate builds on the way.
type generator struct {
	d           *dialects.Dialect
	approximate bool
	// schema is the --schema name split at dots.
	schema []string
	set    *Set
	// pos and header are each view's declaration and file header.
	pos    map[*View]grammar.Pos
	header map[*View]string
}

func hasDerived(t *model.Table) bool {
	for _, c := range t.Columns {
		if !c.Stored() {
			return true
		}
	}
	return false
}

// add names view v in the schema and adds it to the set; pos is where
// its table or view block is declared.
func (g *generator) add(v *View, pos grammar.Pos) {
	if g.pos == nil {
		g.pos, g.header = map[*View]grammar.Pos{}, map[*View]string{}
	}
	v.QualifiedName = append(slices.Clone(g.schema), v.Name)
	g.set.Views = append(g.set.Views, v)
	g.pos[v] = pos
}

// rowView builds the row-level view of table t.
func (g *generator) rowView(t *model.Table, diags *grammar.Diagnostics) {
	rq, err := dialects.RenderRows(t, g.d, dialects.Options{Approximate: g.approximate})
	if err != nil {
		diags.Errorf(t.Pos, "unpublishable", "cannot publish the derived columns of table %s: %v", t.Name, err)
		return
	}
	v := &View{Name: t.Name + RowViewSuffix, Kind: RowLevel, Source: "table " + t.Name}
	reads := []string{relationText(t)}
	for _, l := range rq.Joins {
		reads = append(reads, relationText(l.To))
	}
	v.Reads = sortedUnique(reads)
	var names []string
	for _, c := range rq.Columns {
		from := c.String()
		if !c.Stored() {
			from += " = " + model.Text(c.Derived)
		}
		v.Columns = append(v.Columns, Column{Name: c.Name, Type: c.Type.String(), From: from})
		names = append(names, c.Name)
	}
	if dup := duplicateColumn(v.Columns); dup != "" {
		diags.Errorf(t.Pos, "name-clash", "table %s has two columns called %s, which engines that ignore case cannot tell apart", t.Name, dup)
		return
	}
	g.add(v, t.Pos)
	v.Statements, err = dialects.CreateView(g.d, v.QualifiedName, names, nil, rq.SQL)
	if err != nil {
		diags.Errorf(t.Pos, "unsupported", "table %s: %v", t.Name, err)
		return
	}
	var lines []string
	lines = append(lines, "Row-level view of table "+t.Name+": each of its rows once, with its derived columns.")
	if len(rq.Joins) > 0 {
		var ls []string
		for _, l := range rq.Joins {
			ls = append(ls, l.String())
		}
		lines = append(lines, "Derived columns read other tables through LEFT JOINs along: "+strings.Join(ls, "; ")+".")
	}
	if rq.Caution != "" {
		lines = append(lines, "Caution: "+rq.Caution+".")
		g.set.Cautions = append(g.set.Cautions, "view "+v.Name+": "+rq.Caution)
	}
	g.header[v] = header(v, lines)
}

// measureView builds the view of view block vb, planned and rendered as
// `rollwise run --view` does.
func (g *generator) measureView(m *model.Model, vb *model.View, diags *grammar.Diagnostics) {
	q := m.ViewQuery(vb)
	c, pd, err := pipeline.Render(m, q, pipeline.Options{Dialect: g.d, Approximate: g.approximate, View: true})
	for _, d := range pd {
		d.Notes = append(d.Notes, "in view block "+vb.Name)
	}
	diags.Append(pd)
	if pd.HasErrors() {
		return
	}
	if err != nil {
		diags.Errorf(vb.Pos, "unsupported", "view block %s: %v", vb.Name, err)
		return
	}
	p, sql := c.Plan, c.SQL
	v := &View{Name: vb.Name, Kind: Measures, Source: "view block " + vb.Name}
	var reads []string
	for _, s := range p.Scans {
		reads = append(reads, relationText(s.Table))
		for _, l := range s.Joins {
			reads = append(reads, relationText(l.To))
		}
	}
	v.Reads = sortedUnique(reads)
	groupNames, err := groupColumnNames(q, p)
	if err != nil {
		diags.Errorf(vb.Pos, "name-clash", "view block %s: %v", vb.Name, err)
		return
	}
	var names []string
	for i, c := range q.Groups {
		v.Columns = append(v.Columns, Column{Name: groupNames[i], Type: c.Type.String(), From: "group " + c.String()})
	}
	for _, o := range p.Outputs {
		v.Columns = append(v.Columns, Column{Name: o.Name, Type: o.Measure.Type.String(),
			From: "measure " + o.Name + " = " + model.Text(o.Measure.Expr)})
	}
	v.Columns = append(v.Columns, Column{Name: dialects.GroupingColumn, Type: model.TypeInteger.String(),
		From: "grouping: which groups a row rolls up"})
	if dup := duplicateColumn(v.Columns); dup != "" {
		diags.Errorf(vb.Pos, "name-clash", "view block %s would have two columns called %s", vb.Name, dup).
			Suggestion = "rename the measure: " + dialects.GroupingColumn + " is the view's grouping column"
		return
	}
	for _, c := range v.Columns {
		names = append(names, c.Name)
	}
	// The query calls its columns as `run` shows them.
	inner := append(append([]string{}, q.GroupNames...), outputNames(p)...)
	inner = append(inner, dialects.GroupingColumn)
	g.add(v, vb.Pos)
	v.Statements, err = dialects.CreateView(g.d, v.QualifiedName, names, inner, sql)
	if err != nil {
		diags.Errorf(vb.Pos, "unsupported", "view block %s: %v", vb.Name, err)
		return
	}
	for _, n := range c.Notes {
		g.set.Cautions = append(g.set.Cautions, "view "+v.Name+": "+n)
	}
	lines := []string{"Measures of view block " + vb.Name + ": the rows and values of `rollwise run MODEL --view " + vb.Name + "`."}
	if len(q.Groups) > 0 {
		var by []string
		for _, c := range q.Groups {
			by = append(by, c.String())
		}
		lines = append(lines, "Grouped by "+strings.Join(by, ", ")+"; total rows: "+string(q.Totals)+".")
	}
	if vb.Where != nil {
		lines = append(lines, "Where "+model.Text(vb.Where)+".")
	}
	lines = append(lines, groupingNote(q, p, groupNames))
	if c.Approximation != "" {
		lines = append(lines, "Caution: "+c.Approximation+".")
	}
	g.header[v] = header(v, lines)
}

func outputNames(p *plan.Plan) []string {
	var out []string
	for _, o := range p.Outputs {
		out = append(out, o.Name)
	}
	return out
}

// groupColumnNames names a measure view's group columns: the column's own
// name (family for plants.family) unless another column of the view has
// it, then table_column (plants_family).
func groupColumnNames(q *model.Query, p *plan.Plan) ([]string, error) {
	count := map[string]int{strings.ToLower(dialects.GroupingColumn): 1}
	for _, o := range p.Outputs {
		count[strings.ToLower(o.Name)]++
	}
	for _, c := range q.Groups {
		count[strings.ToLower(c.Name)]++
	}
	names := make([]string, len(q.Groups))
	taken := map[string]bool{}
	for i, c := range q.Groups {
		n := c.Name
		if count[strings.ToLower(n)] > 1 {
			n = c.Table.Name + "_" + c.Name
		}
		if taken[strings.ToLower(n)] || (n != c.Name && count[strings.ToLower(n)] > 0) {
			return nil, fmt.Errorf("cannot name the column of %s: %s is taken", c, n)
		}
		taken[strings.ToLower(n)] = true
		names[i] = n
	}
	return names, nil
}

// duplicateColumn returns the name of a column that two columns share,
// ignoring case, or "".
func duplicateColumn(cols []Column) string {
	seen := map[string]bool{}
	for _, c := range cols {
		k := strings.ToLower(c.Name)
		if seen[k] {
			return c.Name
		}
		seen[k] = true
	}
	return ""
}

// groupingNote explains the grouping column of a measure view: the bit of
// each group, and the values its rows take.
func groupingNote(q *model.Query, p *plan.Plan, names []string) string {
	if len(p.Sets) < 2 {
		return dialects.GroupingColumn + " is 0 on every row: the view block asks for no total rows."
	}
	n := len(names)
	var bits, values []string
	for i, g := range names {
		bits = append(bits, fmt.Sprintf("+%d where %s is rolled up", uint64(1)<<(n-1-i), g))
	}
	for _, mask := range p.Sets {
		var kept []string
		for i, g := range names {
			if mask&(1<<(n-1-i)) == 0 {
				kept = append(kept, g)
			}
		}
		switch {
		case mask == 0:
			values = append(values, "0 on detail rows")
		case len(kept) == 0:
			values = append(values, fmt.Sprintf("%d on the grand total", mask))
		default:
			values = append(values, fmt.Sprintf("%d on totals by %s", mask, strings.Join(kept, ", ")))
		}
	}
	return fmt.Sprintf("%s tells total rows apart (%s): %s.", dialects.GroupingColumn,
		strings.Join(bits, ", "), strings.Join(values, "; "))
}

// checkNames reports views whose names clash: engines such as DuckDB
// compare names without regard to case, so neither may we.
func (g *generator) checkNames(diags *grammar.Diagnostics) {
	seen := map[string]*View{}
	for _, v := range g.set.Views {
		key := strings.ToLower(strings.Join(v.QualifiedName, "."))
		if prev, ok := seen[key]; ok {
			diags.Errorf(g.pos[v], "name-clash", "%s and %s would both be the view %s", prev.Source, v.Source, strings.Join(v.QualifiedName, ".")).
				Suggestion = "rename the view block"
			continue
		}
		seen[key] = v
	}
}

// order sorts the views so that each comes after the views it reads (a
// view reads another when a table of the model is `at` that view), keeping
// declaration order otherwise. A circle is an error.
func (g *generator) order(diags *grammar.Diagnostics) bool {
	byName := map[string]*View{}
	for _, v := range g.set.Views {
		byName[strings.ToLower(strings.Join(v.QualifiedName, "."))] = v
	}
	state := map[*View]int{}
	var out []*View
	var visit func(v *View, path []string) bool
	visit = func(v *View, path []string) bool {
		switch state[v] {
		case 1:
			diags.Errorf(g.pos[v], "view-cycle", "views read each other in a circle: %s", strings.Join(append(path, v.Name), " -> ")).
				Suggestion = "put the views in a schema of their own with --schema"
			return false
		case 2:
			return true
		}
		state[v] = 1
		for _, r := range v.Reads {
			if dep, ok := byName[strings.ToLower(r)]; ok {
				if !visit(dep, append(path, v.Name)) {
					return false
				}
			}
		}
		state[v] = 2
		out = append(out, v)
		return true
	}
	for _, v := range g.set.Views {
		if !visit(v, nil) {
			return false
		}
	}
	g.set.Views = out
	return true
}

// fileNames gives each view a file name: its name where that is a safe
// file name, distinct from the others even on file systems that ignore
// case.
func (g *generator) fileNames() {
	taken := map[string]bool{strings.ToLower(ManifestFile): true}
	for _, v := range g.set.Views {
		base := safeFileName(v.Name)
		name := base + ".sql"
		for i := 2; taken[strings.ToLower(name)]; i++ {
			name = fmt.Sprintf("%s_%d.sql", base, i)
		}
		taken[strings.ToLower(name)] = true
		v.File = name
	}
}

func safeFileName(s string) string {
	var b strings.Builder
	for _, r := range s {
		switch {
		case r >= 'a' && r <= 'z', r >= 'A' && r <= 'Z', r >= '0' && r <= '9', r == '_', r == '-':
			b.WriteRune(r)
		default:
			b.WriteByte('_')
		}
	}
	if b.Len() == 0 {
		return "view"
	}
	return b.String()
}

func relationText(t *model.Table) string { return strings.Join(t.Relation, ".") }

func sortedUnique(s []string) []string {
	sort.Strings(s)
	var out []string
	for i, x := range s {
		if i == 0 || x != s[i-1] {
			out = append(out, x)
		}
	}
	return out
}

// header is the comment block at the top of a view's file: what it is,
// what it reads, and its columns with their types.
func header(v *View, lines []string) string {
	var b strings.Builder
	b.WriteString("-- " + comment(strings.Join(v.QualifiedName, ".")) + ": generated by `rollwise views`; change the model, not this file.\n")
	for _, l := range lines {
		b.WriteString("-- " + comment(l) + "\n")
	}
	b.WriteString("-- Reads: " + comment(strings.Join(v.Reads, ", ")) + "\n")
	b.WriteString("-- Columns:\n")
	wn, wt := 0, 0
	for _, c := range v.Columns {
		wn, wt = max(wn, len(c.Name)), max(wt, len(c.Type))
	}
	for _, c := range v.Columns {
		line := fmt.Sprintf("%-*s  %-*s  %s", wn, c.Name, wt, c.Type, c.From)
		b.WriteString("--   " + comment(strings.TrimRight(line, " ")) + "\n")
	}
	return b.String()
}

// comment makes text safe inside a -- comment: a line break in a name or
// a string literal would otherwise end the comment and turn the rest of
// the line into SQL.
func comment(s string) string {
	return strings.Map(func(r rune) rune {
		if r < ' ' || r == 0x7f || r == '\u2028' || r == '\u2029' || r == '\u0085' {
			return ' '
		}
		return r
	}, s)
}
