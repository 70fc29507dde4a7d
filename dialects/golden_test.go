package dialects_test

import (
	"errors"
	"flag"
	"fmt"
	"github.com/rollwise/rollwise/internal/modeltest"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/dialects/goldencases"
	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
)

var update = flag.Bool("update", false, "rewrite the golden SQL files (read the diff first)")

// Golden SQL for every dialect over one case list: the shop cases of
// testdata/sql, the construct lab (testdata/dialects/lab), the hostile
// names and values (testdata/dialects/hostile) and the time cases
// (testdata/dialects/time). Each case file holds the arguments of
// `rollwise sql` as a JSON array, then a ---- line. Each statement, or the
// dialect's refusal ("-- refused: ..."), is kept in
// testdata/dialects/golden/DIALECT/SET__CASE.sql for review against
// docs/dialects.md; a refusal is a golden like any other, so a case that
// stops rendering fails. `go test ./dialects -run Golden -update` rewrites
// them: read the diff first. Rendering needs no engine: the execution
// suite of cmd/rollwise runs the same cases on DuckDB and the live engines.

const root = "../"

// goldenCases are the cases, as goldencases lists them.
func goldenCases(t *testing.T) []goldencases.Case {
	t.Helper()
	cs, err := goldencases.Read(root)
	if err != nil {
		t.Fatal(err)
	}
	return cs
}

// casePlan reads a case's arguments as `rollwise sql` reads its flags
// (-m and -b are lists, repeated -w combine with and) and plans the query.
func casePlan(m *model.Model, args []string) (*plan.Plan, error) {
	var spec model.Request
	var wheres []string
	view := ""
	for i := 0; i < len(args); i += 2 {
		if i+1 == len(args) {
			return nil, fmt.Errorf("%s has no value", args[i])
		}
		v := args[i+1]
		switch args[i] {
		case "-m", "--measures":
			spec.Measures = append(spec.Measures, model.SplitList(v)...)
		case "-b", "--by":
			spec.By = append(spec.By, model.SplitList(v)...)
		case "-w", "--where":
			wheres = append(wheres, v)
		case "--totals":
			spec.Totals = v
		case "--order":
			spec.Order = v
		case "--limit":
			n, err := strconv.Atoi(v)
			if err != nil {
				return nil, err
			}
			spec.Limit = n
		case "--view":
			view = v
		default:
			return nil, fmt.Errorf("the golden cases know no flag %s", args[i])
		}
	}
	spec.Where = strings.Join(wheres, ") and (")
	if len(wheres) > 1 {
		spec.Where = "(" + spec.Where + ")"
	}
	var q *model.Query
	var diags grammar.Diagnostics
	if view != "" {
		for _, v := range m.Views {
			if v.Name == view {
				q = m.ViewQuery(v)
			}
		}
		if q == nil {
			return nil, fmt.Errorf("no view %s", view)
		}
		diags = q.Override(model.Request{Totals: spec.Totals, Order: spec.Order, Limit: spec.Limit})
	} else {
		q, diags = m.NewQuery(spec)
	}
	if diags.HasErrors() {
		return nil, diags.Errors()[0]
	}
	p, diags := plan.NewPlan(q)
	if diags.HasErrors() {
		return nil, diags.Errors()[0]
	}
	return p, nil
}

func TestDialectGoldenSQL(t *testing.T) {
	models := map[string]*model.Model{}
	for _, c := range goldenCases(t) {
		key := strings.Join(c.Models, " ")
		if models[key] == nil {
			var paths []string
			for _, p := range c.Models {
				paths = append(paths, filepath.Join(root, p))
			}
			models[key] = modeltest.Load(t, paths...)
		}
		p, err := casePlan(models[key], c.Args)
		if err != nil {
			t.Errorf("%s/%s: %v", c.Set, c.Name, err)
			continue
		}
		for _, name := range dialects.Names() {
			t.Run(name+"/"+c.Set+"/"+c.Name, func(t *testing.T) {
				d, _ := dialects.Get(name)
				args := append(append(append([]string{"sql"}, c.Models...), c.Args...), "-d", name)
				got := "-- rollwise " + strings.Join(displayArgs(args), " ") + "\n"
				sql, err := dialects.Render(p, d)
				var ue *dialects.UnsupportedError
				switch {
				case err == nil:
					got += sql + ";\n"
				case errors.As(err, &ue) && ue.Dialect == name:
					got += "-- refused: " + err.Error() + "\n"
				default:
					t.Fatalf("render: %v", err)
				}
				file := filepath.Join(root, "testdata/dialects/golden", name, c.Set+"__"+c.Name+".sql")
				compareGolden(t, file, got)
				if err == nil {
					if problems := portabilityProblems(d, sql); len(problems) > 0 {
						t.Errorf("%s cannot run this statement:\n  %s", name, strings.Join(problems, "\n  "))
					}
				}
			})
		}
	}
}

// compareGolden compares got with the golden file, or rewrites the file
// under -update. A difference is shown as a line diff (- golden, + now).
func compareGolden(t *testing.T, file, got string) {
	t.Helper()
	if *update {
		if err := os.MkdirAll(filepath.Dir(file), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(file, []byte(got), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(file)
	if err != nil {
		t.Fatalf("%v (write it with -update)", err)
	}
	if diff := lineDiff(string(want), got); diff != "" {
		t.Errorf("%s changed (review, then go test ./dialects -run Golden -update):\n%s", file, diff)
	}
}

// displayArgs writes the arguments as a shell would need them, with the
// paths relative to the repository.
func displayArgs(args []string) []string {
	out := make([]string, len(args))
	for i, a := range args {
		if strings.ContainsAny(a, "\n\r") { // bash's $'...', so the header stays one comment line
			a = "$'" + strings.NewReplacer(`\`, `\\`, `'`, `\'`, "\n", `\n`, "\r", `\r`).Replace(a) + "'"
		} else if a == "" || strings.ContainsAny(a, " '\"`\\$*;#[]()<>=,|&\n") {
			a = "'" + strings.ReplaceAll(a, "'", `'\''`) + "'"
		}
		out[i] = a
	}
	return out
}

// lineDiff shows how got differs from want, line by line (- want,
// + got), with the unchanged lines around each change.
func lineDiff(want, got string) string {
	return cmp.Diff(strings.Split(want, "\n"), strings.Split(got, "\n"))
}

// One inserted line is one + line, not a comparison of line i with line
// i (which would show every later line as changed).
func TestGoldenLineDiff(t *testing.T) {
	if d := lineDiff("a\nb\nc\n", "a\nb\nc\n"); d != "" {
		t.Errorf("equal texts differ:\n%s", d)
	}
	d := lineDiff("a\nb\nc\nd\n", "a\nnew\nb\nc\nd\n")
	var plus, minus int
	for _, l := range strings.Split(d, "\n") {
		l = strings.TrimSpace(l)
		plus += btoi(strings.HasPrefix(l, "+"))
		minus += btoi(strings.HasPrefix(l, "-"))
	}
	if plus != 1 || minus != 0 || !strings.Contains(d, `"new"`) {
		t.Errorf("one inserted line should be one + line and no - line:\n%s", d)
	}
}

func btoi(b bool) int {
	if b {
		return 1
	}
	return 0
}
