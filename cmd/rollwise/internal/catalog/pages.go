package catalog

import (
	"bytes"
	"html/template"
	"sort"
	"strings"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/drawing"
	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
)

// File is one file of a catalog.
type File struct {
	Name string
	Data []byte
}

// Build makes the catalog's files for a model whose source texts are src:
// index.html, a page per measure and per table, style.css, and the
// manifest that tells Write the folder is the catalog's. Files come in
// name order; the same model gives the same bytes.
func Build(m *model.Model, src grammar.Sources) ([]File, error) {
	f := gather(m, src)
	var files []File
	add := func(name, tmpl string, data any) error {
		var b bytes.Buffer
		if err := pages.ExecuteTemplate(&b, tmpl, data); err != nil {
			return err
		}
		files = append(files, File{Name: name, Data: b.Bytes()})
		return nil
	}
	if err := add("index.html", "index", f.indexPage(src)); err != nil {
		return nil, err
	}
	for _, mf := range f.measures {
		if err := add(measurePage(mf.m), "measure", f.measurePage(mf)); err != nil {
			return nil, err
		}
	}
	for _, t := range m.Tables {
		if err := add(tablePage(t), "table", f.tablePage(t)); err != nil {
			return nil, err
		}
	}
	files = append(files, File{Name: "style.css", Data: []byte(drawing.Style)})
	sort.Slice(files, func(i, j int) bool { return files[i].Name < files[j].Name })
	man, err := manifest(files)
	if err != nil {
		return nil, err
	}
	return append(files, man), nil
}

// ref is a name with the page that describes it.
type ref struct {
	Name, Href string
}

func measureRefs(ms []*model.Measure) []ref {
	var out []ref
	for _, m := range ms {
		out = append(out, ref{m.Name, measurePage(m)})
	}
	return out
}

func tableRefs(ts []*model.Table) []ref {
	var out []ref
	for _, t := range ts {
		out = append(out, ref{t.Name, tablePage(t)})
	}
	return out
}

// formatText says in words how a format shows values.
func formatText(f model.Format) string {
	switch f {
	case model.FormatPercent:
		return "percent: 0.256 shows as 25.6%"
	case model.FormatCurrency:
		return "currency: two decimals, thousands grouped (1,234.50)"
	case model.FormatInteger:
		return "integer: rounded to a whole number, thousands grouped"
	case model.FormatNumber:
		return "number: up to four decimals, thousands grouped"
	}
	return "none: up to four decimals"
}

type indexData struct {
	Title    string
	Files    []string
	Measures []measureRow
	Tables   []tableRow
	Views    []viewRow
	Diagram  template.HTML
}

type measureRow struct {
	ref
	Format, Doc string
}

type tableRow struct {
	ref
	Relation         string
	Columns, LinkOut int
}

type viewRow struct {
	Name     string
	Measures []ref
	By       []string
	Totals   string
}

func (f *facts) indexPage(src grammar.Sources) indexData {
	d := indexData{Title: "Model catalog"}
	for name := range src {
		d.Files = append(d.Files, name)
	}
	sort.Strings(d.Files)
	for _, mf := range f.measures {
		d.Measures = append(d.Measures, measureRow{ref{mf.m.Name, measurePage(mf.m)}, string(mf.m.Format), mf.m.Doc})
	}
	for _, t := range f.model.Tables {
		d.Tables = append(d.Tables, tableRow{ref{t.Name, tablePage(t)}, strings.Join(t.Relation, "."), len(t.Columns), len(t.Links)})
	}
	for _, v := range f.model.Views {
		r := viewRow{Name: v.Name, Measures: measureRefs(v.Measures), Totals: string(v.Totals)}
		for _, c := range v.By {
			r.By = append(r.By, c.String())
		}
		d.Views = append(d.Views, r)
	}
	d.Diagram = template.HTML(tableDiagram(f.model.Tables, "the tables of the model and their links"))
	return d
}

type measureData struct {
	Title, Doc, Format, Type, Where, Definition string
	Tables, Uses, UsedBy                        []ref
	Columns                                     []columnRef
	Views                                       []string
	Graph                                       template.HTML
}

type columnRef struct {
	ref
	Type string
}

func (f *facts) measurePage(mf *measureFacts) measureData {
	d := measureData{Title: mf.m.Name, Doc: mf.m.Doc, Format: formatText(mf.m.Format), Type: mf.m.Type.String(),
		Where: mf.m.Pos.String(), Definition: mf.definition,
		Tables: tableRefs(mf.tables), Uses: measureRefs(mf.uses), UsedBy: measureRefs(mf.usedBy)}
	for _, c := range mf.columns {
		d.Columns = append(d.Columns, columnRef{ref{c.String(), tablePage(c.Table) + "#col-" + c.Name}, c.Type.String()})
	}
	for _, v := range f.model.Views {
		for _, m := range v.Measures {
			if m == mf.m {
				d.Views = append(d.Views, v.Name)
				break
			}
		}
	}
	d.Graph = template.HTML(f.measureGraph(mf))
	return d
}

type tableData struct {
	Title, Relation, File, Where string
	NullTexts, Key               []string
	Columns                      []columnRow
	LinksOut, LinksIn            []linkRow
	Readers                      []ref
	Diagram                      template.HTML
}

type columnRow struct {
	Name, Type, Source, Additivity string
	Key                            bool
	Link                           *ref
}

type linkRow struct {
	Text     string
	Other    ref
	Required bool
}

func (f *facts) tablePage(t *model.Table) tableData {
	d := tableData{Title: t.Name, Relation: strings.Join(t.Relation, "."), File: t.File, Where: t.Pos.String(),
		NullTexts: t.NullTexts, Readers: measureRefs(f.readers[t])}
	for _, k := range t.Key {
		d.Key = append(d.Key, k.Name)
	}
	for _, c := range t.Columns {
		r := columnRow{Name: c.Name, Type: c.Type.String(), Source: "stored", Additivity: additivity(c)}
		if c.Derived != nil {
			r.Source = "= " + model.Text(c.Derived)
		}
		for _, k := range t.Key {
			r.Key = r.Key || k == c
		}
		for _, l := range t.Links {
			if len(l.FromCols) == 1 && l.FromCols[0] == c {
				r.Link = &ref{l.ToCols[0].String(), tablePage(l.To)}
			}
		}
		d.Columns = append(d.Columns, r)
	}
	near := []*model.Table{}
	seen := map[*model.Table]bool{}
	for _, l := range t.Links {
		d.LinksOut = append(d.LinksOut, linkRow{l.String(), ref{l.To.Name, tablePage(l.To)}, l.Required})
		seen[l.To] = true
	}
	for _, l := range f.linksIn[t] {
		d.LinksIn = append(d.LinksIn, linkRow{l.String(), ref{l.From.Name, tablePage(l.From)}, l.Required})
		seen[l.From] = true
	}
	seen[t] = true
	for _, x := range f.model.Tables {
		if seen[x] {
			near = append(near, x)
		}
	}
	d.Diagram = template.HTML(tableDiagram(near, "table "+t.Name+" and the tables linked with it"))
	return d
}

func additivity(c *model.Column) string {
	switch c.Additivity {
	case model.NonAdditive:
		return "nonadditive"
	case model.SemiAdditive:
		if c.SemiDate != nil {
			return "semiadditive over " + c.SemiDate.String()
		}
		return "semiadditive"
	}
	return ""
}
