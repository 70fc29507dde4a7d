// Package goldencases lists the cases of the golden SQL: the dialects
// package compares their SQL text with testdata/dialects/golden (no
// engine), and cmd/rollwise's execution suite runs each of them on DuckDB
// and the live engines. One list, so that both check the same cases.
package goldencases

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strings"
)

// Case is one case: its set, its name, the model files it runs on and its
// arguments after them (paths from the repository's root).
type Case struct {
	Set, Name string
	Models    []string
	Args      []string
}

// sets are the case folders and the models their cases run on.
var sets = []struct {
	name, dir string
	models    []string
}{
	{"shop", "testdata/sql", []string{"testdata/exec/shop.roll", "testdata/exec/edits.roll"}},
	{"lab", "testdata/dialects/lab", []string{"testdata/dialects/lab.roll"}},
	{"hostile", "testdata/dialects/hostile", []string{"testdata/dialects/hostile.roll"}},
	{"time", "testdata/dialects/time", []string{"testdata/exec/time.roll"}},
}

// Read reads the cases of every set under root, the repository's root.
// Each case file's first line is a JSON array of arguments (anything
// after a "----" line is not read).
func Read(root string) ([]Case, error) {
	var out []Case
	for _, s := range sets {
		files, _ := filepath.Glob(filepath.Join(root, s.dir, "*.test"))
		if len(files) == 0 {
			return nil, fmt.Errorf("no cases in %s", s.dir)
		}
		for _, f := range files {
			b, err := os.ReadFile(f)
			if err != nil {
				return nil, err
			}
			head, _, _ := strings.Cut(string(b), "----\n")
			var args []string
			if err := json.Unmarshal([]byte(head), &args); err != nil {
				return nil, fmt.Errorf("%s: the first line must be a JSON array of arguments: %v", f, err)
			}
			out = append(out, Case{Set: s.name, Name: strings.TrimSuffix(filepath.Base(f), ".test"), Models: s.models, Args: args})
		}
	}
	return out, nil
}
