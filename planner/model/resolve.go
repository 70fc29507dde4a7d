package model

import (
	"fmt"
	"path/filepath"
	"slices"
	"sort"
	"strings"

	"github.com/rollwise/rollwise/grammar"
)

// Load resolves parsed files into a checked model. The diagnostics hold
// every error and warning found; the model is nil when there are errors.
func Load(files []*grammar.File) (*Model, grammar.Diagnostics) {
	r := &resolver{
		m:            &Model{tables: map[string]*Table{}, measures: map[string]*Measure{}},
		measureDecls: map[string]*grammar.MeasureDecl{},
		state:        map[string]int{},
		viewNames:    map[string]bool{},
	}
	for _, f := range files {
		for _, td := range f.Tables {
			r.declareTable(f, td)
		}
	}
	for _, t := range r.m.Tables {
		r.resolveLinks(t, r.tableDecls[t])
	}
	for _, t := range r.m.Tables {
		r.resolveDerived(t, r.tableDecls[t])
	}
	r.checkPaths()
	r.checkSameRelation()
	for _, f := range files {
		for _, md := range f.Measures {
			if prev, dup := r.measureDecls[md.Name.Name]; dup {
				r.diags.Errorf(md.Name.Pos, "duplicate-measure", "measure %q is declared twice", md.Name.Name).
					Notes = []string{"first declared at " + prev.Name.Pos.String()}
				continue
			}
			r.measureDecls[md.Name.Name] = md
			r.measureOrder = append(r.measureOrder, md)
		}
	}
	for _, md := range r.measureOrder {
		r.measure(md.Name.Name)
	}
	for _, f := range files {
		for _, vd := range f.Views {
			r.view(vd)
		}
	}
	r.diags.Sort()
	if r.diags.HasErrors() {
		return nil, r.diags
	}
	return r.m, r.diags
}

type resolver struct {
	m            *Model
	diags        grammar.Diagnostics
	tableDecls   map[*Table]*grammar.TableDecl
	measureDecls map[string]*grammar.MeasureDecl
	measureOrder []*grammar.MeasureDecl
	// state is 1 while a measure is being resolved, 2 when done.
	state map[string]int
	stack []string
	// derivedState does the same for derived columns.
	derivedState map[*Column]int
	// viewNames are the views declared so far (a map, so that a model of
	// many views is not checked for duplicates in quadratic time).
	viewNames map[string]bool
}

var typeByName = map[string]Type{
	"integer": TypeInteger, "decimal": TypeDecimal, "float": TypeFloat, "text": TypeText,
	"date": TypeDate, "timestamp": TypeTimestamp, "boolean": TypeBoolean,
}

func typeNameList() []string {
	return []string{"integer", "decimal", "float", "text", "date", "timestamp", "boolean"}
}

func (r *resolver) declareTable(f *grammar.File, td *grammar.TableDecl) {
	name := td.Name.Name
	if prev := r.m.tables[name]; prev != nil {
		r.diags.Errorf(td.Name.Pos, "duplicate-table", "table %q is declared twice", name).
			Notes = []string{"first declared at " + prev.Pos.String()}
		return
	}
	t := &Table{Name: name, Pos: td.Name.Pos, Relation: []string{name}}
	if td.At != nil {
		parts := strings.Split(td.At.Value, ".")
		for _, p := range parts {
			if p == "" {
				r.diags.Errorf(td.At.Pos, "bad-relation", "relation %q has an empty part", td.At.Value).
					Suggestion = `write "schema.name" or "name"`
			}
		}
		t.Relation = parts
	}
	for _, n := range td.Nulls {
		if slices.Contains(t.NullTexts, n.Value) {
			r.diags.Errorf(n.Pos, "duplicate-null", "%q is already a NULL text of table %s", n.Value, name).
				Suggestion = "write each text once"
			continue
		}
		t.NullTexts = append(t.NullTexts, n.Value)
	}
	if td.From != nil {
		t.File = td.From.Value
		if !filepath.IsAbs(t.File) {
			t.File = filepath.Join(filepath.Dir(f.Name), t.File)
		}
	}
	for _, cd := range td.Columns {
		if prev := t.Column(cd.Name.Name); prev != nil {
			r.diags.Errorf(cd.Name.Pos, "duplicate-column", "column %q is declared twice in table %s", cd.Name.Name, name).
				Notes = []string{"first declared at " + prev.Pos.String()}
			continue
		}
		c := &Column{Table: t, Name: cd.Name.Name, Pos: cd.Name.Pos}
		if cd.Type != nil {
			ty, ok := typeByName[strings.ToLower(cd.Type.Name)]
			if !ok {
				d := r.diags.Errorf(cd.Type.Pos, "unknown-type", "unknown type %q", cd.Type.Name)
				d.Suggestion = "write one of " + strings.Join(typeNameList(), ", ")
				if near := grammar.Closest(cd.Type.Name, typeNameList()); near != "" {
					d.Message += fmt.Sprintf("; did you mean %q?", near)
				}
			}
			c.Type = ty
		}
		switch cd.Additivity {
		case grammar.NonAdditive:
			c.Additivity = NonAdditive
		case grammar.SemiAdditive:
			c.Additivity = SemiAdditive
		}
		t.addColumn(c)
	}
	for _, k := range td.Key {
		c := t.Column(k.Name)
		if c == nil {
			r.unknownColumn(k.Pos, t, k.Name)
			continue
		}
		t.Key = append(t.Key, c)
	}
	if r.tableDecls == nil {
		r.tableDecls = map[*Table]*grammar.TableDecl{}
	}
	r.tableDecls[t] = td
	r.m.tables[name] = t
	r.m.Tables = append(r.m.Tables, t)
}

