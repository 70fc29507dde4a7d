package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"testing"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/livetest"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/reference/casegen"
)

// diffCase is the query.json of a regression case of the differential
// tests (testdata/differential/NAME: model.roll, one CSV file per table,
// query.json).
type diffCase struct {
	Query casegen.Query `json:"query"`
	// KnownFailure says why the case still fails, while the planner is
	// not fixed; the case is skipped with that reason. Empty once fixed.
	KnownFailure string `json:"known_failure"`
}

// TestDifferentialRegressions runs every minimal case the differential
// tests found through both paths. A case marked known_failure is skipped
// while it still fails; one that passes while so marked is reported so
// that the mark (and the matching entry of diffKnownBugs) goes.
func TestDifferentialRegressions(t *testing.T) {
	t.Parallel()
	for _, dir := range diffRegressionDirs(t) {
		t.Run(filepath.Base(dir), func(t *testing.T) {
			diffRegression(t, dir, nil)
		})
	}
}

// TestDifferentialRegressionsLive runs the regression cases on every live
// engine too (a case whose construct the engine lacks must be refused
// cleanly).
func TestDifferentialRegressionsLive(t *testing.T) {
	t.Parallel()
	dirs := diffRegressionDirs(t)
	for _, name := range livetest.Names {
		t.Run(name, func(t *testing.T) {
			t.Parallel() // each engine holds the cases in a database of its own
			e := livetest.Empty(t, name, "diff_regress_"+name)
			for _, dir := range dirs {
				t.Run(filepath.Base(dir), func(t *testing.T) {
					diffRegression(t, dir, e)
				})
			}
		})
	}
}

// diffRegressionDirs lists the regression cases.
func diffRegressionDirs(t *testing.T) []string {
	dirs, err := filepath.Glob("../../testdata/differential/*")
	if err != nil || len(dirs) == 0 {
		t.Fatalf("no regression cases found (%v)", err)
	}
	return dirs
}

// diffRegression runs one regression case on DuckDB (and through `rollwise
// run` itself), or on the live engine when live is set.
func diffRegression(t *testing.T, dir string, live *livetest.Engine) {
	b, err := os.ReadFile(filepath.Join(dir, "query.json"))
	if err != nil {
		t.Fatal(err)
	}
	var c diffCase
	if err := json.Unmarshal(b, &c); err != nil {
		t.Fatalf("query.json: %v", err)
	}
	var st diffStats
	dc, err := diffOpen(dir)
	if err != nil {
		t.Fatal(err)
	}
	defer dc.close()
	tg := dc.duckdb()
	if live != nil {
		if tg, err = dc.loadInto(live); err != nil {
			t.Fatal(err)
		}
	}
	msg := dc.compare(tg, c.Query, &st)
	if msg == "" && st.compared.Load() > 0 && live == nil {
		msg = dc.viaMain(c.Query)
	}
	switch {
	case msg != "" && c.KnownFailure != "":
		t.Skipf("known planner bug, not fixed yet: %s\n%s", c.KnownFailure, msg)
	case msg != "":
		t.Errorf("%s\nquery: %s", msg, c.Query.Command(filepath.Join(dir, casegen.ModelFile)))
	case c.KnownFailure != "":
		t.Logf("passes now: remove known_failure from %s and its entry in diffKnownBugs", dir)
	case st.refused.Load() > 0:
		t.Logf("%s refuses the query, as it must", tg.name)
	case st.compared.Load() == 0:
		t.Errorf("the query was not compared (skipped as not supported)")
	}
}

// viaMain runs the query through `rollwise run` in-process and compares
// its JSON rows with the reference's: the regression cases check the
// command line itself, not only the SQL path it takes.
func (dc *diffOpened) viaMain(q casegen.Query) string {
	modelFile := filepath.Join(dc.dir, casegen.ModelFile)
	got, stderr, code := diffRunJSON(append(append([]string{"run", modelFile}, q.Args()...), "--format", "json"))
	if code != 0 {
		return "rollwise run fails: " + stderr
	}
	pq, diags := dc.m.NewQuery(model.Request{Measures: q.Measures, By: q.By, Where: q.Where,
		Totals: q.Totals, Order: q.Order, Limit: q.Limit})
	if diags.HasErrors() {
		return diags.Error()
	}
	res, err := dc.ref.Run(pq)
	if err != nil {
		return err.Error()
	}
	return diffRows(pq, got, res.JSON(), false)
}
