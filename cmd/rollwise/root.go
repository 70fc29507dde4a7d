package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"strings"
	"syscall"

	"github.com/spf13/cobra"
)

// Exit codes, mapped in one place.
const (
	exitOK       = 0
	exitFindings = 1 // model or query errors, failed checks
	exitUsage    = 2
	exitInternal = 3
)

// exitError carries an exit code up to Main. A nil err means the message
// was already printed.
type exitError struct {
	code int
	err  error
}

func (e *exitError) Error() string {
	if e.err == nil {
		return ""
	}
	return e.err.Error()
}

func usageErr(format string, args ...any) error {
	return &exitError{code: exitUsage, err: fmt.Errorf(format, args...)}
}

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
	var ee *exitError
	if errors.As(err, &ee) {
		if ee.err != nil {
			fmt.Fprintf(stderr, "rollwise: %v\n", ee.err)
		}
		return ee.code
	}
	// Anything cobra itself rejects (unknown flag, missing argument) is a
	// usage error.
	fmt.Fprintf(stderr, "rollwise: %v\n", err)
	if strings.Contains(err.Error(), "unknown command") || strings.Contains(err.Error(), "flag") ||
		strings.Contains(err.Error(), "arg") {
		fmt.Fprintln(stderr, "run 'rollwise --help' for usage")
	}
	return exitUsage
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
