package plan_test

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
)

// FuzzCheckPlan runs arbitrary model text through the whole check and
// plan path: parse, resolve and check (model.Load), then for each of the
// first measures a query alone, one grouped by the first columns of the
// first tables with every total row, a --where filter and an order, and
// plan.NewPlan on each (and on each view), rendered as DuckDB SQL. Nothing may panic or hang, and every error
// must carry a position (file, line and column). Run it with:
//
//	go test -run='^$' -fuzz='^FuzzCheckPlan$' -fuzztime=10m ./planner/plan
func FuzzCheckPlan(f *testing.F) {
	for _, pattern := range []string{"../../testdata/*/*.roll", "../../cmd/rollwise/internal/demo/*.roll"} {
		paths, _ := filepath.Glob(pattern)
		for _, p := range paths {
			if b, err := os.ReadFile(p); err == nil && len(b) < 8000 {
				f.Add(string(b))
			}
		}
	}
	f.Fuzz(func(t *testing.T, src string) {
		done := make(chan any, 1)
		go func() {
			defer func() { done <- recover() }()
			checkPlan(t, src)
		}()
		select {
		case p := <-done:
			if p == nil {
				return
			}
			t.Fatalf("panic: %v", p)
		case <-time.After(20 * time.Second):
			t.Fatalf("check and plan did not return within 20s")
		}
	})
}

// checkPlan runs one model through the path, reporting errors without a
// position with t.Errorf (safe from the fuzz goroutine).
func checkPlan(t *testing.T, src string) {
	file, diags := grammar.Parse("fuzz.roll", src)
	positioned(t, diags)
	if diags.HasErrors() || file == nil {
		return
	}
	m, diags := model.Load([]*grammar.File{file})
	positioned(t, diags)
	if diags.HasErrors() || m == nil {
		return
	}
	var by []string
	where := ""
	for _, tb := range m.Tables {
		if len(tb.Columns) > 0 && len(by) < 2 {
			by = append(by, tb.Columns[0].String())
			if where == "" {
				where = tb.Columns[0].String() + " is not null"
			}
		}
	}
	for i, ms := range m.Measures {
		if i >= 6 {
			break
		}
		specs := []model.Request{
			{Measures: []string{ms.Name}},
			{Measures: []string{ms.Name}, By: by, Where: where, Totals: "all", Order: ms.Name + " desc", Limit: 3},
		}
		for _, spec := range specs {
			q, d := m.NewQuery(spec)
			positioned(t, d)
			if d.HasErrors() || q == nil {
				continue
			}
			p, d := plan.NewPlan(q)
			positioned(t, d)
			render(t, p)
		}
	}
	for _, v := range m.Views {
		p, d := plan.NewPlan(m.ViewQuery(v))
		positioned(t, d)
		render(t, p)
	}
}

// render prints a plan as DuckDB SQL; a refusal must be an error with a
// message, never a panic or empty text. The plan's dump must print too.
func render(t *testing.T, p *plan.Plan) {
	if p == nil {
		return
	}
	if !strings.HasPrefix(p.Dump(), "query\n") {
		t.Errorf("the plan's dump does not start with its query")
	}
	d, err := dialects.Get("duckdb")
	if err != nil {
		t.Errorf("no duckdb dialect: %v", err)
		return
	}
	sql, err := dialects.Render(p, d)
	if err == nil && strings.TrimSpace(sql) == "" {
		t.Errorf("the plan renders as empty SQL")
	}
	if err != nil && err.Error() == "" {
		t.Errorf("a rendering error without a message")
	}
}

func positioned(t *testing.T, diags grammar.Diagnostics) {
	for _, d := range diags {
		if d.Pos.File == "" || d.Pos.Line < 1 || d.Pos.Col < 1 {
			t.Errorf("%s diagnostic without a position (%+v): %s", d.Severity, d.Pos, d.Message)
		}
		if d.Code == "" || d.Message == "" {
			t.Errorf("diagnostic at %s without a code or message", d.Pos)
		}
	}
}
