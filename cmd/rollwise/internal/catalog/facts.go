// Package catalog builds `rollwise docs`: a static catalog of a model as
// plain HTML pages with a style sheet, no script and nothing fetched at
// view time. An index lists the measures, tables and views and draws the
// tables with their links; each measure has a page with its definition,
// description, format, what it reads, the measures it builds on and those
// built on it, and a graph of its dependencies; each table has a page with
// its columns, key and links. Build makes the files, Write puts them in a
// folder atomically. The same model always gives the same bytes.
package catalog

import (
	"fmt"
	"sort"
	"strings"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner"
)

// measureFacts is what the catalog says about one measure.
type measureFacts struct {
	m *planner.Measure
	// definition is the declaration as written in its file.
	definition string
	// tables are the tables the measure reads itself (its aggregates'
	// tables and the tables of its columns), columns the columns, both in
	// model order; uses are the measures it names, usedBy the measures
	// that name it, in declaration order.
	tables  []*planner.Table
	columns []*planner.Column
	uses    []*planner.Measure
	usedBy  []*planner.Measure
}

// facts gathers the measures' facts, in declaration order.
type facts struct {
	model    *planner.Model
	measures []*measureFacts
	byName   map[*planner.Measure]*measureFacts
	// readers[t] are the measures that read table t themselves.
	readers map[*planner.Table][]*planner.Measure
	// linksIn[t] are the links that lead to table t.
	linksIn map[*planner.Table][]*planner.Link
}

func gather(m *planner.Model, src grammar.Sources) *facts {
	f := &facts{model: m, byName: map[*planner.Measure]*measureFacts{},
		readers: map[*planner.Table][]*planner.Measure{}, linksIn: map[*planner.Table][]*planner.Link{}}
	tableOrder := map[*planner.Table]int{}
	for i, t := range m.Tables {
		tableOrder[t] = i
		for _, l := range t.Links {
			f.linksIn[l.To] = append(f.linksIn[l.To], l)
		}
	}
	measureOrder := map[*planner.Measure]int{}
	for i, ms := range m.Measures {
		measureOrder[ms] = i
	}
	for _, ms := range m.Measures {
		mf := &measureFacts{m: ms, definition: definition(ms, src)}
		tables, cols, uses := reads(ms.Expr)
		for _, c := range cols {
			tables[c.Table] = true
		}
		for t := range tables {
			mf.tables = append(mf.tables, t)
		}
		sort.Slice(mf.tables, func(i, j int) bool { return tableOrder[mf.tables[i]] < tableOrder[mf.tables[j]] })
		mf.columns = cols
		sort.SliceStable(mf.columns, func(i, j int) bool {
			a, b := mf.columns[i], mf.columns[j]
			if a.Table != b.Table {
				return tableOrder[a.Table] < tableOrder[b.Table]
			}
			return columnIndex(a) < columnIndex(b)
		})
		for u := range uses {
			mf.uses = append(mf.uses, u)
		}
		sort.Slice(mf.uses, func(i, j int) bool { return measureOrder[mf.uses[i]] < measureOrder[mf.uses[j]] })
		f.measures = append(f.measures, mf)
		f.byName[ms] = mf
		for _, t := range mf.tables {
			f.readers[t] = append(f.readers[t], ms)
		}
	}
	for _, mf := range f.measures {
		for _, u := range mf.uses {
			f.byName[u].usedBy = append(f.byName[u].usedBy, mf.m)
		}
	}
	return f
}

func columnIndex(c *planner.Column) int {
	for i, x := range c.Table.Columns {
		if x == c {
			return i
		}
	}
	return len(c.Table.Columns)
}

// definition is the measure's declaration as written, or the expression
// as rollwise prints it when the source is not at hand.
func definition(m *planner.Measure, src grammar.Sources) string {
	if text := grammar.DeclarationText(src[m.Pos.File], m.Pos.Offset); text != "" {
		return text
	}
	return fmt.Sprintf("measure %s = %s", m.Name, planner.Text(m.Expr))
}

// reads walks a measure expression (not into the measures it names) for
// the tables its aggregates run over, the columns it reads (through
// derived columns, per-grain groups and cell edits) and the measures it
// names.
func reads(e planner.Expr) (map[*planner.Table]bool, []*planner.Column, map[*planner.Measure]bool) {
	tables := map[*planner.Table]bool{}
	uses := map[*planner.Measure]bool{}
	seen := map[*planner.Column]bool{}
	var cols []*planner.Column
	var add func(cs ...*planner.Column)
	add = func(cs ...*planner.Column) {
		for _, c := range cs {
			if c != nil && !seen[c] {
				seen[c] = true
				cols = append(cols, c)
				if c.Derived != nil {
					add(planner.Columns(c.Derived)...)
				}
			}
		}
	}
	add(planner.Columns(e)...)
	planner.Walk(e, func(x planner.Expr) bool {
		switch x := x.(type) {
		case *planner.Agg:
			if x.Table != nil {
				tables[x.Table] = true
			}
		case *planner.PerAgg:
			add(x.Per...)
		case *planner.EditExpr:
			for _, ed := range x.Edits {
				add(ed.Col)
				if ed.Table != nil {
					tables[ed.Table] = true
				}
			}
		case *planner.MeasureRef:
			uses[x.Measure] = true
		}
		return true
	})
	return tables, cols, uses
}

// upstream returns the measures mf builds on, directly or not, in
// declaration order.
func (f *facts) upstream(mf *measureFacts) []*planner.Measure {
	seen := map[*planner.Measure]bool{}
	var visit func(*measureFacts)
	visit = func(x *measureFacts) {
		for _, u := range x.uses {
			if !seen[u] {
				seen[u] = true
				visit(f.byName[u])
			}
		}
	}
	visit(mf)
	var out []*planner.Measure
	for _, m := range f.model.Measures {
		if seen[m] {
			out = append(out, m)
		}
	}
	return out
}

// pageName is the file of a measure's or table's page: the name with
// every byte other than a-z, 0-9 and _ written as -XX (hex), so that
// names that differ only in case or hold any character still get files
// of their own, safe in any file system and in a URL.
func pageName(kind, name string) string {
	var b strings.Builder
	b.WriteString(kind + "-")
	for i := 0; i < len(name); i++ {
		c := name[i]
		if c >= 'a' && c <= 'z' || c >= '0' && c <= '9' || c == '_' {
			b.WriteByte(c)
		} else {
			fmt.Fprintf(&b, "-%02x", c)
		}
	}
	return b.String() + ".html"
}

func measurePage(m *planner.Measure) string { return pageName("measure", m.Name) }
func tablePage(t *planner.Table) string     { return pageName("table", t.Name) }
