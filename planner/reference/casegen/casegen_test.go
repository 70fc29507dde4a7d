package casegen_test

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"pgregory.net/rapid"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/reference"
	"github.com/rollwise/rollwise/planner/reference/casegen"
)

// Every drawn case is a valid model whose queries resolve, and the
// reference evaluator answers each of them. (The differential test in
// cmd/rollwise compares those answers with the SQL path's.)
func TestCasesAreValid(t *testing.T) {
	rapid.Check(t, func(rt *rapid.T) {
		c := casegen.Generator(casegen.DefaultOptions).Draw(rt, "case")
		dir := t.TempDir()
		if err := c.Write(dir); err != nil {
			rt.Fatal(err)
		}
		m := load(rt, c, dir)
		d, err := reference.Load(m, "")
		if err != nil {
			rt.Fatalf("%v\n%s", err, c)
		}
		for _, q := range c.Queries {
			pq, diags := m.NewQuery(model.Request{Measures: q.Measures, By: q.By, Where: q.Where,
				Totals: q.Totals, Order: q.Order, Limit: q.Limit})
			if diags.HasErrors() {
				rt.Fatalf("query %s: %v\n%s", q.Command("model.roll"), diags, c)
			}
			res, err := d.Run(pq)
			if err != nil {
				rt.Fatalf("query %s: reference: %v\n%s", q.Command("model.roll"), err, c)
			}
			if len(res.Rows) == 0 && len(q.By) == 0 {
				rt.Fatalf("a query without groups has one row\n%s", c)
			}
		}
		// The data keeps the promise of every link declared required.
		for _, tb := range m.Tables {
			for _, l := range tb.Links {
				if n := d.Unmatched(l); l.Required && n > 0 {
					rt.Fatalf("link %s is declared required, but %d rows find nothing\n%s", l, n, c)
				}
			}
		}
	})
}

func load(rt *rapid.T, c *casegen.Case, dir string) *model.Model {
	path := filepath.Join(dir, casegen.ModelFile)
	src, err := os.ReadFile(path)
	if err != nil {
		rt.Fatal(err)
	}
	f, diags := grammar.Parse(path, string(src))
	if diags.HasErrors() {
		rt.Fatalf("parse: %v\n%s", diags, c)
	}
	m, diags := model.Load([]*grammar.File{f})
	if diags.HasErrors() {
		rt.Fatalf("load: %v\n%s", strings.TrimSpace(diags.Error()), c)
	}
	return m
}

// The reference evaluator keeps the identities of per-grain groups and
// NULL in every cell (language.md, "Per-grain groups and NULL"); the
// SQL path is held to them in cmd/rollwise (TestPerGrainIdentities).
func TestIdentitiesHoldInReference(t *testing.T) {
	o := casegen.DefaultOptions
	o.Identities = true
	rapid.Check(t, func(rt *rapid.T) {
		c := casegen.Generator(o).Draw(rt, "case")
		dir := t.TempDir()
		if err := c.Write(dir); err != nil {
			rt.Fatal(err)
		}
		m := load(rt, c, dir)
		d, err := reference.Load(m, "")
		if err != nil {
			rt.Fatalf("%v\n%s", err, c)
		}
		for _, id := range c.Identities {
			q := id.Query
			pq, diags := m.NewQuery(model.Request{Measures: q.Measures, By: q.By, Where: q.Where, Totals: q.Totals})
			if diags.HasErrors() {
				rt.Fatalf("query %s: %v\n%s", q.Command("model.roll"), diags, c)
			}
			res, err := d.Run(pq)
			if err != nil {
				rt.Fatalf("query %s: reference: %v\n%s", q.Command("model.roll"), err, c)
			}
			if msg := casegen.CheckIdentity(id, res.JSON()); msg != "" {
				rt.Fatalf("query %s: %s\n%s", q.Command("model.roll"), msg, c)
			}
		}
	})
}
