package model

import (
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/grammar"
)

// OrderKey is one key of a report's order: a measure of the query or one
// of its group columns, ascending or descending (NULLs last either way).
type OrderKey struct {
	// Measure is the key's measure, or nil when the key is a group column.
	Measure *Measure
	// Group is the index in Query.Groups of a group column key.
	Group int
	Desc  bool
}

// parseOrder reads a request's order: keys separated by commas, each a
// measure the query asks for or one of its group columns, then asc or
// desc ("revenue desc, orders.o_orderdate"). Commas and spaces inside
// backquotes belong to the name. names are what messages call the parts.
func (q *Query) parseOrder(text string, names PartNames) ([]OrderKey, grammar.Diagnostics) {
	var diags grammar.Diagnostics
	var keys []OrderKey
	for _, item := range splitOutsideBackquotes(text, ',') {
		p := grammar.Pos{File: names.Order, Line: 1, Col: item.col}
		words := splitOutsideBackquotes(item.text, ' ')
		if len(words) == 0 {
			diags.Errorf(p, "usage", "%s has an empty key", names.Order).Suggestion = `write keys separated by commas: "revenue desc, stores.city"`
			continue
		}
		desc := false
		if n := len(words); n == 2 && (strings.EqualFold(words[1].text, "desc") || strings.EqualFold(words[1].text, "asc")) {
			desc = strings.EqualFold(words[1].text, "desc")
		} else if n != 1 {
			diags.Errorf(p, "usage", "%s key %q is not a name and an optional asc or desc", names.Order, strings.TrimSpace(item.text)).Suggestion =
				`write keys separated by commas: "revenue desc, stores.city"`
			continue
		}
		name := words[0].text
		p.Col += words[0].col - 1
		k, ok := q.orderKey(name, p, names, &diags)
		if !ok {
			continue
		}
		k.Desc = desc
		for _, prev := range keys {
			if prev.Measure == k.Measure && (k.Measure != nil || prev.Group == k.Group) {
				diags.Errorf(p, "usage", "%s names %s twice", names.Order, name).Suggestion = "give each key once"
				ok = false
			}
		}
		if ok {
			keys = append(keys, k)
		}
	}
	return keys, diags
}

// orderKey resolves one key's name: a measure of the query, or a column
// reference that is one of its groups.
func (q *Query) orderKey(name string, p grammar.Pos, names PartNames, diags *grammar.Diagnostics) (OrderKey, bool) {
	if !isColumnRef(name) {
		m := q.model.Measure(unbackquote(name))
		if m == nil {
			var all []string
			for _, x := range q.model.Measures {
				all = append(all, x.Name)
			}
			d := diags.Errorf(p, "unknown-measure", "%s names '%s', which is not a measure", names.Order, name)
			if near := grammar.Closest(name, all); near != "" {
				d.Message += fmt.Sprintf("; did you mean '%s'?", near)
			}
			d.Suggestion = "name a measure of the query or one of its group columns (table.column)"
			return OrderKey{}, false
		}
		for _, mm := range q.Measures {
			if mm == m {
				return OrderKey{Measure: m}, true
			}
		}
		diags.Errorf(p, "usage", "%s names %s, which the query does not ask for", names.Order, name).Suggestion = "add it to " + names.Measures
		return OrderKey{}, false
	}
	r := &resolver{m: q.model, state: map[string]int{}}
	c := r.byColumn(name, p)
	diags.Append(r.diags)
	if c == nil {
		return OrderKey{}, false
	}
	for i, g := range q.Groups {
		if g == c {
			return OrderKey{Group: i}, true
		}
	}
	diags.Errorf(p, "usage", "%s names %s, which is not a group column of the query", names.Order, name).Suggestion =
		"add it to " + names.By + ", or sort by a measure or a column the query groups by"
	return OrderKey{}, false
}

// isColumnRef reports whether name has a dot outside backquotes
// (table.column), which a measure's name never has.
func isColumnRef(name string) bool {
	return len(splitOutsideBackquotes(name, '.')) > 1
}

// unbackquote returns the name a backquoted name stands for.
func unbackquote(name string) string {
	if len(name) >= 2 && name[0] == '`' && name[len(name)-1] == '`' {
		return strings.ReplaceAll(name[1:len(name)-1], "``", "`")
	}
	return name
}

// SplitList splits a list of names or column references at the commas
// outside backquotes, so that "`net, after tax`,revenue" names two
// measures, and trims each item; blank items are dropped. A double quote
// is an ordinary character.
func SplitList(s string) []string {
	var out []string
	for _, item := range splitOutsideBackquotes(s, ',') {
		out = append(out, item.text)
	}
	return out
}

// listItem is a part of an option's text and the column it starts at.
type listItem struct {
	text string
	col  int
}

// splitOutsideBackquotes splits s at sep where sep is not inside
// backquotes (a doubled backquote stands for one inside), dropping parts
// that are blank, and trims each part's surrounding spaces; col is where
// the trimmed part starts, counting from 1.
func splitOutsideBackquotes(s string, sep byte) []listItem {
	var out []listItem
	add := func(start, end int) {
		part := s[start:end]
		trimmed := strings.TrimLeft(part, " \t")
		if t := strings.TrimRight(trimmed, " \t"); t != "" {
			out = append(out, listItem{text: t, col: start + len(part) - len(trimmed) + 1})
		}
	}
	start, quoted := 0, false
	for i := 0; i < len(s); i++ {
		switch {
		case s[i] == '`':
			quoted = !quoted
		case s[i] == sep && !quoted:
			add(start, i)
			start = i + 1
		}
	}
	add(start, len(s))
	return out
}