func (r *resolver) unknownColumn(p grammar.Pos, t *Table, name string) {
	var names []string
	for _, c := range t.Columns {
		names = append(names, c.Name)
	}
	d := r.diags.Errorf(p, "unknown-column", "unknown column '%s' in table %s", name, t.Name)
	if near := grammar.Closest(name, names); near != "" {
		d.Message += fmt.Sprintf("; did you mean '%s'?", near)
	}
}

func (r *resolver) unknownTable(p grammar.Pos, name string) {
	var names []string
	for _, t := range r.m.Tables {
		names = append(names, t.Name)
	}
	d := r.diags.Errorf(p, "unknown-table", "unknown table '%s'", name)
	if near := grammar.Closest(name, names); near != "" {
		d.Message += fmt.Sprintf("; did you mean '%s'?", near)
	}
}

func (r *resolver) lookupTable(p grammar.Pos, name string) *Table {
	t := r.m.tables[name]
	if t == nil {
		r.unknownTable(p, name)
	}
	return t
}

func (r *resolver) resolveLinks(t *Table, td *grammar.TableDecl) {
	for _, cd := range td.Columns {
		c := t.Column(cd.Name.Name)
		if c == nil || c.Pos != cd.Name.Pos {
			continue
		}
		if cd.SemiDate != nil {
			c.SemiDate = r.columnRef(cd.SemiDate, nil)
			if c.SemiDate != nil && c.SemiDate.Type != TypeDate && c.SemiDate.Type != TypeTimestamp {
				r.diags.Errorf(cd.SemiDate.Pos, "type", "semiadditive needs a date column; %s is %s", c.SemiDate, c.SemiDate.Type)
			}
		}
		if cd.Link == nil {
			continue
		}
		if cd.Expr != nil {
			r.diags.Errorf(cd.Link.Pos, "bad-link", "derived column %s cannot link: links are declared on stored columns", c).
				Suggestion = "link the stored column the derived one is computed from"
			continue
		}
		if cd.Link.Table == "" {
			r.diags.Errorf(cd.Link.Pos, "bad-link", "a link names its target as TABLE.KEYCOL").
				Suggestion = fmt.Sprintf("write -> %s.KEYCOL", cd.Link.Name)
			continue
		}
		to := r.lookupTable(cd.Link.Pos, cd.Link.Table)
		if to == nil {
			continue
		}
		tc := to.Column(cd.Link.Name)
		if tc == nil {
			r.unknownColumn(cd.Link.NamePos, to, cd.Link.Name)
			continue
		}
		r.addLink(&Link{From: t, FromCols: []*Column{c}, To: to, ToCols: []*Column{tc}, Pos: cd.Link.Pos, Required: cd.LinkRequired})
	}
	for _, ld := range td.Links {
		to := r.lookupTable(ld.Table.Pos, ld.Table.Name)
		if to == nil {
			continue
		}
		if len(ld.From) != len(ld.To) {
			r.diags.Errorf(ld.Pos, "bad-link", "the link lists %d columns of %s but %d of %s",
				len(ld.From), t.Name, len(ld.To), to.Name).Suggestion = "list as many key columns as link columns, in the same order"
			continue
		}
		l := &Link{From: t, To: to, Pos: ld.Pos, Required: ld.Required}
		ok := true
		for i := range ld.From {
			fc, tc := t.Column(ld.From[i].Name), to.Column(ld.To[i].Name)
			if fc == nil {
				r.unknownColumn(ld.From[i].Pos, t, ld.From[i].Name)
				ok = false
			}
			if tc == nil {
				r.unknownColumn(ld.To[i].Pos, to, ld.To[i].Name)
				ok = false
			}
			l.FromCols = append(l.FromCols, fc)
			l.ToCols = append(l.ToCols, tc)
		}
		if ok {
			r.addLink(l)
		}
	}
}

