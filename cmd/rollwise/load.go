package main

import (
	"strings"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/pipeline"
	"github.com/rollwise/rollwise/grammar"
)

// loadModel loads the model files (pipeline.Load) and prints their
// diagnostics to stderr.
func loadModel(e *env, paths []string) (*pipeline.Model, error) {
	m, diags, err := pipeline.Load(paths)
	if m != nil {
		printDiags(e, diags, m.Sources)
	}
	if err != nil {
		return nil, err
	}
	return m, nil
}

func printDiags(e *env, d grammar.Diagnostics, src grammar.Sources) {
	d.Print(e.stderr, src, isTerminal(e.stderr))
}

// modelArgs checks that at least one model path was given.
func modelArgs(args []string) error {
	if len(args) == 0 {
		return failure.Usagef("name a model file (or a folder of .roll files)")
	}
	for _, a := range args {
		if strings.HasPrefix(a, "-") {
			return failure.Usagef("unexpected %q", a)
		}
	}
	return nil
}
