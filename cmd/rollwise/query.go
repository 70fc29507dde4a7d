package main

import (
	"fmt"
	"maps"

	"github.com/spf13/cobra"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/pipeline"
	"github.com/rollwise/rollwise/planner/model"
)

// queryOptions are the flags that say what to compute, shared by sql and
// run.
type queryOptions struct {
	models   []string
	measures []string
	by       []string
	where    string
	totals   string
	order    string
	limit    int
	view     string
	dialect  string
	// approximate allows a dialect to answer approximately what it
	// cannot answer exactly; the output then says so.
	approximate bool
}

func (o *queryOptions) addFlags(cmd *cobra.Command) {
	f := cmd.Flags()
	listVarP(f, &o.measures, "measures", "m", "measures to compute, comma-separated")
	listVarP(f, &o.by, "by", "b", "group columns, written table.column, comma-separated")
	whereVar(f, &o.where)
	onceStringVarP(f, &o.totals, "totals", "", "", "total rows: none, grand, rollup or all; default none, or with --view the view's own")
	onceStringVarP(f, &o.order, "order", "", "", "sort by keys, each a measure of -m or a column of -b, asc or desc: \"revenue desc, stores.city\"")
	onceIntVar(f, &o.limit, "limit", 0, "keep the first N detail rows (total rows stay)")
	f.StringVar(&o.view, "view", "", "compute a view block of the model instead of -m/-b/-w")
	onceStringVarP(f, &o.dialect, "dialect", "d", "duckdb", "SQL dialect")
	f.BoolVar(&o.approximate, "approximate", false, approximateUsage)
}

// approximateUsage describes --approximate (run, sql, views).
const approximateUsage = "compute approximately, and say so, what the dialect computes exactly only the slow way " +
	"(a median on Trino, BigQuery or SQL Server by its approximate aggregate instead of window functions) or cannot compute: SQLite's upper and lower beyond ASCII"

// request is the pipeline's request the flags make.
func (o *queryOptions) request() pipeline.Request {
	return pipeline.Request{Request: model.Request{Measures: o.measures, By: o.by, Where: o.where, Totals: o.totals,
		Order: o.order, Limit: o.limit, Names: optionNames}, View: o.view, Dialect: o.dialect, Approximate: o.approximate}
}

// compile loads the model and plans and renders the query, printing the
// diagnostics.
func compile(e *env, o *queryOptions) (*pipeline.Compiled, error) {
	r := o.request()
	if err := r.Check(); err != nil {
		return nil, err
	}
	m, err := loadModel(e, o.models)
	if err != nil {
		return nil, err
	}
	c, diags, err := pipeline.Compile(m.Model, r)
	src := maps.Clone(m.Sources)
	src[optionNames.Where] = o.where
	printDiags(e, diags, src)
	return c, err
}

func newSQLCmd(e *env) *cobra.Command {
	o := &queryOptions{}
	cmd := &cobra.Command{
		Use:   "sql MODEL... -m M1,M2 [-b T.C,...] [flags]",
		Short: "Print the SQL statement that computes measures",
		Example: `  rollwise sql garden.roll -m revenue,margin_rate -b plants.family --totals grand
  rollwise sql garden.roll -m revenue -b stores.region -w "sales.sold_on >= date '2026-01-01'"`,
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := modelArgs(args); err != nil {
				return err
			}
			o.models = args
			c, err := compile(e, o)
			if err != nil {
				return err
			}
			fmt.Fprintln(e.stdout, c.SQL+";")
			printCautions(e, c.Notes)
			return nil
		},
	}
	o.addFlags(cmd)
	return cmd
}

// optionNames are what diagnostics of a request call its parts: the
// options the user gave them with ("--by:1:9: ...", "--order names
// revenue twice").
var optionNames = model.PartNames{Measures: "--measures", By: "--by", Where: "--where",
	Totals: "--totals", Order: "--order", Limit: "--limit"}

// printCautions writes the notes of a result to stderr.
func printCautions(e *env, notes []string) {
	for _, c := range notes {
		fmt.Fprintf(e.stderr, "caution: %s\n", c)
	}
}
