package reference_test

import (
	"os"
	"path/filepath"
	"testing"

	"github.com/rollwise/rollwise/internal/modeltest"
)

// TestNullTextsReadAsNull: the reference evaluator reads a table's
// declared NULL texts as NULL, as the engine does, and other fields as
// they are. Hand-worked: qty 2 + NULL ("NA") + NULL ("-") + 5 = 7 over 2
// non-NULL values; the text column keeps "n/a", which is not declared.
func TestNullTextsReadAsNull(t *testing.T) {
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "t.csv"), []byte("id,qty,note\n1,2,NA\n2,NA,n/a\n3,-,x\n4,5,\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	model := filepath.Join(dir, "m.roll")
	src := "table t from \"t.csv\" with null \"NA\", \"-\" {\n  key id\n  id integer\n  qty integer\n  note text\n}\n" +
		"measure units = sum(t.qty)\nmeasure counted = count(t.qty)\nmeasure noted = count(t.note)\n"
	if err := os.WriteFile(model, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	rows := evaluateOn(t, modeltest.Load(t, model), spec("units,counted,noted", "", "none"))
	// noted: "NA" and "" are NULL; "n/a" and "x" count: 2.
	expectRows(t, rows, []row{{"units": "7", "counted": "2", "noted": "2", "rolled_up": none}})
}
