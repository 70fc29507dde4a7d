package pipeline

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/planner/model"
)

const shop = "../../../../testdata/exec/shop.roll"

func loadShop(t *testing.T) *Model {
	t.Helper()
	m, diags, err := Load([]string{shop})
	if err != nil {
		t.Fatalf("%v\n%v", err, diags.Err())
	}
	return m
}

// Load's three outcomes: a model, a usage error for a path it cannot
// read, and findings with positions for a model with errors.
func TestLoad(t *testing.T) {
	m := loadShop(t)
	if m.Measure("revenue") == nil || m.Sources[shop] == "" {
		t.Fatalf("the shop model has no revenue, or its source is missing")
	}
	if _, _, err := Load([]string{"no/such/model.roll"}); !isKind(err, failure.Usage) {
		t.Errorf("a missing file: %v, want a usage error", err)
	}
	bad := filepath.Join(t.TempDir(), "bad.roll")
	if err := os.WriteFile(bad, []byte("table t {\n  id integer\n}\nmeasure m = sum(t.nope)\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	lm, diags, err := Load([]string{bad})
	if !isKind(err, failure.Findings) || err.Error() != "1 error" || lm == nil || lm.Model != nil || lm.Sources[bad] == "" ||
		!strings.Contains(diags.Error(), bad+":4:") {
		t.Errorf("a model with an error: %v, diagnostics %v; want one finding at %s:4 and the source kept for printing", err, diags, bad)
	}
}

// Resolve keeps what resolves while a file does not parse, as an editor
// needs, and reports only the parse errors.
func TestResolveWhileAFileDoesNotParse(t *testing.T) {
	src, err := os.ReadFile(shop)
	if err != nil {
		t.Fatal(err)
	}
	m, diags := Resolve([]Source{{Name: "shop.roll", Text: string(src)}, {Name: "typing.roll", Text: "measure half = "}})
	if m == nil || m.Measure("revenue") == nil {
		t.Errorf("the model of the file that parses is lost")
	}
	for _, d := range diags.Errors() {
		if d.Pos.File != "typing.roll" {
			t.Errorf("an error outside the file being typed: %v", d)
		}
	}
	if !diags.HasErrors() {
		t.Errorf("no parse error for the file being typed")
	}
}

// Compile's errors carry their kind; a compiled query has its SQL and
// notes.
func TestCompile(t *testing.T) {
	m := loadShop(t).Model
	c, diags, err := Compile(m, Request{Request: model.Request{Measures: []string{"revenue"}, By: []string{"stores.region"}, Totals: "grand"}, Dialect: "duckdb"})
	if err != nil || diags.HasErrors() {
		t.Fatalf("%v %v", err, diags)
	}
	if !strings.Contains(c.SQL, `"revenue"`) || len(c.Plan.Sets) != 2 || c.Query.Measures[0].Name != "revenue" || c.Model != m {
		t.Errorf("compiled: sets %v, SQL:\n%s", c.Plan.Sets, c.SQL)
	}
	for _, x := range []struct {
		r    Request
		kind failure.Kind
		want string
	}{
		{Request{Request: model.Request{Measures: []string{"revenue"}}, Dialect: "nosuch"}, failure.Usage, "nosuch"},
		{Request{Request: model.Request{Measures: []string{"revenue"}, Limit: -1}, Dialect: "duckdb"}, failure.Usage, "--limit must be a positive number"},
		{Request{View: "nosuch", Dialect: "duckdb"}, failure.Findings, "the model has no view"},
		{Request{Request: model.Request{Measures: []string{"revenu"}}, Dialect: "duckdb"}, failure.Findings, "1 error"},
		{Request{Request: model.Request{Measures: []string{"revenue"}, Where: "x"}, View: "v", Dialect: "duckdb"}, failure.Usage, "--view computes the view as declared"},
	} {
		if _, _, err := Compile(m, x.r); !isKind(err, x.kind) || !strings.Contains(err.Error(), x.want) {
			t.Errorf("%+v: %v, want kind %d and %q", x.r, err, x.kind, x.want)
		}
	}
	// A median on Trino, approximated on request: the notes say so
	// (docs/dialects.md: Trino has no exact median aggregate).
	c, _, err = Compile(m, Request{Request: model.Request{Measures: []string{"mid_line"}}, Dialect: "trino", Approximate: true})
	if err != nil {
		t.Fatal(err)
	}
	if len(c.Notes) == 0 || !strings.Contains(strings.Join(c.Notes, "\n"), "approx") {
		t.Errorf("an approximated median without a note: %v", c.Notes)
	}
}

func isKind(err error, k failure.Kind) bool {
	got, ok := failure.KindOf(err)
	return ok && got == k
}
