package reference_test

import (
	"testing"

	"github.com/rollwise/rollwise/planner/reference/expect"
)

// The hand-worked time edit cases (expect.TimeCases), computed by the
// reference evaluator alone.
func TestTimeEdits(t *testing.T) {
	m := loadModel(t, "../../testdata/exec/time.roll")
	for _, c := range expect.TimeCases {
		t.Run(c.Name, func(t *testing.T) {
			s := spec(c.Measures, c.By, c.Totals)
			s.Where = c.Where
			expectRows(t, evaluateOn(t, m, s), c.Rows)
		})
	}
}
