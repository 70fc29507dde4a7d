package main

import (
	"errors"
	"fmt"
	"strings"

	"github.com/spf13/cobra"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/report"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/views"
	"github.com/rollwise/rollwise/dialects"
)

// viewsOptions are the flags of `rollwise views`.
type viewsOptions struct {
	models  []string
	dialect string
	out     string
	check   string
	schema  string
	// approximate is --approximate, as for run and sql.
	approximate bool
}

func newViewsCmd(e *env) *cobra.Command {
	o := &viewsOptions{}
	cmd := &cobra.Command{
		Use:   "views MODEL... [-d DIALECT] [--out DIR | --check DIR] [--schema NAME] [--approximate]",
		Short: "Write the DDL that publishes derived columns and view blocks as warehouse views",
		Long: `views prints CREATE VIEW statements that compute, in the warehouse, what the
model computes: a row-level view NAME` + views.RowViewSuffix + ` for each table with derived
columns (every row of the table once, with its derived columns), and a view
for each view block (the rows and values of 'rollwise run --view', total rows
included, told apart by the ` + dialects.GroupingColumn + ` column). The statements are
idempotent and ordered so that each view comes after what it reads.

With --out DIR it writes one file per view and a manifest.json, atomically: a
failure leaves DIR as it was. With --check DIR it compares DIR with what it
would write and exits 1 if they differ, listing each view that does.`,
		Example: `  rollwise views garden.roll
  rollwise views garden.roll --schema analytics --out warehouse/views
  rollwise views garden.roll --schema analytics --check warehouse/views`,
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := modelArgs(args); err != nil {
				return err
			}
			o.models = args
			if err := viewsFolderArgs(cmd, o); err != nil {
				return err
			}
			return runViews(e, o)
		},
	}
	f := cmd.Flags()
	onceStringVarP(f, &o.dialect, "dialect", "d", "duckdb", "SQL dialect: "+strings.Join(dialects.Names(), ", "))
	f.StringVar(&o.out, "out", "", "write one file per view and a manifest into DIR")
	f.StringVar(&o.check, "check", "", "compare DIR with what --out would write; exit 1 if they differ")
	f.StringVar(&o.schema, "schema", "", "create the views in schema NAME (which must exist)")
	f.BoolVar(&o.approximate, "approximate", false, approximateUsage+"; each view that does says so in its header")
	return cmd
}

func runViews(e *env, o *viewsOptions) error {
	if o.out != "" && o.check != "" {
		return failure.Usagef("--out writes a folder and --check compares one: give one of them")
	}
	d, err := dialects.Get(o.dialect)
	if err != nil {
		return failure.New(failure.Usage, err)
	}
	m, err := loadModel(e, o.models)
	if err != nil {
		return err
	}
	set, diags := views.Generate(m.Model, d, views.Options{Schema: o.schema, Approximate: o.approximate})
	printDiags(e, diags, m.Sources)
	if set == nil {
		return failure.Newf(failure.Findings, "no views written: %s", failure.CountErrors(diags))
	}
	for _, c := range set.Cautions {
		fmt.Fprintf(e.stderr, "caution: %s\n", c)
	}
	if len(set.Views) == 0 {
		fmt.Fprintln(e.stderr, "note: the model has no derived columns and no view blocks: there is nothing to publish")
	}
	if o.out != "" || o.check != "" {
		if err := viewFileNames(set); err != nil {
			return err
		}
	}
	switch {
	case o.check != "":
		drifts, err := views.Check(o.check, set)
		if err != nil {
			return failure.New(failure.Internal, err)
		}
		if len(drifts) == 0 {
			fmt.Fprintf(e.stderr, "ok: %s is up to date: %s\n", o.check, report.Count(len(set.Views), "view"))
			return nil
		}
		for _, dr := range drifts {
			fmt.Fprintln(e.stdout, dr)
		}
		return failure.Newf(failure.Findings, "%s differs from the model in %s; run 'rollwise views %s --out %s' to update it",
			o.check, report.Count(len(drifts), "place"), strings.Join(o.models, " ")+viewsFlags(o), o.check)
	case o.out != "":
		rep, err := views.Write(o.out, set)
		if errors.Is(err, views.ErrBusy) {
			return failure.New(failure.Input, err)
		}
		if err != nil {
			return failure.New(failure.Internal, err)
		}
		fmt.Fprintf(e.stderr, "ok: %s: %s; %s written, %d unchanged, %d removed\n",
			o.out, report.Count(len(set.Views), "view"), report.Count(len(rep.Written), "file"), len(rep.Unchanged), len(rep.Removed))
		for _, f := range rep.Foreign {
			fmt.Fprintf(e.stderr, "note: %s was not written by rollwise; it is left alone, and --check reports it\n", f)
		}
		return nil
	}
	fmt.Fprint(e.stdout, set.Script())
	return nil
}

// viewsFlags repeats the flags that change what views generates, for a
// message that shows the command to run.
func viewsFlags(o *viewsOptions) string {
	s := ""
	if o.dialect != "duckdb" {
		s += " -d " + o.dialect
	}
	if o.schema != "" {
		s += " --schema " + o.schema
	}
	if o.approximate {
		s += " --approximate"
	}
	return s
}
