package model

import (
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/grammar"
)

// Request is what a report asks for, in words of the language: measure
// names, group column references (table.column), a row filter, a totals
// mode (none, grand, rollup or all), an order ("revenue desc,
// stores.city") and a limit of detail rows (0 for none). NewQuery
// resolves it against a model.
type Request struct {
	Measures []string
	By       []string
	Where    string
	Totals   string
	Order    string
	Limit    int
	// Names are what diagnostics call the request's parts; empty names
	// are the parts' own words (DefaultNames).
	Names PartNames
}

// PartNames are what diagnostics call the parts of a request: the file
// of their positions ("the filter:1:9") and the words of their messages
// ("the order names revenue twice"). A caller that reads the request
// from elsewhere names each part as its user wrote it (a command line's
// options).
type PartNames struct {
	Measures, By, Where, Totals, Order, Limit string
}

// DefaultNames are the parts' own words.
var DefaultNames = PartNames{
	Measures: "the measure list", By: "the group list", Where: "the filter",
	Totals: "the totals mode", Order: "the order", Limit: "the limit",
}

// orDefault fills the names left empty with DefaultNames.
func (n PartNames) orDefault() PartNames {
	pick := func(s, d string) string {
		if s == "" {
			return d
		}
		return s
	}
	d := DefaultNames
	return PartNames{
		Measures: pick(n.Measures, d.Measures), By: pick(n.By, d.By), Where: pick(n.Where, d.Where),
		Totals: pick(n.Totals, d.Totals), Order: pick(n.Order, d.Order), Limit: pick(n.Limit, d.Limit),
	}
}

// Override applies the totals mode, order and limit of req where they
// are given (a view's own query, changed by the report that reads it).
func (q *Query) Override(req Request) grammar.Diagnostics {
	var diags grammar.Diagnostics
	names := req.Names.orDefault()
	switch mode := TotalsMode(strings.ToLower(strings.TrimSpace(req.Totals))); mode {
	case "":
	case TotalsNone, TotalsGrand, TotalsRollup, TotalsAll:
		q.Totals = mode
	default:
		diags.Errorf(grammar.Pos{File: names.Totals}, "usage", "unknown totals mode %q", req.Totals).Suggestion =
			"write none, grand, rollup or all"
	}
	if strings.TrimSpace(req.Order) != "" {
		keys, d := q.parseOrder(req.Order, names)
		diags.Append(d)
		q.Order = keys
	}
	if req.Limit < 0 {
		diags.Errorf(grammar.Pos{File: names.Limit}, "usage", "%s must be a positive number, not %d", names.Limit, req.Limit)
	}
	if req.Limit > 0 {
		q.Limit = req.Limit
	}
	return diags
}

// NewQuery resolves a request against the model. Positions in
// diagnostics name the part they come from, as req.Names calls it
// ("--by:1:9" when the names are a command line's options).
func (m *Model) NewQuery(req Request) (*Query, grammar.Diagnostics) {
	var diags grammar.Diagnostics
	names := req.Names.orDefault()
	q := &Query{Totals: TotalsNone}
	r := &resolver{m: m, state: map[string]int{}}
	for _, name := range m.Measures {
		r.state[name.Name] = 2
	}
	if len(req.Measures) == 0 {
		diags.Errorf(grammar.Pos{File: names.Measures}, "usage", "no measures asked for").Suggestion =
			fmt.Sprintf("name one or more measures in %s, separated by commas (revenue,margin_rate)", names.Measures)
	}
	col := 1
	for _, name := range req.Measures {
		p := grammar.Pos{File: names.Measures, Line: 1, Col: col}
		col += len(name) + 1
		name = unbackquote(strings.TrimSpace(name))
		mm := m.Measure(name)
		if mm == nil {
			var all []string
			for _, x := range m.Measures {
				all = append(all, x.Name)
			}
			d := diags.Errorf(p, "unknown-measure", "unknown measure '%s'", name)
			if near := grammar.Closest(name, all); near != "" {
				d.Message += fmt.Sprintf("; did you mean '%s'?", near)
			}
			continue
		}
		q.Measures = append(q.Measures, mm)
	}
	col = 1
	for _, ref := range req.By {
		p := grammar.Pos{File: names.By, Line: 1, Col: col}
		col += len(ref) + 1
		ref = strings.TrimSpace(ref)
		c := r.byColumn(ref, p)
		if c == nil {
			continue
		}
		for i, prev := range q.Groups {
			if prev == c {
				diags.Errorf(p, "duplicate-group", "%s is already grouped by (as %s)", c, q.GroupNames[i])
			}
		}
		q.Groups = append(q.Groups, c)
		q.GroupNames = append(q.GroupNames, ref)
		q.GroupPos = append(q.GroupPos, p)
	}
	diags.Append(r.diags)
	r.diags = nil
	diags.Append(nameClashes(q))
	if strings.TrimSpace(req.Where) != "" {
		e, d := grammar.ParseExpr(names.Where, req.Where)
		diags.Append(d)
		if e != nil {
			pred := (&exprResolver{r: r, row: true}).expr(e)
			if pred != nil && (&exprResolver{r: r}).wantType(pred, TypeBoolean, names.Where) {
				q.Filters = Conjuncts(pred)
			}
		}
	}
	q.model = m
	diags.Append(q.Override(Request{Totals: req.Totals, Order: req.Order, Limit: req.Limit, Names: req.Names}))
	diags.Append(r.diags)
	return q, diags
}
