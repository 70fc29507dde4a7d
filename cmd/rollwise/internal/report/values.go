package report

import (
	"encoding/json"
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"

	"github.com/rollwise/rollwise/planner/model"
	"github.com/shopspring/decimal"
)

// rendered is a value in all its forms.
type rendered struct {
	cell   cell
	number bool
}

// nullText is how a NULL group value is shown to people.
const nullText = "(null)"

// renderValue renders one value of column c. asDate says the column's time
// values are all dates.
func renderValue(v any, c Column, asDate bool) (rendered, error) {
	v, err := normalize(v)
	if err != nil {
		return rendered{}, err
	}
	switch x := v.(type) {
	case nil:
		show := ""
		if c.Group {
			show = nullText
		}
		return rendered{cell: cell{null: true, json: "null", show: show}}, nil
	case int64:
		s := strconv.FormatInt(x, 10)
		return rendered{number: true, cell: cell{json: s, raw: s, show: showNumber(decimal.NewFromInt(x), c)}}, nil
	case float64:
		if math.IsNaN(x) || math.IsInf(x, 0) {
			s := strconv.FormatFloat(x, 'g', -1, 64) // NaN, +Inf, -Inf
			return rendered{number: true, cell: cell{json: "null", raw: s, show: s}}, nil
		}
		s := shortestFloat(x)
		return rendered{number: true, cell: cell{json: s, raw: s, show: showNumber(decimal.NewFromFloat(x), c)}}, nil
	case decimal.Decimal:
		s := x.String()
		return rendered{number: true, cell: cell{json: s, raw: s, show: showNumber(x, c)}}, nil
	case string:
		return rendered{cell: cell{json: jsonString(x), raw: x, show: x}}, nil
	case bool:
		s := strconv.FormatBool(x)
		return rendered{cell: cell{json: s, raw: s, show: s}}, nil
	case time.Time:
		if label, ok := periodLabel(x, c.Period); ok {
			s := x.Format(time.DateOnly)
			return rendered{cell: cell{json: jsonString(s), raw: s, show: label}}, nil
		}
		if asDate {
			s := x.Format(time.DateOnly)
			return rendered{cell: cell{json: jsonString(s), raw: s, show: s}}, nil
		}
		s := x.Format(time.RFC3339Nano)
		return rendered{cell: cell{json: jsonString(s), raw: s, show: x.Format("2006-01-02 15:04:05.999999999")}}, nil
	}
	return rendered{}, fmt.Errorf("unsupported value type %T", v)
}

// Show is value v as the table format shows it in column c (a measure's
// format applied; NULL is empty in a measure, "(null)" in a group).
func Show(v any, c Column) (string, error) {
	r, err := renderValue(v, c, c.Type == model.TypeDate)
	return r.cell.show, err
}

// periodLabel names the period that starts at t (midnight UTC on the
// first day of a month, quarter or year): 2024-01, 2024-Q1, 2024. A value
// that is no such start is shown in full.
func periodLabel(t time.Time, period string) (string, bool) {
	if t.Day() != 1 || t.Hour() != 0 || t.Minute() != 0 || t.Second() != 0 || t.Nanosecond() != 0 {
		return "", false
	}
	switch {
	case period == "month":
		return t.Format("2006-01"), true
	case period == "quarter" && (t.Month()-1)%3 == 0:
		return fmt.Sprintf("%d-Q%d", t.Year(), (t.Month()-1)/3+1), true
	case period == "year" && t.Month() == time.January:
		return strconv.Itoa(t.Year()), true
	}
	return "", false
}

// normalize takes a value as engine.Result promises it (nil, int64,
// float64, decimal.Decimal, string, bool, time.Time): the engine converts
// each driver's values once (engine.normalize), and the reference
// evaluator's are of the same types. Times are shown in UTC.
func normalize(v any) (any, error) {
	if t, ok := v.(time.Time); ok {
		return t.UTC(), nil
	}
	return v, nil
}

// shortestFloat renders a finite float in the shortest form that reads
// back as the same float, as JSON does (an exponent only for very large
// or very small magnitudes).
func shortestFloat(f float64) string {
	b, err := json.Marshal(f)
	if err != nil {
		return strconv.FormatFloat(f, 'g', -1, 64)
	}
	return string(b)
}

// jsonString renders s as a JSON string, leaving <, > and & as they are.
func jsonString(s string) string {
	var b strings.Builder
	enc := json.NewEncoder(&b)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(s); err != nil {
		return `""`
	}
	return strings.TrimSuffix(b.String(), "\n")
}

// dateColumns reports, per column, whether it shows dates: a column of
// type date, or of unknown type whose time values all fall on midnight
// UTC.
func dateColumns(t *Table) []bool {
	dates := make([]bool, len(t.Columns))
	for j, c := range t.Columns {
		dates[j] = c.Type == model.TypeNull || c.Type == model.TypeDate
	}
	for _, r := range t.Rows {
		for j, v := range r.Values {
			if j >= len(dates) {
				break
			}
			tv, ok := v.(time.Time)
			if !ok {
				continue
			}
			if t.Columns[j].Type != model.TypeNull {
				continue
			}
			tv = tv.UTC()
			if tv.Hour() != 0 || tv.Minute() != 0 || tv.Second() != 0 || tv.Nanosecond() != 0 {
				dates[j] = false
			}
		}
	}
	return dates
}

// showNumber formats a number for people according to the column's
// format. Group columns show their values in full.
func showNumber(d decimal.Decimal, c Column) string {
	if c.Group {
		return d.String()
	}
	switch c.Format {
	case model.FormatPercent:
		return groupThousands(d.Shift(2).StringFixed(1)) + "%"
	case model.FormatCurrency:
		return groupThousands(d.StringFixed(2))
	case model.FormatInteger:
		return groupThousands(d.StringFixed(0))
	case model.FormatNumber:
		return groupThousands(fewDecimals(d))
	}
	return fewDecimals(d)
}

// fewDecimals rounds d to at most four decimal places, dropping trailing
// zeros; a nonzero value that would round to zero keeps up to four
// significant digits instead.
func fewDecimals(d decimal.Decimal) string {
	places := int32(4)
	if !d.IsZero() {
		for d.Round(places).IsZero() && places < 60 {
			places++
		}
		if places > 4 {
			places += 3
		}
	}
	return d.Round(places).String()
}

// groupThousands puts commas between groups of three digits in the integer
// part of a plain decimal number.
func groupThousands(s string) string {
	sign := ""
	if strings.HasPrefix(s, "-") {
		sign, s = "-", s[1:]
	}
	intPart, frac := s, ""
	if i := strings.IndexByte(s, '.'); i >= 0 {
		intPart, frac = s[:i], s[i:]
	}
	if len(intPart) <= 3 {
		return sign + intPart + frac
	}
	var b strings.Builder
	lead := len(intPart) % 3
	if lead > 0 {
		b.WriteString(intPart[:lead])
	}
	for i := lead; i < len(intPart); i += 3 {
		if b.Len() > 0 {
			b.WriteByte(',')
		}
		b.WriteString(intPart[i : i+3])
	}
	return sign + b.String() + frac
}
