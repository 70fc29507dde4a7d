package main

import (
	"fmt"

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
	m, _, err := loadModel(e, o.models)
	if err != nil {
		return err
	}
	fmt.Fprintf(e.stderr, "ok: %d tables, %d measures, %d views\n", len(m.Tables), len(m.Measures), len(m.Views))
	return nil
}