// addLink checks that a link targets exactly the key of its table, with
// matching types, and records it.
func (r *resolver) addLink(l *Link) {
	keyNames := func(cs []*Column) []string {
		var s []string
		for _, c := range cs {
			s = append(s, c.Name)
		}
		sort.Strings(s)
		return s
	}
	if len(l.To.Key) == 0 {
		r.diags.Errorf(l.Pos, "link-to-non-key", "table %s has no key, so nothing can link to it", l.To.Name).
			Suggestion = fmt.Sprintf("declare its key in table %s: key COL", l.To.Name)
		return
	}
	if strings.Join(keyNames(l.ToCols), ",") != strings.Join(keyNames(l.To.Key), ",") {
		d := r.diags.Errorf(l.Pos, "link-to-non-key", "link %s does not point at the key of %s", l, l.To.Name)
		d.Notes = []string{fmt.Sprintf("the key of %s is (%s); a link must match it exactly, so that each row finds at most one row",
			l.To.Name, strings.Join(keyNames(l.To.Key), ", "))}
		return
	}
	for i := range l.FromCols {
		a, b := l.FromCols[i].Type, l.ToCols[i].Type
		if a != b && !(a.Numeric() && b.Numeric()) {
			r.diags.Errorf(l.Pos, "type", "link %s joins %s (%s) to %s (%s)", l, l.FromCols[i], a, l.ToCols[i], b)
			return
		}
	}
	for _, prev := range l.From.Links {
		if prev.To == l.To && prev.String() == l.String() {
			r.diags.Errorf(l.Pos, "duplicate-link", "link %s is declared twice", l)
			return
		}
	}
	l.From.Links = append(l.From.Links, l)
}

func (r *resolver) resolveDerived(t *Table, td *grammar.TableDecl) {
	if r.derivedState == nil {
		r.derivedState = map[*Column]int{}
	}
	for _, cd := range td.Columns {
		c := t.Column(cd.Name.Name)
		if c == nil || c.Pos != cd.Name.Pos || cd.Expr == nil {
			continue
		}
		r.derived(c, cd)
	}
}

// derived resolves one derived column, resolving the derived columns it
// reads first and reporting cycles.
func (r *resolver) derived(c *Column, cd *grammar.ColumnDecl) {
	switch r.derivedState[c] {
	case 1:
		r.diags.Errorf(c.Pos, "cycle", "derived column %s depends on itself", c)
		return
	case 2:
		return
	}
	r.derivedState[c] = 1
	x := &exprResolver{r: r, self: c.Table, row: true}
	c.Derived = x.expr(cd.Expr)
	if c.Derived == nil {
		c.Derived = &Lit{Pos: c.Pos, T: TypeNull}
	}
	c.Type = c.Derived.Type()
	if c.Type == TypeNull {
		c.Type = TypeText
	}
	r.derivedState[c] = 2
}

// ensureDerived resolves a derived column on first use, so that one derived
// column can read another declared after it.
func (r *resolver) ensureDerived(c *Column) {
	if r.derivedState[c] == 2 {
		return
	}
	td := r.tableDecls[c.Table]
	for _, cd := range td.Columns {
		if cd.Name.Name == c.Name && cd.Expr != nil {
			r.derived(c, cd)
		}
	}
}

