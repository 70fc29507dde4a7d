package main

import (
	"encoding/json"
	"fmt"
	"slices"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/planner/model"
)

// listKinds are what `rollwise list` can show, in the order of a full list.
var listKinds = []string{"measures", "tables", "links", "views"}

type listOptions struct {
	models []string
	kinds  []string
	format string
}

func newListCmd(e *env) *cobra.Command {
	o := &listOptions{}
	cmd := &cobra.Command{
		Use:   "list MODEL... [measures|tables|links|views]",
		Short: "List the measures, tables, links and views a model holds",
		Example: `  rollwise list garden.roll                 # everything
  rollwise list garden.roll measures        # names, types, formats, descriptions
  rollwise list models/ tables --format json`,
		RunE: func(cmd *cobra.Command, args []string) error {
			for len(args) > 0 && slices.Contains(listKinds, args[len(args)-1]) {
				o.kinds = append([]string{args[len(args)-1]}, o.kinds...)
				args = args[:len(args)-1]
			}
			if err := modelArgs(args); err != nil {
				return err
			}
			o.models = args
			if len(o.kinds) == 0 {
				o.kinds = listKinds
			}
			if o.format != "table" && o.format != "json" {
				return failure.Usagef("--format takes table or json, not %q", o.format)
			}
			return runList(e, o)
		},
	}
	onceStringVarP(cmd.Flags(), &o.format, "format", "", "table", "table or json")
	return cmd
}

// listed is what list shows, by kind; each entry is a JSON object.
type listed struct {
	Measures []listMeasure `json:"measures,omitempty"`
	Tables   []listTable   `json:"tables,omitempty"`
	Links    []listLink    `json:"links,omitempty"`
	Views    []listView    `json:"views,omitempty"`
}

type listMeasure struct {
	Name        string `json:"name"`
	Type        string `json:"type"`
	Format      string `json:"format"`
	Description string `json:"description"`
	Definition  string `json:"definition"`
	At          string `json:"at"`
}

type listTable struct {
	Name     string   `json:"name"`
	Relation string   `json:"relation"`
	File     string   `json:"file"`
	Key      []string `json:"key"`
	Columns  int      `json:"columns"`
	At       string   `json:"at"`
}

type listLink struct {
	From     string `json:"from"`
	To       string `json:"to"`
	Required bool   `json:"required"`
}

type listView struct {
	Name     string   `json:"name"`
	Measures []string `json:"measures"`
	By       []string `json:"by"`
	Totals   string   `json:"totals"`
	At       string   `json:"at"`
}

func runList(e *env, o *listOptions) error {
	m, err := loadModel(e, o.models)
	if err != nil {
		return err
	}
	var l listed
	for _, k := range o.kinds {
		switch k {
		case "measures":
			for _, x := range m.Measures {
				l.Measures = append(l.Measures, listMeasure{Name: x.Name, Type: x.Type.String(), Format: string(x.Format),
					Description: x.Doc, Definition: model.Text(x.Expr), At: x.Pos.String()})
			}
		case "tables":
			for _, t := range m.Tables {
				lt := listTable{Name: t.Name, Relation: strings.Join(t.Relation, "."), File: t.File, Key: []string{}, At: t.Pos.String()}
				for _, c := range t.Key {
					lt.Key = append(lt.Key, c.Name)
				}
				lt.Columns = len(t.Columns)
				l.Tables = append(l.Tables, lt)
			}
		case "links":
			for _, t := range m.Tables {
				for _, k := range t.Links {
					from, to := linkEnds(k)
					l.Links = append(l.Links, listLink{From: from, To: to, Required: k.Required})
				}
			}
		case "views":
			for _, v := range m.Views {
				lv := listView{Name: v.Name, Totals: string(v.Totals), At: v.Pos.String(), Measures: []string{}, By: []string{}}
				for _, x := range v.Measures {
					lv.Measures = append(lv.Measures, x.Name)
				}
				for _, c := range v.By {
					lv.By = append(lv.By, c.String())
				}
				l.Views = append(l.Views, lv)
			}
		}
	}
	if o.format == "json" {
		enc := json.NewEncoder(e.stdout)
		enc.SetIndent("", "  ")
		enc.SetEscapeHTML(false)
		return enc.Encode(l)
	}
	return writeListTables(e, o.kinds, &l)
}

// linkEnds spells a link's two ends: "sales.store_id" and "stores.id", or
// "(a, b)" lists for a link over several columns.
func linkEnds(k *model.Link) (string, string) {
	side := func(cols []*model.Column) string {
		var names []string
		for _, c := range cols {
			names = append(names, c.String())
		}
		if len(names) == 1 {
			return names[0]
		}
		return "(" + strings.Join(names, ", ") + ")"
	}
	return side(k.FromCols), side(k.ToCols)
}

// writeListTables prints each kind as an aligned table under a heading.
func writeListTables(e *env, kinds []string, l *listed) error {
	w := tabwriter.NewWriter(e.stdout, 0, 0, 2, ' ', 0)
	for i, k := range kinds {
		if i > 0 {
			fmt.Fprintln(w)
		}
		switch k {
		case "measures":
			fmt.Fprintf(w, "measures (%d)\nNAME\tTYPE\tFORMAT\tDESCRIPTION\n", len(l.Measures))
			for _, x := range l.Measures {
				fmt.Fprintf(w, "%s\t%s\t%s\t%s\n", x.Name, x.Type, dash(x.Format), dash(x.Description))
			}
		case "tables":
			fmt.Fprintf(w, "tables (%d)\nNAME\tRELATION\tKEY\tCOLUMNS\tFILE\n", len(l.Tables))
			for _, t := range l.Tables {
				fmt.Fprintf(w, "%s\t%s\t%s\t%d\t%s\n", t.Name, t.Relation, dash(strings.Join(t.Key, ", ")), t.Columns, dash(t.File))
			}
		case "links":
			fmt.Fprintf(w, "links (%d)\nFROM\tTO\tREQUIRED\n", len(l.Links))
			for _, k := range l.Links {
				req := "no"
				if k.Required {
					req = "yes"
				}
				fmt.Fprintf(w, "%s\t%s\t%s\n", k.From, k.To, req)
			}
		case "views":
			fmt.Fprintf(w, "views (%d)\nNAME\tMEASURES\tBY\tTOTALS\n", len(l.Views))
			for _, v := range l.Views {
				fmt.Fprintf(w, "%s\t%s\t%s\t%s\n", v.Name, strings.Join(v.Measures, ", "), dash(strings.Join(v.By, ", ")), v.Totals)
			}
		}
	}
	return w.Flush()
}

func dash(s string) string {
	if s == "" {
		return "-"
	}
	return s
}
