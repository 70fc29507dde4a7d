package plan_test

import (
	"testing"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
)

// A group column the measure's iteration table does not reach is refused
// where the plan meets it, at the group's position in the request.
func TestUnreachableGrouping(t *testing.T) {
	f, d := grammar.Parse("m.roll", `table stores {
  key id
  id integer
  region text
}
table repairs {
  key id
  id integer
  fee decimal
}
measure fees = sum(repairs.fee)
`)
	if d.HasErrors() {
		t.Fatal(d)
	}
	m, d := model.Load([]*grammar.File{f})
	if d.HasErrors() {
		t.Fatal(d)
	}
	q, d := m.NewQuery(model.Request{Measures: []string{"fees"}, By: []string{"stores.region"}})
	if d.HasErrors() {
		t.Fatal(d)
	}
	_, pd := plan.NewPlan(q)
	want := "the group list:1:1: error: cannot group by stores.region: measure fees iterates over repairs, and no link leads from repairs to stores"
	if len(pd) != 1 || pd[0].Error() != want {
		t.Fatalf("got %v\nwant %s", pd, want)
	}
}
