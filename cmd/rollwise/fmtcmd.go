package main

import (
	"fmt"
	"io"

	"github.com/spf13/cobra"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/durable"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/pipeline"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/report"
	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/grammar/format"
)

type fmtOptions struct {
	paths []string
	// write puts the formatted text back in each file that changes;
	// check only lists those files.
	write, check bool
}

// stdinName is how messages name standard input (the path "-").
const stdinName = "<stdin>"

func newFmtCmd(e *env) *cobra.Command {
	o := &fmtOptions{}
	cmd := &cobra.Command{
		Use:   "fmt FILE... [-w | --check]",
		Short: "Lay model files out in the one canonical layout",
		Long: `rollwise fmt lays model files out in one canonical layout: one declaration
per line (a table set off by blank lines), a table's columns, measures and
views aligned in column blocks, keywords in lower case, single spaces
between tokens. Comments stay where they were, and so do the line breaks
written inside a declaration. Only white space and the case of keywords
change, so the model means what it meant; formatting twice changes nothing.

Without -w or --check the formatted text goes to stdout (FILE "-" reads
standard input). A file that does not parse is an error (exit 1) and
nothing is written.`,
		Example: `  rollwise fmt shop.roll             # print the formatted model
  rollwise fmt -w models/            # format every .roll file of the folder in place
  rollwise fmt --check models/       # in CI: list the files that are not formatted, exit 1 if any`,
		RunE: func(cmd *cobra.Command, args []string) error {
			if len(args) == 0 {
				return failure.Usagef("name a model file (or a folder of .roll files, or - for standard input)")
			}
			if o.write && o.check {
				return failure.Usagef("-w and --check do not go together: -w writes the files, --check only lists those that would change")
			}
			o.paths = args
			return runFmt(e, o)
		},
	}
	cmd.Flags().BoolVarP(&o.write, "write", "w", false, "write the formatted text back to each file that changes, atomically (a new file in the same folder, renamed over the old)")
	cmd.Flags().BoolVar(&o.check, "check", false, "write nothing: list the files whose layout would change on stdout, and exit 1 if there are any")
	return cmd
}

// fmtFile is one file and its formatted text.
type fmtFile struct {
	name, src, out string
}

func runFmt(e *env, o *fmtOptions) error {
	files, err := formatFiles(e, o)
	if err != nil {
		return err
	}
	changed := 0
	for _, f := range files {
		if f.out == f.src {
			continue
		}
		changed++
		switch {
		case o.check:
			fmt.Fprintln(e.stdout, f.name)
		case o.write:
			if err := durable.Replace(f.name, []byte(f.out)); err != nil {
				return failure.Newf(failure.Input, "cannot write %s: %v", f.name, err)
			}
		}
	}
	switch {
	case o.check && changed > 0:
		return failure.Newf(failure.Findings, "%s of %d not formatted; rollwise fmt -w formats them", report.Count(changed, "file"), len(files))
	case o.check:
		fmt.Fprintf(e.stderr, "ok: %s, all formatted\n", report.Count(len(files), "file"))
	case o.write:
		fmt.Fprintf(e.stderr, "ok: %s, %d reformatted\n", report.Count(len(files), "file"), changed)
	default:
		for _, f := range files {
			io.WriteString(e.stdout, f.out)
		}
	}
	return nil
}

// formatFiles reads and formats every file the paths stand for (a
// folder: its .roll files). When one does not parse, the errors are
// printed and it fails: then nothing is to be written.
func formatFiles(e *env, o *fmtOptions) ([]fmtFile, error) {
	var files []fmtFile
	src := grammar.Sources{}
	var diags grammar.Diagnostics
	for _, p := range o.paths {
		names := []string{stdinName}
		if p != "-" {
			names = pipeline.FileNames(p)
		} else if o.write {
			return nil, failure.Usagef("-w cannot write standard input back; without -w the formatted text goes to stdout")
		}
		if len(names) == 0 {
			return nil, failure.Usagef("folder %s holds no .roll files", p)
		}
		for _, name := range names {
			if _, seen := src[name]; seen {
				continue
			}
			b, err := readFmtInput(e, name)
			if err != nil {
				return nil, err
			}
			out, d := format.Source(name, string(b))
			src[name] = string(b)
			diags.Append(d)
			files = append(files, fmtFile{name: name, src: string(b), out: out})
		}
	}
	if diags.HasErrors() {
		printDiags(e, diags, src)
		return nil, failure.Newf(failure.Findings, "%s; nothing was formatted", failure.CountErrors(diags))
	}
	return files, nil
}

// readFmtInput reads a model file, or standard input, with the bound on
// a model file's size.
func readFmtInput(e *env, name string) ([]byte, error) {
	if name != stdinName {
		return pipeline.ReadFile(name)
	}
	b, err := io.ReadAll(io.LimitReader(e.stdin, grammar.MaxSourceBytes+1))
	if err != nil {
		return nil, failure.Usagef("cannot read standard input: %v", err)
	}
	if len(b) > grammar.MaxSourceBytes {
		return nil, failure.Usagef("standard input is larger than %d bytes, the largest model file accepted", grammar.MaxSourceBytes)
	}
	return b, nil
}
