package main

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"regexp"
	"sort"
	"strings"
	"sync"
	"testing"

	"github.com/shopspring/decimal"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/livetest"
)

// The execution suites on live engines. Every `run` that the tests make
// through runJSON (exec_test.go) on a model listed in liveModels is run
// again with --dsn on SQLite, PostgreSQL and MySQL/MariaDB (see livetest
// for the servers), and the rows must be DuckDB's: the same rows in the
// same order, decimals and integers exactly, floats to 1e-9. DuckDB's rows
// are those the test then checks against its hand-worked expectations, so
// each engine meets the same expectations. Each engine is a subtest of the
// calling test, so an engine that is missing (skip, or failure under
// CI=true) or refuses a construct for a stated reason does not hide the
// DuckDB checks.

// liveModels are the models whose data the live engines hold, by path as
// the tests write it, with the tag that names their test databases.
var liveModels = map[string]string{
	shopModel:                              "cli_shop",
	"../../testdata/dialects/lab.roll":     "cli_lab",
	"../../testdata/dialects/hostile.roll": "cli_hostile",
	joinsModel:                             "cli_joins",
	timeModel:                              "cli_time",
}

// liveCache holds the engines loaded so far, by engine and model; a load
// that failed is remembered so that it fails once, not for every query.
var liveCache = struct {
	sync.Mutex
	engines map[string]*livetest.Engine
	failed  map[string]string
}{engines: map[string]*livetest.Engine{}, failed: map[string]string{}}

// liveEngine returns engine name holding the model at path, loading it on
// first use.
func liveEngine(t *testing.T, name, path string) *livetest.Engine {
	t.Helper()
	livetest.ServerURL(t, name) // skip (or fail under CI) without a server
	key := name + " " + path
	liveCache.Lock()
	defer liveCache.Unlock()
	if msg, ok := liveCache.failed[key]; ok {
		t.Fatal(msg)
	}
	if e := liveCache.engines[key]; e != nil {
		return e
	}
	m, err := loadModel(&env{stdout: io.Discard, stderr: io.Discard}, []string{path})
	if err != nil {
		liveCache.failed[key] = fmt.Sprintf("%s: cannot load %s: %v", name, path, err)
		t.Fatal(liveCache.failed[key])
	}
	ok := false
	defer func() {
		if !ok && !t.Skipped() {
			liveCache.failed[key] = fmt.Sprintf("%s: loading %s failed earlier in the run", name, path)
		}
	}()
	e := livetest.Open(t, name, liveModels[path], m.Model, "")
	liveCache.engines[key] = e
	ok = true
	return e
}

// crossCheck runs `rollwise ARGS` (a run command whose DuckDB rows are
// duck) on every live engine and compares the rows.
func crossCheck(t *testing.T, args []string, duck []map[string]any) {
	t.Helper()
	if len(args) < 2 || args[0] != "run" {
		return
	}
	if _, ok := liveModels[args[1]]; !ok {
		return
	}
	for _, a := range args {
		if a == "--dsn" || a == "--data" || a == "-d" || a == "--dialect" || strings.HasPrefix(a, "--dsn=") || strings.HasPrefix(a, "--data=") {
			return
		}
	}
	for _, name := range livetest.Names {
		t.Run(name, func(t *testing.T) {
			e := liveEngine(t, name, args[1])
			var out, errb bytes.Buffer
			code := Main(append(append([]string{}, args...), "--dsn", e.DSN, "--format", "json"), strings.NewReader(""), &out, &errb)
			if code != 0 {
				explainRefusal(t, name, args, errb.String())
				return
			}
			dec := json.NewDecoder(&out)
			dec.UseNumber()
			var rows []map[string]any
			if err := dec.Decode(&rows); err != nil {
				t.Fatalf("bad JSON: %v\n%s", err, out.String())
			}
			if diff := rowsDiff(duck, rows); diff != "" {
				t.Errorf("%s %s: rows differ from DuckDB's:\n%s", name, strings.Join(args, " "), diff)
			}
		})
	}
}

// explainRefusal accepts a refusal the engine states a reason for (an
// aggregate it lacks), and fails on anything else.
func explainRefusal(t *testing.T, name string, args []string, stderr string) {
	t.Helper()
	if msg := lastLine(stderr); strings.Contains(msg, name+" cannot express") && refusable.MatchString(msg) {
		t.Logf("%s refuses, as it must: %s", name, msg)
		return
	}
	t.Errorf("%s: rollwise %s failed:\n%s", name, strings.Join(args, " "), stderr)
}

// refusable are the constructs an engine may refuse: the aggregates it
// lacks, and case mapping it does only for ASCII letters (not the median,
// which every engine computes exactly, with windows where it must).
var refusable = regexp.MustCompile(`standard deviation|variance|upper|lower`)

// rowsDiff describes how two JSON results differ ("" when they do not).
func rowsDiff(want, got []map[string]any) string {
	if len(want) != len(got) {
		return fmt.Sprintf("%d rows, DuckDB has %d:\n%s", len(got), len(want), dump(got))
	}
	var b strings.Builder
	for i := range want {
		keys := make([]string, 0, len(want[i]))
		for k := range want[i] {
			keys = append(keys, k)
		}
		sort.Strings(keys)
		for _, k := range keys {
			if g, ok := got[i][k]; !ok || !sameJSON(want[i][k], g) {
				fmt.Fprintf(&b, "row %d %s = %v, DuckDB %v\n", i, k, got[i][k], want[i][k])
			}
		}
		if len(got[i]) != len(want[i]) {
			fmt.Fprintf(&b, "row %d has keys %v, DuckDB %v\n", i, got[i], want[i])
		}
	}
	return b.String()
}