// checkPaths reports two different link paths between the same tables.
func (r *resolver) checkPaths() {
	tables := r.m.Tables
	index := make(map[*Table]int, len(tables))
	for i, t := range tables {
		index[t] = i
	}
	// The walk runs on table numbers: targets[i][k] is the table link k
	// of table i leads to. Per start table, arrays stamped with its number
	// replace maps, and the first path to each table is kept as the link
	// that reached it, so that a chain of n tables costs n*n cheap steps.
	targets := make([][]int, len(tables))
	for i, t := range tables {
		for _, l := range t.Links {
			targets[i] = append(targets[i], index[l.To])
		}
	}
	via := make([]*Link, len(tables))   // the link that first reached a table
	prev := make([]*Table, len(tables)) // the table it leads from
	reached := make([]int, len(tables))
	onPath := make([]int, len(tables))
	var path []*Link // the links from the start table to the one walked
	var start, stamp int
	var found grammar.Diagnostics // the errors of the walk from start
	// kept counts the errors of every walk; past grammar.MaxPrinted (what
	// is shown) the walks stop: a model of many links with many paths between its tables
	// (5,000 tables of ten links each, 1.5 MB) found millions, each with
	// its paths written out, and took hours. stopped says where.
	kept := 0
	var stopped *Link
	var walk func(at int)
	walk = func(at int) {
		for k, to := range targets[at] {
			if onPath[to] == stamp || stopped != nil {
				continue
			}
			l := tables[at].Links[k]
			if reached[to] == stamp {
				if kept++; kept > grammar.MaxPrinted {
					stopped = l
					return
				}
				t := tables[start]
				d := found.Errorf(l.Pos, "two-paths", "two different link paths lead from %s to %s", t.Name, l.To.Name)
				d.Notes = []string{"first path: " + pathString(t, firstPath(via, prev, index, t, l.To)),
					"second path: " + pathString(t, append(path[:len(path):len(path)], l))}
				d.Suggestion = fmt.Sprintf("declare a second table that reads the same relation (at \"%s\") for the second role, and link to it",
					strings.Join(l.To.Relation, "."))
				continue
			}
			reached[to], via[to], prev[to], onPath[to] = stamp, l, tables[at], stamp
			path = append(path, l)
			walk(to)
			path = path[:len(path)-1]
			onPath[to] = 0
		}
	}
	// A table on no cycle with one link, to u, has exactly the paths of u
	// with that link in front, so it is clean when u is: a chain costs
	// one walk, not one per table. Errors are kept per start table and
	// reported in the tables' order.
	cyclic := onCycle(targets)
	done := make([]bool, len(tables))
	clean := make([]bool, len(tables))
	errs := make([]grammar.Diagnostics, len(tables))
	var check func(i int)
	check = func(i int) {
		if done[i] {
			return
		}
		done[i] = true
		if !cyclic[i] && len(targets[i]) == 1 {
			u := targets[i][0]
			check(u)
			if clean[u] {
				clean[i] = true
				return
			}
		}
		start, stamp, found = i, i+1, nil
		onPath[i] = stamp
		walk(i)
		errs[i], clean[i] = found, len(found) == 0
	}
	for i := range tables {
		check(i)
	}
	for _, e := range errs {
		r.diags.Append(e)
	}
	if stopped != nil {
		r.diags.Errorf(stopped.Pos, "two-paths", "more than %d pairs of link paths between the same tables; the rest are not looked for", grammar.MaxPrinted).Suggestion =
			"fix the first ones and check again"
	}
}

// onCycle reports, for a graph given by its edges' targets, which nodes
// lie on a cycle (Tarjan's strongly connected components: a component of
// more than one node, or a node with an edge to itself).
func onCycle(targets [][]int) []bool {
	n := len(targets)
	order, low := make([]int, n), make([]int, n)
	onStack, cyclic := make([]bool, n), make([]bool, n)
	var stack []int
	next := 1
	var visit func(v int)
	visit = func(v int) {
		order[v], low[v] = next, next
		next++
		stack = append(stack, v)
		onStack[v] = true
		for _, w := range targets[v] {
			switch {
			case w == v:
				cyclic[v] = true
			case order[w] == 0:
				visit(w)
				low[v] = min(low[v], low[w])
			case onStack[w]:
				low[v] = min(low[v], order[w])
			}
		}
		if low[v] != order[v] {
			return
		}
		top := len(stack) - 1
		for stack[top] != v {
			top--
		}
		if len(stack)-top > 1 {
			for _, w := range stack[top:] {
				cyclic[w] = true
			}
		}
		for _, w := range stack[top:] {
			onStack[w] = false
		}
		stack = stack[:top]
	}
	for v := range targets {
		if order[v] == 0 {
			visit(v)
		}
	}
	return cyclic
}

