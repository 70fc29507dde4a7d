package main

import (
	"context"

	"github.com/spf13/cobra"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/langserver"
	"github.com/rollwise/rollwise/grammar/format"
)

func newLSPCmd(e *env) *cobra.Command {
	return &cobra.Command{
		Use:   "lsp",
		Short: "Serve editors over the Language Server Protocol on standard input and output",
		Long: `rollwise lsp is a language server for .roll files: an editor that speaks the
Language Server Protocol starts it and talks to it on standard input and
output. It checks the model as it is typed (the messages of rollwise check,
with their positions and hints; the model is every .roll file of the
document's folder), shows a measure's definition, type, description,
iteration tables and additivity on hover, goes to where a name is declared
(of a measure, of a table, of a column), finds its uses, completes
measure names and table.column after a dot, and formats a document as
rollwise fmt does.`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			return langserver.Serve(context.Background(), e.stdin, e.stdout, formatText)
		},
	}
}

// formatText is the language server's formatter: rollwise fmt's layout,
// or the parse errors as an error.
func formatText(name, src string) (string, error) {
	out, diags := format.Source(name, src)
	if diags != nil {
		return "", diags
	}
	return out, nil
}
