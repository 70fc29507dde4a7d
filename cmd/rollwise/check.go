package main

import (
	"fmt"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner"

	"github.com/spf13/cobra"
)

type checkOptions struct {
	models []string
}

func newCheckCmd(e *env) *cobra.Command {
	o := &checkOptions{}
	return &cobra.Command{
		Use:   "check MODEL...",
		Short: "Check model files and report every error and warning",
		Example: `  rollwise check garden.roll
  rollwise check models/`,
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := modelArgs(args); err != nil {
				return err
			}
			o.models = args
			return runCheck(e, o)
		},
	}
}

func runCheck(e *env, o *checkOptions) error {
	m, src, err := loadModel(e, o.models)
	if err != nil {
		return err
	}
	// A view is a query: plan it, so that a view grouped by a column its
	// measures cannot reach fails here and not on first use.
	var diags grammar.Diagnostics
	for _, v := range m.Views {
		_, d := planner.NewPlan(m.ViewQuery(v))
		for _, x := range d {
			x.Message = fmt.Sprintf("view %s: %s", v.Name, x.Message)
		}
		diags.Append(d)
	}
	if len(diags) > 0 {
		printDiags(e, diags, src)
	}
	if diags.HasErrors() {
		return &exitError{code: exitFindings, err: fmt.Errorf("%s", countErrors(diags))}
	}
	fmt.Fprintf(e.stderr, "ok: %d tables, %d measures, %d views\n", len(m.Tables), len(m.Measures), len(m.Views))
	return nil
}
