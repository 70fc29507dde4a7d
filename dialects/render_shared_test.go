package dialects

import (
	"strings"
	"testing"

	"github.com/rollwise/rollwise/planner/plan"
)

// Scans of the same rows share a rows CTE where that saves work: when the
// rows are joined, or when the later scan aggregates a computed value the
// CTE already has; then an input it has is read under its name. A plain
// scan of stored columns, or a column name taken by another expression,
// gets its own CTE.
func TestRowsOfSharesWhereItSavesWork(t *testing.T) {
	newRenderer := func() *renderer {
		return &renderer{p: &plan.Plan{}, d: mustGet(t, "duckdb"), names: map[string]bool{}, rows: map[string][]*sharedRows{}}
	}
	base := []rowCol{
		{name: "t.g", expr: `"t"."g"`, key: true},
		{name: "rev_arg", expr: `("t"."p" * "t"."q")`, computed: true},
		{name: "n_arg", expr: `"t"."id"`},
	}
	const from = "\n  FROM \"t\" AS \"t\""
	joined := from + "\n  LEFT JOIN \"u\" AS \"u\" ON \"t\".\"u_id\" = \"u\".\"id\""

	r := newRenderer()
	r.rowsOf("t", joined, true, base)
	name, col := r.rowsOf("sub_t", joined, true, []rowCol{
		{name: "t.g", expr: `"t"."g"`, key: true},
		{name: "t.id per", expr: `"t"."id"`, key: true},
		{name: "sub_n_arg", expr: `"t"."id"`},
	})
	if name != "t_rows" || len(r.ctes) != 1 || col("sub_n_arg") != "n_arg" || col("t.id per") != "t.id per" {
		t.Errorf("joined rows: %s, %d CTEs, sub_n_arg read as %s", name, len(r.ctes), col("sub_n_arg"))
	}
	if !strings.Contains(r.ctes[0], `"t"."id" AS "t.id per"`) || strings.Contains(r.ctes[0], "sub_n_arg") {
		t.Errorf("the shared CTE should add the per key and not the input it has:\n%s", r.ctes[0])
	}

	r = newRenderer()
	r.rowsOf("t", from, false, base)
	if name, _ := r.rowsOf("sub_t", from, false, []rowCol{{name: "t.id per", expr: `"t"."id"`, key: true}}); name != "sub_t_rows" {
		t.Errorf("a plain scan of stored columns shares %s", name)
	}
	name, col = r.rowsOf("sub2_t", from, false, []rowCol{{name: "sub_rev_arg", expr: `("t"."p" * "t"."q")`, computed: true}})
	if name != "t_rows" || col("sub_rev_arg") != "rev_arg" {
		t.Errorf("a computed input the CTE has: %s, read as %s", name, col("sub_rev_arg"))
	}

	r = newRenderer()
	r.rowsOf("t", joined, true, base)
	name, col = r.rowsOf("other_t", joined, true, []rowCol{
		{name: "other_n_arg", expr: `"t"."id"`},
		{name: "t.g", expr: `"t"."h"`, key: true},
	})
	if name == "t_rows" || col("other_n_arg") != "other_n_arg" {
		t.Errorf("a key whose name the CTE gives another expression: shares %s, reads other_n_arg as %s", name, col("other_n_arg"))
	}
	if len(r.ctes) != 2 || strings.Contains(r.ctes[0], `"t"."h"`) {
		t.Errorf("a refused merge changed the first CTE:\n%s", strings.Join(r.ctes, "\n"))
	}
}
