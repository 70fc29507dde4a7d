package verify

import (
	"bytes"
	"encoding/json"
	"fmt"
	"io"
	"strconv"
	"strings"
	"text/tabwriter"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/report"
)

// rowLabel names a row for people: "stores.region=North, sales.item=(total)".
func (r *Report) rowLabel(id RowID) string {
	rolled := map[string]bool{}
	for _, g := range id.RolledUp {
		rolled[g] = true
	}
	if len(r.Groups) == 0 {
		return "(the one row)"
	}
	if id.Known && len(id.RolledUp) == len(r.Groups) {
		return "(grand total)"
	}
	var parts []string
	for i, g := range r.Groups {
		var s string
		switch {
		case rolled[g]:
			s = "(total)"
		case id.Keys[i] == nil && !id.Known:
			s = "NULL"
		default:
			s = showKey(id.Keys[i])
		}
		parts = append(parts, g+"="+s)
	}
	return strings.Join(parts, ", ")
}

func (r *Report) valueList(vals []Value) string {
	var parts []string
	for j, name := range r.Measures {
		parts = append(parts, name+" "+vals[j].String())
	}
	return strings.Join(parts, ", ")
}

// Summary is the one-line outcome.
func (r *Report) Summary() string {
	s := fmt.Sprintf("%s matched, %s compared, %d differ; %s only in the SQL, %d only in rollwise",
		report.Count(r.Matched, "row"), report.Count(r.Compared, "value"), len(r.Differences), report.Count(len(r.SQLOnly), "row"), len(r.RollwiseOnly))
	if len(r.Ambiguous) > 0 {
		s += fmt.Sprintf(", %d ambiguous", len(r.Ambiguous))
	}
	return s
}

// WriteText writes the report for people.
func WriteText(w io.Writer, r *Report) error {
	var b bytes.Buffer
	by := ""
	if len(r.Groups) > 0 {
		by = " by " + strings.Join(r.Groups, ", ")
	}
	fmt.Fprintf(&b, "verify %s: %s%s, totals %s\n", r.SQLName, strings.Join(r.Measures, ", "), by, r.Totals)
	if len(r.Differences) > 0 {
		b.WriteString("\nvalues that differ:\n")
		tw := tabwriter.NewWriter(&b, 0, 0, 2, ' ', 0)
		last := ""
		for _, d := range r.Differences {
			if label := r.rowLabel(d.Row); label != last {
				tw.Flush()
				fmt.Fprintf(&b, "  %s\n", label)
				last = label
			}
			fmt.Fprintf(tw, "    %s\tSQL %s\trollwise %s\n", d.Measure, d.SQL, d.Rollwise)
			tw.Flush()
			if d.Diagnosis != "" {
				fmt.Fprintf(&b, "      %s: %s\n", d.Diagnosis, d.Explanation)
				if len(d.AlsoFits) > 0 {
					fmt.Fprintf(&b, "      (also fits: %s)\n", strings.Join(d.AlsoFits, ", "))
				}
			} else {
				b.WriteString("      no usual mistake gives the SQL's value\n")
			}
		}
		tw.Flush()
	}
	writeUnmatched := func(title string, list []Unmatched) {
		if len(list) == 0 {
			return
		}
		fmt.Fprintf(&b, "\n%s:\n", title)
		for _, u := range list {
			fmt.Fprintf(&b, "  %s: %s\n", r.rowLabel(u.Row), r.valueList(u.Values))
			if u.Diagnosis != "" {
				fmt.Fprintf(&b, "      %s: %s\n", u.Diagnosis, u.Explanation)
			}
		}
	}
	writeUnmatched("rows only in the SQL", r.SQLOnly)
	writeUnmatched("rows only in rollwise", r.RollwiseOnly)
	if len(r.Ambiguous) > 0 {
		b.WriteString("\nrows that cannot be told apart:\n")
		for _, a := range r.Ambiguous {
			fmt.Fprintf(&b, "  %s\n", a.Reason)
			for _, u := range a.SQLRows {
				fmt.Fprintf(&b, "      SQL       %s: %s\n", r.rowLabel(u.Row), r.valueList(u.Values))
			}
			for _, u := range a.RollwiseRows {
				fmt.Fprintf(&b, "      rollwise  %s: %s\n", r.rowLabel(u.Row), r.valueList(u.Values))
			}
		}
	}
	if len(r.Notes) > 0 {
		b.WriteString("\nnotes:\n")
		for _, n := range r.Notes {
			fmt.Fprintf(&b, "  - %s\n", n)
		}
	}
	verdict := "ok"
	if !r.OK() {
		verdict = "differs"
	}
	fmt.Fprintf(&b, "\n%s: %s (tolerance %s relative; exact where both sides are exact)\n", verdict, r.Summary(),
		strconv.FormatFloat(r.Tolerance, 'g', -1, 64))
	_, err := w.Write(b.Bytes())
	return err
}

// MarshalJSON writes the value as a JSON number (or null).
func (v Value) MarshalJSON() ([]byte, error) { return []byte(v.JSON()), nil }

