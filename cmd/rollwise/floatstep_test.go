package main

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/rollwise/rollwise/planner/model"
)

// TestFloatStepFindsSteps: the SQLite excuse of the live differential
// test applies only to measures that pass a decimal through a step, so
// that every other SQLite difference still fails the test.
func TestFloatStepFindsSteps(t *testing.T) {
	t.Parallel()
	src := `table sales from "sales.csv" {
  key id
  id     integer
  price  decimal
  qty    integer
}
measure revenue  = sum(sales.price)
measure units    = sum(sales.qty)
measure rounded  = round(revenue, 1) * 3
measure big      = case when revenue > 10 then 1 else 0 end
measure via_ref  = rounded + 1
measure whole    = round(units * 1.0)
measure counted  = round(units)
`
	path := filepath.Join(t.TempDir(), "m.roll")
	if err := os.WriteFile(path, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	m, err := diffLoadModel(path)
	if err != nil {
		t.Fatal(err)
	}
	for name, want := range map[string]bool{
		"revenue": false, "units": false, "counted": false,
		"rounded": true, "big": true, "via_ref": true, "whole": true,
	} {
		q, diags := m.NewQuery(model.Request{Measures: []string{name}})
		if diags.HasErrors() {
			t.Fatalf("%s: %v", name, diags.Error())
		}
		if got := floatStep(q); got != want {
			t.Errorf("floatStep(%s) = %v, want %v", name, got, want)
		}
	}
}