// sameJSON compares decoded JSON values: numbers exactly as decimals, or
// to 1e-9 (relative) when either is not an integer.
func sameJSON(want, got any) bool {
	switch w := want.(type) {
	case json.Number:
		g, ok := got.(json.Number)
		if !ok {
			return false
		}
		if w == g {
			return true
		}
		dw, err1 := decimal.NewFromString(w.String())
		dg, err2 := decimal.NewFromString(g.String())
		if err1 == nil && err2 == nil && dw.Equal(dg) {
			return true
		}
		if err1 == nil && err2 == nil && dw.IsInteger() && dg.IsInteger() {
			return false
		}
		fw, err1 := w.Float64()
		fg, err2 := g.Float64()
		return err1 == nil && err2 == nil && math.Abs(fw-fg) <= 1e-9*math.Max(1, math.Abs(fw))
	case []any:
		g, ok := got.([]any)
		if !ok || len(g) != len(w) {
			return false
		}
		for i := range w {
			if !sameJSON(w[i], g[i]) {
				return false
			}
		}
		return true
	}
	return want == got
}

// Under CI=true the live servers must be there: the cross-checks skip an
// engine that is missing, and this test makes that a failure.
func TestLiveEnginesConfigured(t *testing.T) {
	t.Parallel()
	for _, name := range livetest.Names {
		t.Run(name, func(t *testing.T) {
			livetest.ServerURL(t, name)
			e := liveEngine(t, name, shopModel)
			if e.Live.Server == "" {
				t.Error("the server did not say what it is")
			}
			t.Logf("%s: %s", name, e.Live.Server)
		})
	}
}

func TestRunDSNUsage(t *testing.T) {
	t.Parallel()
	dir := t.TempDir()
	for _, c := range []struct {
		args []string
		code int
		want string
	}{
		{[]string{"--dsn", "oracle://h/db"}, exitUsage, "postgres://"},
		{[]string{"--dsn", "sqlite:" + filepath.Join(dir, "x.db"), "--data", dir}, exitUsage, "--data is for the embedded DuckDB"},
		{[]string{"--dsn", "sqlite:" + filepath.Join(dir, "missing.db")}, exitFindings, "unable to open"},
	} {
		var out, errb bytes.Buffer
		code := Main(append([]string{"run", shopModel, "-m", "revenue"}, c.args...), nil, &out, &errb)
		if code != c.code || !strings.Contains(errb.String(), c.want) {
			t.Errorf("%v: exit %d (want %d), stderr %q (want %q)", c.args, code, c.code, errb.String(), c.want)
		}
	}
}

// --approximate lets Trino answer a median with approx_percentile, and the
// output says so; without it, Trino computes the exact median with window
// functions and says nothing. views takes the flag too, and the view's
// header says what is approximate.
func TestApproximateFlag(t *testing.T) {
	t.Parallel()
	var out, errb bytes.Buffer
	code := Main([]string{"sql", labModel, "-m", "mid_minutes", "-b", "patients.ward", "-d", "trino"}, nil, &out, &errb)
	if code != 0 || !strings.Contains(out.String(), "ROW_NUMBER() OVER") || strings.Contains(out.String(), "approx") || errb.Len() > 0 {
		t.Errorf("without --approximate: exit %d\n%s\n%s", code, out.String(), errb.String())
	}
	out.Reset()
	errb.Reset()
	code = Main([]string{"sql", labModel, "-m", "mid_minutes", "-b", "patients.ward", "-d", "trino", "--approximate"}, nil, &out, &errb)
	if code != 0 || !strings.Contains(out.String(), "approx_percentile(") || !strings.Contains(errb.String(), "medians are approximate") {
		t.Errorf("with --approximate: exit %d\n%s\n%s", code, out.String(), errb.String())
	}
	// An exact median stays exact, and nothing is said.
	out.Reset()
	errb.Reset()
	code = Main([]string{"sql", labModel, "-m", "mid_minutes", "-d", "postgres", "--approximate"}, nil, &out, &errb)
	if code != 0 || !strings.Contains(out.String(), "percentile_cont(0.5)") || strings.Contains(errb.String(), "approximate") {
		t.Errorf("postgres with --approximate: exit %d\n%s\n%s", code, out.String(), errb.String())
	}
	for _, approximate := range []bool{false, true} {
		out.Reset()
		errb.Reset()
		args := []string{"views", "../../testdata/views/shop.roll", "-d", "trino"}
		if approximate {
			args = append(args, "--approximate")
		}
		code = Main(args, nil, &out, &errb)
		said := strings.Contains(out.String(), "-- Caution: medians are approximate") && strings.Contains(errb.String(), "caution: view by_item: medians are approximate")
		if code != 0 || strings.Contains(out.String(), "approx_percentile(") != approximate || said != approximate {
			t.Errorf("views -d trino, --approximate %v: exit %d\n%s\n%s", approximate, code, out.String(), errb.String())
		}
	}
}
