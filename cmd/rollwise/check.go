package main

import (
	"fmt"

	"github.com/spf13/cobra"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/pipeline"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/report"
	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/plan"
)

type checkOptions struct {
	models []string
	// required asks to check the links declared required on the data,
	// read from the tables' files, data, or the database at dsn.
	required  bool
	data, dsn string
	// dialect, when given, also checks the model's names against the
	// engine's identifier limits and renders every view for it.
	dialect string
	live    liveFlags
}

func newCheckCmd(e *env) *cobra.Command {
	o := &checkOptions{}
	cmd := &cobra.Command{
		Use:   "check MODEL... [--required [--data DIR | --dsn URL]]",
		Short: "Check model files and report every error and warning",
		Example: `  rollwise check garden.roll
  rollwise check models/
  rollwise check tpch.roll --data /data/tpch   # also: do the links declared required hold?`,
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := modelArgs(args); err != nil {
				return err
			}
			o.models = args
			if o.dialect != "" {
				d, err := dialects.Get(o.dialect)
				if err != nil {
					return failure.New(failure.Usage, err)
				}
				o.dialect = d.Name()
			}
			if o.dsn != "" {
				if _, err := liveDialect(o.dsn, "", false, o.data); err != nil {
					return scrubDSN(o.dsn, err)
				}
			}
			o.required = o.required || o.data != "" || o.dsn != ""
			return scrubDSN(o.dsn, runCheck(e, o))
		},
	}
	onceStringVarP(cmd.Flags(), &o.dialect, "dialect", "d", "", "also check that every name fits the dialect's identifier limit (63 bytes on postgres, 64 characters on mysql, 128 on sqlserver) and that every view renders for it")
	cmd.Flags().BoolVar(&o.required, "required", false, "check on the data every promise of the model: links declared required find their row, keys (and semiadditive columns' key and date) are unique (tables read as run reads them)")
	cmd.Flags().StringVar(&o.data, "data", "", "with --required (implied): read each table from DIR/NAME.csv or DIR/NAME.parquet")
	o.live.add(cmd.Flags())
	cmd.Flags().StringVar(&o.dsn, "dsn", "", "with --required (implied): read the tables from a live database: postgres://..., mysql://... or sqlite:PATH")
	return cmd
}

func runCheck(e *env, o *checkOptions) error {
	restore := pipeline.LimitMemory()
	defer restore()
	loaded, err := loadModel(e, o.models)
	if err != nil {
		return err
	}
	m := loaded.Model
	// A view is a query: plan it, so that a view grouped by a column its
	// measures cannot reach fails here and not on first use.
	// With --dialect, render it too: a construct the engine cannot express
	// exactly (a variance on SQLite...) fails here and not in views.
	var d *dialects.Dialect
	if o.dialect != "" {
		d, _ = dialects.Get(o.dialect)
	}
	var diags grammar.Diagnostics
	for _, v := range m.Views {
		p, vd := plan.NewPlan(m.ViewQuery(v))
		for _, x := range vd {
			x.Message = fmt.Sprintf("view %s: %s", v.Name, x.Message)
		}
		diags.Append(vd)
		if d == nil || vd.HasErrors() {
			continue
		}
		if _, err := dialects.Render(p, d); err != nil {
			diags.Errorf(v.Pos, "dialect", "view %s: %v", v.Name, err).Suggestion =
				"change the view's measures, or publish it for another dialect"
		}
	}
	diags.Append(identTooLong(m, o.dialect))
	restore() // what follows reads data, not bounded by the model's size
	held := ""
	if o.required && !diags.HasErrors() {
		d, err := checkData(e.context(), m, o.data, o.dsn, o.live.options())
		if err != nil {
			return err
		}
		diags.Append(d)
		held = fmt.Sprintf("; on the data, %s and %s hold", report.Count(len(requiredLinks(m)), "required link"),
			report.Count(len(uniquenesses(m)), "uniqueness promise"))
	}
	if len(diags) > 0 {
		printDiags(e, diags, loaded.Sources)
	}
	if diags.HasErrors() {
		return failure.Newf(failure.Findings, "%s", failure.CountErrors(diags))
	}
	fmt.Fprintf(e.stderr, "ok: %s, %s, %s%s\n", report.Count(len(m.Tables), "table"), report.Count(len(m.Measures), "measure"), report.Count(len(m.Views), "view"), held)
	return nil
}