// firstPath follows via (the link that first reached each table) and
// prev (the table it leads from) back from to to from.
func firstPath(via []*Link, prev []*Table, index map[*Table]int, from, to *Table) []*Link {
	var rev []*Link
	for at := to; at != from; at = prev[index[at]] {
		rev = append(rev, via[index[at]])
	}
	slices.Reverse(rev)
	return rev
}

// pathString is the path from from as "a -> b -> c". A path of more
// than 2*pathEnds links shows its first and last
// pathEnds tables and how many are left out between: a model of many
// links can have paths of thousands of tables.
func pathString(from *Table, path []*Link) string {
	var b strings.Builder
	b.WriteString(from.Name)
	for i, l := range path {
		if len(path) > 2*pathEnds && i == pathEnds {
			fmt.Fprintf(&b, " -> ... (%d more tables)", len(path)-2*pathEnds)
		}
		if len(path) > 2*pathEnds && i >= pathEnds && i < len(path)-pathEnds {
			continue
		}
		b.WriteString(" -> ")
		b.WriteString(l.To.Name)
	}
	return b.String()
}

// pathEnds is how many tables pathString shows at each end of a long
// path.
const pathEnds = 32

// Reach returns the link path from t to every table reachable from it
// (t itself maps to an empty path).
func Reach(t *Table) map[*Table][]*Link {
	out := map[*Table][]*Link{t: nil}
	queue := []*Table{t}
	for len(queue) > 0 {
		at := queue[0]
		queue = queue[1:]
		for _, l := range at.Links {
			if _, ok := out[l.To]; ok {
				continue
			}
			out[l.To] = append(append([]*Link{}, out[at]...), l)
			queue = append(queue, l.To)
		}
	}
	return out
}

// reachesAll reports whether every table of targets is t or is reached
// from t along links. It walks the links breadth first without copying
// any path (Reach copies one per table reached, which on a chain of n
// tables is n*n/2 links: 10,000 tables took 400 MB for each aggregate
// over the first) and stops as soon as every target is found, so an
// aggregate over one table costs nothing.
func reachesAll(t *Table, targets []*Table) bool {
	wanted := map[*Table]bool{}
	for _, o := range targets {
		if o != t {
			wanted[o] = true
		}
	}
	left := len(wanted)
	if left == 0 {
		return true
	}
	seen := map[*Table]bool{t: true}
	queue := []*Table{t}
	for len(queue) > 0 {
		at := queue[0]
		queue = queue[1:]
		for _, l := range at.Links {
			if seen[l.To] {
				continue
			}
			seen[l.To] = true
			if wanted[l.To] {
				if left--; left == 0 {
					return true
				}
			}
			queue = append(queue, l.To)
		}
	}
	return false
}

// columnRef resolves a table.column reference (self: the table whose bare
// names are columns, or nil).
func (r *resolver) columnRef(ref *grammar.Ref, self *Table) *Column {
	if ref.Table == "" {
		if self == nil {
			r.diags.Errorf(ref.Pos, "bare-name", "'%s' is a bare name; columns are written table.column", ref.Name)
			return nil
		}
		c := self.Column(ref.Name)
		if c == nil {
			r.unknownColumn(ref.Pos, self, ref.Name)
		}
		return c
	}
	t := r.lookupTable(ref.Pos, ref.Table)
	if t == nil {
		return nil
	}
	c := t.Column(ref.Name)
	if c == nil {
		r.unknownColumn(ref.NamePos, t, ref.Name)
	}
	return c
}

// columnsNamed lists the columns called name, in declaration order.
func (r *resolver) columnsNamed(name string) []*Column {
	var out []*Column
	for _, t := range r.m.Tables {
		if c := t.Column(name); c != nil {
			out = append(out, c)
		}
	}
	return out
}
