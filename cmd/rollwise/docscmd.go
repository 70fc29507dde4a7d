package main

import (
	"errors"
	"fmt"

	"github.com/spf13/cobra"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/catalog"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/report"
)

// docsOptions are the flags of `rollwise docs`.
type docsOptions struct {
	models []string
	out    string
}

func newDocsCmd(e *env) *cobra.Command {
	o := &docsOptions{}
	cmd := &cobra.Command{
		Use:   "docs MODEL... --out DIR",
		Short: "Write a static HTML catalog of the model's measures and tables",
		Long: `docs writes a catalog of the model into DIR as plain HTML pages with a style
sheet: no script, nothing fetched when the pages are viewed. index.html lists
the measures, tables and views and draws the tables with their links; each
measure has a page with its definition, description, format, the tables and
columns it reads, the measures it builds on and those built on it, and a
graph of its dependencies; each table has a page with its columns, key and
links. The same model always gives the same files.

DIR is replaced as a whole: the catalog is written beside it and renamed
into place. A DIR that holds files docs did not write is refused.`,
		Example: `  rollwise docs garden.roll --out catalog
  rollwise docs models/ --out site/catalog`,
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := modelArgs(args); err != nil {
				return err
			}
			o.models = args
			return runDocs(e, o)
		},
	}
	cmd.Flags().StringVar(&o.out, "out", "", "the folder to write the catalog into (required)")
	return cmd
}

func runDocs(e *env, o *docsOptions) error {
	if o.out == "" {
		return failure.Usagef("name the folder to write the catalog into: --out DIR")
	}
	m, err := loadModel(e, o.models)
	if err != nil {
		return err
	}
	files, err := catalog.Build(m.Model, m.Sources)
	if err != nil {
		return failure.New(failure.Internal, err)
	}
	if err := catalog.Write(o.out, files); err != nil {
		if errors.Is(err, catalog.ErrForeign) {
			return failure.New(failure.Input, err)
		}
		return failure.New(failure.Internal, err)
	}
	fmt.Fprintf(e.stderr, "ok: %s: catalog of %s and %s, %s written; open %s/index.html\n", o.out,
		report.Count(len(m.Measures), "measure"), report.Count(len(m.Tables), "table"), report.Count(len(files), "file"), o.out)
	return nil
}
