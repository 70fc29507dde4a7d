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
	"github.com/rollwise/rollwise/planner/model"
)

// measureFacts is what the catalog says about one measure.
type measureFacts struct {
	m *model.Measure
	// definition is the declaration as written in its file.
	definition string
	// tables are the tables the measure reads itself (its aggregates'
	// tables and the tables of its columns), columns the columns, both in
	// model order; uses are the measures it names, usedBy the measures
	// that name it, in declaration order.
	tables  []*model.Table
	columns []*model.Column
	uses    []*model.Measure
	usedBy  []*model.Measure
}

// facts gathers the measures' facts, in declaration order.
type facts struct {
	model    *model.Model
	measures []*measureFacts
	byName   map[*model.Measure]*measureFacts
	// readers[t] are the measures that read table t themselves.
	readers map[*model.Table][]*model.Measure
	// linksIn[t] are the links that lead to table t.
	linksIn map[*model.Table][]*model.Link
}

func gather(m *model.Model, src grammar.Sources) *facts {
	f := &facts{model: m, byName: map[*model.Measure]*measureFacts{},
		readers: map[*model.Table][]*model.Measure{}, linksIn: map[*model.Table][]*model.Link{}}
	tableOrder := map[*model.Table]int{}
	for i, t := range m.Tables {
		tableOrder[t] = i
		for _, l := range t.Links {
			f.linksIn[l.To] = append(f.linksIn[l.To], l)
		}
	}
	measureOrder := map[*model.Measure]int{}
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

func columnIndex(c *model.Column) int {
	for i, x := range c.Table.Columns {
		if x == c {
			return i
		}
	}
	return len(c.Table.Columns)
}

// definition is the measure's declaration as written, or the expression
// as rollwise prints it when the source is not at hand.
func definition(m *model.Measure, src grammar.Sources) string {
	if text := grammar.DeclarationText(src[m.Pos.File], m.Pos.Offset); text != "" {
		return text
	}
	return fmt.Sprintf("measure %s = %s", m.Name, model.Text(m.Expr))
}

// reads walks a measure expression (not into the measures it names) for
// the tables its aggregates run over, the columns it reads (through
// derived columns, per-grain groups and cell edits) and the measures it
// names.
func reads(e model.Expr) (map[*model.Table]bool, []*model.Column, map[*model.Measure]bool) {
	tables := map[*model.Table]bool{}
	uses := map[*model.Measure]bool{}
	seen := map[*model.Column]bool{}
	var cols []*model.Column
	var add func(cs ...*model.Column)
	add = func(cs ...*model.Column) {
		for _, c := range cs {
			if c != nil && !seen[c] {
				seen[c] = true
				cols = append(cols, c)
				if c.Derived != nil {
					add(model.Columns(c.Derived)...)
				}
			}
		}
	}
	add(model.Columns(e)...)
	model.Walk(e, func(x model.Expr) bool {
		switch x := x.(type) {
		case *model.Agg:
			if x.Table != nil {
				tables[x.Table] = true
			}
		case *model.PerAgg:
			add(x.Per...)
		case *model.EditExpr:
			for _, ed := range x.Edits {
				add(ed.Col)
				if ed.Table != nil {
					tables[ed.Table] = true
				}
			}
		case *model.MeasureRef:
			uses[x.Measure] = true
		}
		return true
	})
	return tables, cols, uses
}

// upstream returns the measures mf builds on, directly or not, in
// declaration order.
func (f *facts) upstream(mf *measureFacts) []*model.Measure {
	seen := map[*model.Measure]bool{}
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
	var out []*model.Measure
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

func measurePage(m *model.Measure) string { return pageName("measure", m.Name) }
func tablePage(t *model.Table) string     { return pageName("table", t.Name) }
