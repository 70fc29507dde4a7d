package main

import (
	"fmt"

	"github.com/spf13/cobra"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
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

// compiled is a planned and rendered query.
type compiled struct {
	model *model.Model
	query *model.Query
	plan  *plan.Plan
	sql   string
}

// compile loads the model and plans and renders the query.
func compile(e *env, o *queryOptions) (*compiled, error) {
	d, err := dialects.Get(o.dialect)
	if err != nil {
		return nil, failure.New(failure.Usage, err)
	}
	if o.limit < 0 {
		return nil, failure.Usagef("--limit must be a positive number, not %d", o.limit)
	}
	m, src, err := loadModel(e, o.models)
	if err != nil {
		return nil, err
	}
	var q *model.Query
	var diags grammar.Diagnostics
	if o.view != "" {
		if len(o.measures)+len(o.by) > 0 || o.where != "" {
			return nil, failure.Usagef("--view computes the view as declared; leave out -m, -b and -w")
		}
		var v *model.View
		for _, x := range m.Views {
			if x.Name == o.view {
				v = x
			}
		}
		if v == nil {
			var names []string
			for _, x := range m.Views {
				names = append(names, x.Name)
			}
			msg := fmt.Sprintf("the model has no view %q", o.view)
			if near := grammar.Closest(o.view, names); near != "" {
				msg += fmt.Sprintf("; did you mean %q?", near)
			}
			return nil, failure.Newf(failure.Findings, "%s", msg)
		}
		q = m.ViewQuery(v)
		diags = q.Override(model.Request{Totals: o.totals, Order: o.order, Limit: o.limit, Names: optionNames})
	} else {
		q, diags = m.NewQuery(model.Request{Measures: o.measures, By: o.by, Where: o.where,
			Totals: o.totals, Order: o.order, Limit: o.limit, Names: optionNames})
	}
	src[optionNames.Where] = o.where
	if !diags.HasErrors() {
		var p *plan.Plan
		var pd grammar.Diagnostics
		p, pd = plan.NewPlan(q)
		diags.Append(pd)
		if p != nil {
			printDiags(e, diags, src)
			sql, note, err := dialects.RenderWith(p, d, dialects.Options{Approximate: o.approximate})
			if err != nil {
				return nil, failure.New(failure.Findings, err)
			}
			if note != "" {
				p.Cautions = append(p.Cautions, note)
			}
			return &compiled{model: m, query: q, plan: p, sql: sql}, nil
		}
	}
	printDiags(e, diags, src)
	return nil, failure.Diagnostics(diags)
}

// optionNames are what diagnostics of a request call its parts: the
// options the user gave them with ("--by:1:9: ...", "--order names
// revenue twice").
var optionNames = model.PartNames{Measures: "--measures", By: "--by", Where: "--where",
	Totals: "--totals", Order: "--order", Limit: "--limit"}

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
			fmt.Fprintln(e.stdout, c.sql+";")
			printCautions(e, c.plan)
			return nil
		},
	}
	o.addFlags(cmd)
	return cmd
}

func printCautions(e *env, p *plan.Plan) {
	for _, c := range p.Cautions {
		fmt.Fprintf(e.stderr, "caution: %s\n", c)
	}
}
