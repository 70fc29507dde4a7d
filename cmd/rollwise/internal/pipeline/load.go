// Package pipeline is the one way from model files to SQL. Load reads,
// parses and resolves model files into a model; Compile turns a request
// (measures, groups, filter, totals, order and limit, or a view block)
// into the query, its plan, the SQL of a dialect and the notes the reader
// of the result must see. Every command goes through it; it prints
// nothing: diagnostics and errors are returned.
package pipeline

import (
	"io"
	"os"
	"path/filepath"
	"runtime/debug"
	"slices"
	"sort"
	"strings"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
)

// Source is one model file: its name and its text.
type Source struct{ Name, Text string }

// Model is a resolved model and the text of its files, which diagnostics
// quote.
type Model struct {
	*model.Model
	Sources grammar.Sources
}

// Load reads, parses and resolves the model files paths stand for (a
// folder stands for the .roll files in it). The diagnostics hold every
// error and warning. The error is a usage error when a path cannot be
// read or the model is over a size limit (bytes, tables, views), and of
// kind Findings when the model has errors; the Model is then nil or holds
// only the sources, for printing the diagnostics.
func Load(paths []string) (*Model, grammar.Diagnostics, error) {
	files, err := Read(paths)
	if err != nil {
		return nil, nil, err
	}
	src := grammar.Sources{}
	for _, f := range files {
		src[f.Name] = f.Text
	}
	m, diags := resolve(files, false)
	if overLimit(diags) {
		return &Model{Sources: src}, diags, failure.Usagef("%s", failure.CountErrors(diags))
	}
	if diags.HasErrors() {
		return &Model{Sources: src}, diags, failure.Newf(failure.Findings, "%s", failure.CountErrors(diags))
	}
	return &Model{Model: m, Sources: src}, diags, nil
}

// Read reads the model files paths stand for, in order: a file, or for a
// folder the .roll files in it, sorted. An unreadable path, a folder
// without model files and files holding more than grammar.MaxSourceBytes
// in all are usage errors: the cap bounds the whole model, not each file,
// so that no set of files makes check go past its bounds.
func Read(paths []string) ([]Source, error) {
	var out []Source
	left := grammar.MaxSourceBytes
	for _, p := range paths {
		names := FileNames(p)
		if len(names) == 0 {
			return nil, failure.Usagef("folder %s holds no .roll files", p)
		}
		for _, name := range names {
			text, err := readText(name, left)
			if err != nil {
				return nil, err
			}
			if len(text) > left {
				if len(out) == 0 {
					return nil, failure.Usagef("%s is larger than %d bytes, the largest model file accepted; %s", name, grammar.MaxSourceBytes, tooLargeHint)
				}
				return nil, failure.Usagef("the model's files hold more than %d bytes altogether (%s and those before it), the largest model accepted; %s", grammar.MaxSourceBytes, name, tooLargeHint)
			}
			left -= len(text)
			out = append(out, Source{Name: name, Text: text})
		}
	}
	return out, nil
}

// tooLargeHint says what to do with a model over the cap.
const tooLargeHint = "split it into smaller models, each read on its own (the cap keeps check within 5 s and 500 MB; see docs/cli.md, Safety)"

// overLimit says whether the diagnostics refuse a model for declaring
// more tables, views or names than a model may (grammar.MaxTables,
// grammar.MaxViews, grammar.MaxNames): like a model over the size cap, a
// usage error.
func overLimit(diags grammar.Diagnostics) bool {
	for _, d := range diags.Errors() {
		if slices.Contains(grammar.LimitCodes, d.Code) {
			return true
		}
	}
	return false
}

// Resolve parses the files and resolves them into a model. When a file
// does not parse, the diagnostics are the parse errors and the model is
// resolved, as far as it goes, from the files that parse (for an editor's
// hover and completion while one file is being typed). The model is
// whole only when the diagnostics hold no error. The files after one that
// takes the model past a limit on what it declares (grammar.MaxTables,
// grammar.MaxViews, grammar.MaxNames) are not parsed.
func Resolve(files []Source) (*model.Model, grammar.Diagnostics) { return resolve(files, true) }

// resolve is Resolve; a model that does not parse is resolved as far as
// it goes only when partial is set (the command line has no use for it:
// at the size cap that took a second or two more to refuse a model).
func resolve(files []Source, partial bool) (*model.Model, grammar.Diagnostics) {
	var parsed []*grammar.File
	var diags grammar.Diagnostics
	var declared grammar.Declared
	for _, s := range files {
		// Lazily: the measures' syntax trees are made one at a time by
		// the resolver, never all held at once.
		f, d := grammar.ParseLazyIn(s.Name, s.Text, &declared)
		diags.Append(d)
		if f != nil {
			parsed = append(parsed, f)
		}
		if declared.Over {
			break
		}
	}
	if diags.HasErrors() {
		if !partial {
			return nil, diags
		}
		m, _ := model.Load(parsed)
		return m, diags
	}
	m, d := model.Load(parsed)
	diags.Append(d)
	return m, diags
}

// CheckMemory is the soft limit on the Go heap (debug.SetMemoryLimit)
// while a model is checked: at the size cap the resolved model is some
// 250 MB, and the garbage collector's default goal, twice what is live,
// let the peak reach 700 MB; under the limit it collects sooner instead,
// for a little more CPU, and the peak stays near 450 MB (issue 17 item 5;
// docs/cli.md, Safety). A soft limit never fails: a model that needs
// more only costs more collections.
const CheckMemory = 420 << 20

// LimitMemory sets CheckMemory as the soft memory limit, unless the
// GOMEMLIMIT environment variable sets one, and returns the function that
// puts back the limit before.
func LimitMemory() (restore func()) {
	if os.Getenv("GOMEMLIMIT") != "" {
		return func() {}
	}
	before := debug.SetMemoryLimit(CheckMemory)
	return func() { debug.SetMemoryLimit(before) }
}

// FileNames are the model files a path stands for: itself, or, for a
// folder, the .roll files in it, sorted (none for a folder without).
func FileNames(p string) []string {
	if fi, err := os.Stat(p); err != nil || !fi.IsDir() {
		return []string{p}
	}
	names, _ := filepath.Glob(filepath.Join(p, "*.roll"))
	sort.Strings(names)
	return names
}

// ReadFile reads one model file, at most grammar.MaxSourceBytes+1 bytes
// of it: a name that leads to an endless file (a symlink to /dev/zero, a
// pipe) stops at the cap instead of filling the memory.
func ReadFile(name string) ([]byte, error) {
	text, err := readText(name, grammar.MaxSourceBytes)
	if err != nil {
		return nil, err
	}
	if len(text) > grammar.MaxSourceBytes {
		return nil, failure.Usagef("%s is larger than %d bytes, the largest model file accepted; %s", name, grammar.MaxSourceBytes, tooLargeHint)
	}
	return []byte(text), nil
}

// readText reads at most limit+1 bytes of the file name into one string,
// sized from the file's length where it has one (so the text is not
// copied as a growing buffer would be, then once more into a string).
func readText(name string, limit int) (string, error) {
	f, err := os.Open(name)
	if err != nil {
		return "", failure.Usagef("cannot read the model: %v", err)
	}
	defer f.Close()
	var b strings.Builder
	if fi, err := f.Stat(); err == nil && fi.Mode().IsRegular() {
		b.Grow(int(min(fi.Size(), int64(limit))) + 1)
	}
	if _, err := io.Copy(&b, io.LimitReader(f, int64(limit)+1)); err != nil {
		return "", failure.Usagef("cannot read the model: %v", err)
	}
	return b.String(), nil
}
