package reference_test

import (
	"path/filepath"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/internal/modeltest"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/reference"
	"github.com/rollwise/rollwise/planner/reference/expect"
)

// repoRoot is the repository's root, seen from this package.
const repoRoot = "../.."

// TestHandWorked computes every hand-worked case (expect.Cases: the
// shop, its cell edits and per-grain measures, its time edits) with the
// reference evaluator alone, without SQL. cmd/rollwise's TestHandWorked
// holds the SQL path to the same rows.
func TestHandWorked(t *testing.T) {
	models := map[string]*model.Model{}
	for _, c := range expect.Cases {
		t.Run(c.Name, func(t *testing.T) {
			key := strings.Join(c.Models, " ")
			m := models[key]
			if m == nil {
				var paths []string
				for _, p := range c.Models {
					paths = append(paths, filepath.Join(repoRoot, p))
				}
				m = modeltest.Load(t, paths...)
				models[key] = m
			}
			s := model.Request{Measures: expect.List(c.Measures), By: expect.List(c.By),
				Where: c.Where, Totals: c.Totals, Order: c.Order, Limit: c.Limit}
			expectRows(t, evaluateOn(t, m, s), c.Rows)
		})
	}
}

// evaluateOn runs a query with the reference evaluator.
func evaluateOn(t *testing.T, m *model.Model, spec model.Request) []map[string]any {
	t.Helper()
	if spec.Totals == "" {
		spec.Totals = "none"
	}
	q, d := m.NewQuery(spec)
	if d.HasErrors() {
		t.Fatalf("query: %v", d)
	}
	res, err := reference.Evaluate(m, q, "")
	if err != nil {
		t.Fatalf("evaluate: %v", err)
	}
	return res.JSON()
}

// The same expectations as the SQL path's tests (package expect).
type row = expect.Row

var expectRows, none = expect.Rows, expect.None

func spec(measures, by string, totals string) model.Request {
	return model.Request{Measures: expect.List(measures), By: expect.List(by), Totals: totals}
}