// jsonRow is a row as {"group": value, ...} in --by order.
type jsonRow struct {
	groups []string
	id     RowID
}

func (j jsonRow) MarshalJSON() ([]byte, error) {
	var b bytes.Buffer
	b.WriteString("{")
	for i, g := range j.groups {
		if i > 0 {
			b.WriteString(",")
		}
		b.WriteString(strconv.Quote(g) + ":" + jsonKey(j.id.Keys[i]))
	}
	b.WriteString("}")
	return b.Bytes(), nil
}

// jsonValues is a row's measure values in measure order.
type jsonValues struct {
	names []string
	vals  []Value
}

func (j jsonValues) MarshalJSON() ([]byte, error) {
	var b bytes.Buffer
	b.WriteString("{")
	for i, n := range j.names {
		if i > 0 {
			b.WriteString(",")
		}
		b.WriteString(strconv.Quote(n) + ":" + j.vals[i].JSON())
	}
	b.WriteString("}")
	return b.Bytes(), nil
}

type jsonDifference struct {
	Row         jsonRow  `json:"row"`
	RolledUp    []string `json:"rolled_up"`
	Measure     string   `json:"measure"`
	SQL         Value    `json:"sql"`
	Rollwise    Value    `json:"rollwise"`
	Diagnosis   *string  `json:"diagnosis"`
	Explanation string   `json:"explanation,omitempty"`
	AlsoFits    []string `json:"also_fits,omitempty"`
}

type jsonUnmatched struct {
	Row         jsonRow    `json:"row"`
	RolledUp    []string   `json:"rolled_up"`
	Values      jsonValues `json:"values"`
	Diagnosis   *string    `json:"diagnosis,omitempty"`
	Explanation string     `json:"explanation,omitempty"`
}

type jsonAmbiguity struct {
	Reason       string          `json:"reason"`
	SQLRows      []jsonUnmatched `json:"sql_rows"`
	RollwiseRows []jsonUnmatched `json:"rollwise_rows"`
}

type jsonReport struct {
	OK           bool             `json:"ok"`
	SQL          string           `json:"sql"`
	Measures     []string         `json:"measures"`
	By           []string         `json:"by"`
	Totals       string           `json:"totals"`
	Tolerance    float64          `json:"tolerance"`
	Matched      int              `json:"rows_matched"`
	Compared     int              `json:"values_compared"`
	Differ       int              `json:"values_differing"`
	Differences  []jsonDifference `json:"differences"`
	SQLOnly      []jsonUnmatched  `json:"sql_only"`
	RollwiseOnly []jsonUnmatched  `json:"rollwise_only"`
	Ambiguous    []jsonAmbiguity  `json:"ambiguous"`
	Notes        []string         `json:"notes"`
}

// rolledJSON is the rolled-up list of a row: null when a handwritten row's
// totals are not known.
func rolledJSON(id RowID) []string {
	if !id.Known {
		return nil
	}
	return append([]string{}, id.RolledUp...)
}

func strOrNil(s string) *string {
	if s == "" {
		return nil
	}
	return &s
}

func (r *Report) unmatchedJSON(list []Unmatched) []jsonUnmatched {
	out := []jsonUnmatched{}
	for _, u := range list {
		out = append(out, jsonUnmatched{Row: jsonRow{r.Groups, u.Row}, RolledUp: rolledJSON(u.Row),
			Values: jsonValues{r.Measures, u.Values}, Diagnosis: strOrNil(u.Diagnosis), Explanation: u.Explanation})
	}
	return out
}

// WriteJSON writes the report as one JSON object.
func WriteJSON(w io.Writer, r *Report) error {
	out := jsonReport{OK: r.OK(), SQL: r.SQLName, Measures: r.Measures, By: append([]string{}, r.Groups...),
		Totals: r.Totals, Tolerance: r.Tolerance, Matched: r.Matched, Compared: r.Compared,
		Differ: len(r.Differences), Differences: []jsonDifference{}, SQLOnly: r.unmatchedJSON(r.SQLOnly),
		RollwiseOnly: r.unmatchedJSON(r.RollwiseOnly), Ambiguous: []jsonAmbiguity{}, Notes: append([]string{}, r.Notes...)}
	for _, d := range r.Differences {
		out.Differences = append(out.Differences, jsonDifference{Row: jsonRow{r.Groups, d.Row}, RolledUp: rolledJSON(d.Row),
			Measure: d.Measure, SQL: d.SQL, Rollwise: d.Rollwise, Diagnosis: strOrNil(d.Diagnosis),
			Explanation: d.Explanation, AlsoFits: d.AlsoFits})
	}
	for _, a := range r.Ambiguous {
		out.Ambiguous = append(out.Ambiguous, jsonAmbiguity{Reason: a.Reason,
			SQLRows: r.unmatchedJSON(a.SQLRows), RollwiseRows: r.unmatchedJSON(a.RollwiseRows)})
	}
	enc := json.NewEncoder(w)
	enc.SetEscapeHTML(false)
	enc.SetIndent("", "  ")
	return enc.Encode(out)
}
