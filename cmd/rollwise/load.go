package main

import (
	"io"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
)

// loadModel reads, parses and resolves model files (a folder stands for
// the .roll files in it). Diagnostics are printed to stderr; the error is
// of kind Findings when there are errors.
func loadModel(e *env, paths []string) (*model.Model, grammar.Sources, error) {
	src := grammar.Sources{}
	var files []*grammar.File
	var diags grammar.Diagnostics
	for _, p := range paths {
		names := modelFileNames(p)
		if len(names) == 0 {
			return nil, nil, failure.Usagef("folder %s holds no .roll files", p)
		}
		for _, name := range names {
			b, err := readModelFile(name)
			if err != nil {
				return nil, nil, err
			}
			src[name] = string(b)
			f, d := grammar.Parse(name, string(b))
			diags.Append(d)
			files = append(files, f)
		}
	}
	var m *model.Model
	if !diags.HasErrors() {
		var d grammar.Diagnostics
		m, d = model.Load(files)
		diags.Append(d)
	}
	printDiags(e, diags, src)
	if diags.HasErrors() {
		return nil, src, failure.Newf(failure.Findings, "%s", failure.CountErrors(diags))
	}
	return m, src, nil
}

// modelFileNames are the model files a path stands for: itself, or, for a
// folder, the .roll files in it, sorted (none for a folder without).
func modelFileNames(p string) []string {
	if fi, err := os.Stat(p); err != nil || !fi.IsDir() {
		return []string{p}
	}
	names, _ := filepath.Glob(filepath.Join(p, "*.roll"))
	sort.Strings(names)
	return names
}

// readModelFile reads one model file, at most grammar.MaxSourceBytes+1
// bytes of it: a name that leads to an endless file (a symlink to
// /dev/zero, a pipe) stops at the cap instead of filling the memory.
func readModelFile(name string) ([]byte, error) {
	f, err := os.Open(name)
	if err != nil {
		return nil, failure.Usagef("cannot read the model: %v", err)
	}
	defer f.Close()
	b, err := io.ReadAll(io.LimitReader(f, grammar.MaxSourceBytes+1))
	if err != nil {
		return nil, failure.Usagef("cannot read the model: %v", err)
	}
	if len(b) > grammar.MaxSourceBytes {
		return nil, failure.Usagef("%s is larger than %d bytes, the largest model file accepted", name, grammar.MaxSourceBytes)
	}
	return b, nil
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
