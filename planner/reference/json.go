package reference

import (
	"encoding/json"
	"math"
	"strconv"
	"time"

	"github.com/rollwise/rollwise/planner/model"
	"github.com/shopspring/decimal"
)

// RolledUpKey is the JSON key of the list of rolled-up group references.
const RolledUpKey = "rolled_up"

// JSON shapes the rows as `rollwise run --format json` writes them and
// encoding/json reads them back with UseNumber: one map per row, keyed by
// the group references as written, the measure names and "rolled_up" (a
// []any of the rolled-up references). Values are nil, string, bool or
// json.Number; a rolled-up group is nil; the values of a date column are
// "YYYY-MM-DD", those of a timestamp column RFC 3339.
func (r *Result) JSON() []map[string]any {
	q := r.Query
	nCols := len(q.Groups) + len(q.Measures)
	dates := make([]bool, 0, nCols)
	for _, g := range q.Groups {
		dates = append(dates, g.Type == model.TypeDate)
	}
	for _, meas := range q.Measures {
		dates = append(dates, meas.Type == model.TypeDate)
	}
	out := make([]map[string]any, 0, len(r.Rows))
	for _, row := range r.Rows {
		m := map[string]any{}
		rolled := []any{}
		for i, name := range q.GroupNames {
			if row.RolledUp[i] {
				m[name] = nil
				rolled = append(rolled, name)
				continue
			}
			m[name] = jsonValue(row.Groups[i], dates[i])
		}
		for i, meas := range q.Measures {
			m[meas.Name] = jsonValue(row.Measures[i], dates[len(q.Groups)+i])
		}
		m[RolledUpKey] = rolled
		out = append(out, m)
	}
	return out
}

// jsonValue renders one value as the JSON report does.
func jsonValue(v Value, asDate bool) any {
	switch x := v.(type) {
	case nil:
		return nil
	case decimal.Decimal:
		return json.Number(x.String())
	case float64:
		if math.IsNaN(x) || math.IsInf(x, 0) {
			return nil
		}
		b, err := json.Marshal(x)
		if err != nil {
			return json.Number(strconv.FormatFloat(x, 'g', -1, 64))
		}
		return json.Number(b)
	case string, bool:
		return x
	case time.Time:
		if asDate {
			return x.UTC().Format(time.DateOnly)
		}
		return x.UTC().Format(time.RFC3339Nano)
	}
	return v
}
