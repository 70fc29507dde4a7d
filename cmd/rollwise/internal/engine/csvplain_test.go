package engine

import (
	"context"
	"fmt"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/planner/model"
	"pgregory.net/rapid"
)

// TestPlainValuesPassTheSQLChecks runs the SQL checks loadCSV leaves out
// for plain files (textRefused, then the cast of textParsed) on every
// value plainValue accepts among hand-picked edge cases and a fixed
// sample of near-plain spellings: none may be refused or fail to cast.
// (Common practice: the fast path is checked against the path it skips.)
func TestPlainValuesPassTheSQLChecks(t *testing.T) {
	db := open(t, newModel(), "")
	number := rapid.StringMatching(`-?[0-9]{0,34}(\.[0-9]{0,17})?`)
	stamp := rapid.StringMatching(`[0-9]{4}-(0[0-9]|1[0-3])-([0-2][0-9]|3[0-2])( ([01][0-9]|2[0-5]):[0-6][0-9]:[0-6][0-9])?`)
	cases := []struct {
		typ    model.Type
		gen    *rapid.Generator[string]
		extras []string
	}{
		{model.TypeInteger, number, []string{"0", "-0", "000000000000000000", "999999999999999999", "-999999999999999999", "9223372036854775807", "3.5", "1e3", "+1", " 1"}},
		{model.TypeDecimal, number, []string{"99999999999999999999999999999999.999999", "-0.000001", "1.0000001", "1.", ".5", "0.1234567"}},
		{model.TypeFloat, number, []string{"999999999999999.999999999999999", "-0.5", "1e400", "inf"}},
		{model.TypeTimestamp, stamp, []string{"0001-01-01", "9999-12-31 23:59:59", "2024-02-29 00:00:00", "2023-02-29", "2024-04-31", "2024-01-01 24:00:00", "0000-01-01", "2024-01-01T10:00:00", "2024-1-01 10:00:00"}},
	}
	for _, tc := range cases {
		values := append(tc.extras, rapid.SliceOfN(tc.gen, 400, 400).Example(1)...)
		var plain []string
		for _, v := range values {
			if plainValue(v, tc.typ) {
				plain = append(plain, quoteString(v))
			}
		}
		if len(plain) < 100 || len(plain) == len(values) {
			t.Fatalf("%s: %d of %d sample values are plain; the sample does not test plainValue", tc.typ, len(plain), len(values))
		}
		c := column{name: "v", typ: tc.typ}
		c.duckType, _ = duckType(tc.typ)
		from := fmt.Sprintf("(SELECT unnest([%s]) AS c0)", strings.Join(plain, ", "))
		res := query(t, db, fmt.Sprintf("SELECT c0 FROM %s WHERE %s", from, textRefused("c0", c)))
		for _, row := range res.Rows {
			t.Errorf("%s: plainValue accepts %v, which textRefused refuses", tc.typ, row[0])
		}
		var n int
		if err := db.QueryRowContext(context.Background(), fmt.Sprintf("SELECT count(%s) FROM %s", textParsed("c0", c), from)).Scan(&n); err != nil || n != len(plain) {
			t.Errorf("%s: casting the plain values: %d of %d, %v", tc.typ, n, len(plain), err)
		}
	}
}
