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
		msg, compared := fmtKeepsMeaning(t, map[string]string{casegen.ModelFile: c.Model}, queries)
		if msg != "" {
			rt.Fatalf("%s\n\nthe case:\n%s", msg, c)
		}
		if compared != len(queries) {
			rt.Fatalf("%d of %d queries compared: the generated model does not check\n\nthe case:\n%s", compared, len(queries), c)
		}
	})
}

// TestFmtKeepsCheckAndSQLOnTestdata: the same over every model under
// testdata/, with one sql query per measure and per view. A folder is
// one model when its files check together; otherwise each file is one,
// with the first other file of the folder that makes it check (as
// bench_wide.roll with tpch.roll), or alone.
func TestFmtKeepsCheckAndSQLOnTestdata(t *testing.T) {
	t.Parallel()
	folders := map[string]map[string]string{}
	err := filepath.WalkDir("../../testdata", func(p string, d fs.DirEntry, err error) error {
		if err != nil || !strings.HasSuffix(p, ".roll") {
			return err
		}
		b, err := os.ReadFile(p)
		if folders[filepath.Dir(p)] == nil {
			folders[filepath.Dir(p)] = map[string]string{}
		}
		folders[filepath.Dir(p)][filepath.Base(p)] = string(b)
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	models, compared := 0, 0
	for dir, files := range folders {
		for _, g := range modelGroups(t, files) {
			models++
			msg, n := fmtKeepsMeaning(t, g, modelQueries(g))
			if msg != "" {
				t.Errorf("%s: %s", dir, msg)
			}
			compared += n
		}
	}
	if models < 60 || compared < 250 { // 71 and 327 when written
		t.Errorf("only %d models under testdata, and %d sql queries compared", models, compared)
	}
}

// modelGroups cuts a folder's files into models: the whole folder when
// it checks; else each file, with the first other file that makes it
// check (only in folders of at most ten files), or alone.
func modelGroups(t *testing.T, files map[string]string) []map[string]string {
	if checksClean(t, files) {
		return []map[string]string{files}
	}
	names := make([]string, 0, len(files))
	for n := range files {
		names = append(names, n)
	}
	sort.Strings(names)
	var groups []map[string]string
	for _, n := range names {
		g := map[string]string{n: files[n]}
		for _, m := range names {
			if len(names) > 10 || checksClean(t, g) {
				break
			}
			if pair := map[string]string{n: files[n], m: files[m]}; m != n && checksClean(t, pair) {
				g = pair
			}
		}
		groups = append(groups, g)
	}
	return groups
}

// checksClean reports whether the files make a model that checks
// without errors.
func checksClean(t *testing.T, files map[string]string) bool {
	dir := t.TempDir()
	for name, src := range files {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(src), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	code, _, _ := runMain([]string{"check", dir}, "")
	return code == 0
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
// returns what differs, or "", and how many sql queries it compared
// (none when the model has errors: each would stop at them). It also
// checks that fmt --check is content with the formatted folder.
func fmtKeepsMeaning(t *testing.T, files map[string]string, queries [][]string) (string, int) {
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
		return "formatting again would change " + out + errOut, 0
	}
	run := func(dir string, args []string) string {
		code, out, errOut := runMain(append([]string{args[0], dir}, args[1:]...), "")
		return fmt.Sprintf("exit %d\n%s\n---\n%s", code, out, errOut)
	}
	compared := 0
	for _, args := range append([][]string{{"check"}}, prefixed("sql", queries)...) {
		a, b := unplaced(run(orig, args), orig), unplaced(run(tidy, args), tidy)
		if a != b {
			return "rollwise " + strings.Join(args, " ") + " says\n" + a + "\nof the model as written, and\n" + b + "\nof the model formatted", compared
		}
		if args[0] == "check" && !strings.HasPrefix(a, "exit 0") {
			return "", 0 // every query would stop at the same errors
		}
		if args[0] == "sql" {
			compared++
		}
	}
	return "", compared
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
