package main

import (
	"context"
	"fmt"
	"io"
	"os"
	"os/signal"
	"syscall"

	"github.com/spf13/cobra"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
)

// Exit codes, mapped from the kinds of failure in one place (exitCode).
const (
	exitOK       = 0
	exitFindings = 1 // model or query errors, failed checks, unusable data
	exitUsage    = 2
	exitInternal = 3
)

// env is what a command writes to and reads from.
type env struct {
	stdin          io.Reader
	stdout, stderr io.Writer
	// ctx ends on an interrupt (SIGINT, SIGTERM), which cancels a live
	// statement on the server.
	ctx context.Context
}

// context is the command's context (never nil).
func (e *env) context() context.Context {
	if e.ctx == nil {
		return context.Background()
	}
	return e.ctx
}

// color reports whether w is a terminal (colour and decoration are for
// people only).
func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	if !ok {
		return false
	}
	fi, err := f.Stat()
	return err == nil && fi.Mode()&os.ModeCharDevice != 0
}

// Main runs the command line and returns the exit code. It never panics
// on bad input: an unexpected panic is reported as an internal error.
func Main(args []string, stdin io.Reader, stdout, stderr io.Writer) (code int) {
	defer func() {
		if r := recover(); r != nil {
			fmt.Fprintf(stderr, "rollwise: internal error: %v\nplease report it with the command that caused it\n", r)
			code = exitInternal
		}
	}()
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	defer stop()
	e := &env{stdin: stdin, stdout: stdout, stderr: stderr, ctx: ctx}
	root := newRoot(e)
	root.SetArgs(args)
	root.SetIn(stdin)
	root.SetOut(stdout)
	root.SetErr(stderr)
	err := root.Execute()
	if err == nil {
		return exitOK
	}
	k, ours := failure.KindOf(err)
	if !ours {
		// Only cobra's own errors (an unknown command, a missing argument)
		// have no kind: every error of rollwise's code has one, and flag
		// errors are given one by flagError.
		k = failure.Usage
		err = fmt.Errorf("%w\nrun 'rollwise --help' for usage", err)
	}
	if msg := err.Error(); msg != "" {
		fmt.Fprintf(stderr, "rollwise: %s\n", msg)
	}
	return exitCode(k)
}

// exitCode is the exit status of an error of kind k: the one place where
// errors become exit codes.
func exitCode(k failure.Kind) int {
	switch k {
	case failure.Usage:
		return exitUsage
	case failure.Findings, failure.Input:
		return exitFindings
	}
	return exitInternal
}

// flagError makes an error in parsing the flags a usage error, with the
// hint to see the help.
func flagError(_ *cobra.Command, err error) error {
	return failure.Newf(failure.Usage, "%w\nrun 'rollwise --help' for usage", err)
}

func newRoot(e *env) *cobra.Command {
	root := &cobra.Command{
		Use:   "rollwise",
		Short: "Compile measure definitions into SQL with correct totals",
		Long: `rollwise compiles measures written once in .roll files into SQL for any
report grain, with subtotals and totals that are re-evaluated, never summed.

Start with the demo:
  rollwise demo
  rollwise demo --dir garden && rollwise run garden/garden.roll -m revenue,margin_rate -b plants.family --totals grand`,
		SilenceUsage:  true,
		SilenceErrors: true,
		Version:       version(),
	}
	root.SetFlagErrorFunc(flagError)
	root.SetVersionTemplate("rollwise {{.Version}}\n")
	root.CompletionOptions.HiddenDefaultCmd = false
	root.AddCommand(newCheckCmd(e), newSQLCmd(e), newRunCmd(e), newDemoCmd(e), newViewsCmd(e), newVerifyCmd(e), newListCmd(e), newLSPCmd(e), newDocsCmd(e), newExplainCmd(e), newFmtCmd(e))
	for _, c := range root.Commands() {
		if c.Name() != "demo" && c.Name() != "lsp" {
			addCompletions(c)
		}
	}
	return root
}
