package main

import (
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strings"
	"testing"

	"pgregory.net/rapid"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/reference/casegen"
)

// TestFmtKeepsCheckAndSQL: over the generator's random models,
// formatting changes nothing that check and sql say (the same
// diagnostics, the same SQL for each of the case's queries).
func TestFmtKeepsCheckAndSQL(t *testing.T) {
	t.Parallel()
	checkCases(t, 60, func(rt *rapid.T) {
		c := casegen.Generator(casegen.DefaultOptions).Draw(rt, "case")
		var queries [][]string
		for _, q := range c.Queries {
			queries = append(queries, q.Args())
		}
		if msg := fmtKeepsMeaning(t, map[string]string{casegen.ModelFile: c.Model}, queries); msg != "" {
			rt.Fatalf("%s\n\nthe case:\n%s", msg, c)
		}
	})
}

// TestFmtKeepsCheckAndSQLOnTestdata: the same over every model under
// testdata/ (a folder is one model; a folder whose files do not parse
// together, as testdata/badinput/models, is one model per file), with
// one sql query per measure and per view.
func TestFmtKeepsCheckAndSQLOnTestdata(t *testing.T) {
	t.Parallel()
	folders := map[string][]string{}
	_ = filepath.WalkDir("../../testdata", func(p string, d fs.DirEntry, err error) error {
		if err == nil && strings.HasSuffix(p, ".roll") {
			folders[filepath.Dir(p)] = append(folders[filepath.Dir(p)], p)
		}
		return err
	})
	models := 0
	for dir, paths := range folders {
		files := map[string]string{}
		parses := true
		for _, p := range paths {
			b, err := os.ReadFile(p)
			if err != nil {
				t.Fatal(err)
			}
			files[filepath.Base(p)] = string(b)
			_, d := grammar.Parse(p, string(b))
			parses = parses && !d.HasErrors()
		}
		groups := []map[string]string{files}
		if !parses {
			groups = nil
			for name, src := range files {
				groups = append(groups, map[string]string{name: src})
			}
		}
		for _, g := range groups {
			models++
			if msg := fmtKeepsMeaning(t, g, modelQueries(g)); msg != "" {
				t.Errorf("%s: %s", dir, msg)
			}
		}
	}
	if models < 50 {
		t.Errorf("only %d models under testdata", models)
	}
}

// modelQueries are `sql` queries over every measure and view of the
// files that parse (run when the model checks without errors).
func modelQueries(files map[string]string) [][]string {
	var out [][]string
	for name, src := range files {
		f, d := grammar.Parse(name, src)
		if d.HasErrors() {
			continue
		}
		for _, m := range f.Measures {
			out = append(out, []string{"-m", "`" + m.Name.Name + "`"})
		}
		for _, v := range f.Views {
			out = append(out, []string{"--view", v.Name.Name})
		}
	}
	return out
}

// fmtKeepsMeaning writes the files to one folder as they are and to
// another as `rollwise fmt` formats them (a file that does not format
// is copied as it is), and compares what check and sql say of the two,
// with the folders' names and the line:column positions taken out. It
// returns what differs, or "". It also checks that fmt --check is
// content with the formatted folder.
func fmtKeepsMeaning(t *testing.T, files map[string]string, queries [][]string) string {
	orig, tidy := t.TempDir(), t.TempDir()
	for name, src := range files {
		if err := os.WriteFile(filepath.Join(orig, name), []byte(src), 0o644); err != nil {
			t.Fatal(err)
		}
		code, out, _ := runMain([]string{"fmt", filepath.Join(orig, name)}, "")
		if code != 0 {
			out = src
		}
		if err := os.WriteFile(filepath.Join(tidy, name), []byte(out), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	if code, out, errOut := runMain([]string{"fmt", "--check", tidy}, ""); code == 1 && out != "" {
		return "formatting again would change " + out + errOut
	}
	run := func(dir string, args []string) string {
		code, out, errOut := runMain(append([]string{args[0], dir}, args[1:]...), "")
		return fmt.Sprintf("exit %d\n%s\n---\n%s", code, out, errOut)
	}
	for _, args := range append([][]string{{"check"}}, prefixed("sql", queries)...) {
		a, b := unplaced(run(orig, args), orig), unplaced(run(tidy, args), tidy)
		if a != b {
			return "rollwise " + strings.Join(args, " ") + " says\n" + a + "\nof the model as written, and\n" + b + "\nof the model formatted"
		}
		if args[0] == "check" && !strings.HasPrefix(a, "exit 0") {
			return "" // every query would stop at the same errors
		}
	}
	return ""
}

func prefixed(cmd string, queries [][]string) [][]string {
	out := make([][]string, len(queries))
	for i, q := range queries {
		out[i] = append([]string{cmd}, q...)
	}
	sort.Slice(out, func(i, j int) bool { return strings.Join(out[i], " ") < strings.Join(out[j], " ") })
	return out
}

var (
	placeRe      = regexp.MustCompile(`\d+:\d+`)
	sourceLineRe = regexp.MustCompile(`(?m)^ *\d* \|.*\n`)
)

// unplaced is a command's output without what formatting may move: the
// folder, the line:column positions and the source lines quoted under
// messages.
func unplaced(s, dir string) string {
	s = strings.ReplaceAll(s, dir, "DIR")
	s = sourceLineRe.ReplaceAllString(s, "")
	return placeRe.ReplaceAllString(s, "L:C")
}
