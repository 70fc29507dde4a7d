package explain

import (
	"encoding/json"
	"fmt"
	"io"
	"strings"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/report"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/reference"
)

// show is a value as the table format shows it, NULL written out.
func show(v reference.Value, t model.Type, f model.Format) string {
	if v == nil {
		return "NULL"
	}
	s, err := report.Show(v, report.Column{Format: f, Type: t})
	if err != nil {
		return fmt.Sprint(v)
	}
	return s
}

// WriteJSON writes the tree as one indented JSON object.
func WriteJSON(w io.Writer, t *Tree) error {
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(t)
}

// WriteText writes the tree for people: a heading that names the cell,
// then the parts as an indented tree, each with its value and, under it,
// its iteration tables, rows, narrowings and edits, additivity and cell.
func WriteText(w io.Writer, t *Tree) error {
	var b strings.Builder
	switch {
	case t.Default && len(t.Rolled) > 0:
		fmt.Fprintf(&b, "%s in the grand total cell (no --cell given: every group column rolled up; name a cell with --cell \"%s=...\")\n",
			t.Measure, t.Rolled[0])
		if len(t.Cell) > 0 {
			fmt.Fprintf(&b, "under %s\n", strings.Join(t.Cell, ", "))
		}
	case len(t.Cell) == 0:
		fmt.Fprintf(&b, "%s over all the rows (no group columns, no filter)\n", t.Measure)
	default:
		fmt.Fprintf(&b, "%s in the cell %s\n", t.Measure, strings.Join(t.Cell, ", "))
		if t.Total != "" && !t.Default {
			fmt.Fprintf(&b, "(%s)\n", t.Total)
		}
	}
	b.WriteString("\n")
	writeNode(&b, t.Root, "", "")
	if t.Omitted > 0 {
		fmt.Fprintf(&b, "\n(%d more parts not shown: the tree stops at %d parts)\n", t.Omitted, MaxParts)
	}
	_, err := io.WriteString(w, b.String())
	return err
}

// writeNode writes n: its title after lead, its details and parts after
// rest (the tree's lines to the left).
func writeNode(b *strings.Builder, n *Node, lead, rest string) {
	title := n.Definition
	if n.Name != "" {
		title = n.Name + " = " + n.Definition
	}
	value := n.Shown
	if n.Cell == nil {
		value = "(not evaluated)"
	}
	fmt.Fprintf(b, "%s%s  →  %s\n", lead, title, value)
	detail := rest + "│     "
	if len(n.Parts) == 0 {
		detail = rest + "      "
	}
	line := func(format string, args ...any) { fmt.Fprintf(b, "%s"+format+"\n", append([]any{detail}, args...)...) }
	for _, v := range n.Via {
		switch {
		case strings.HasPrefix(v, "where "):
			line("narrowed: %s", v)
		case strings.HasPrefix(v, "having "):
			line("the condition of the groups above: %s", v)
		default:
			line("edited: %s", v)
		}
	}
	over := n.Type
	if n.Format != "" {
		over += ", format " + n.Format
	}
	if len(n.Tables) > 0 {
		over += "; iterates over " + strings.Join(n.Tables, ", ")
	}
	if n.Rows != nil {
		over += fmt.Sprintf(": %d of its %d rows in the cell", n.Rows.InCell, n.Rows.All)
	}
	line("%s", over)
	if g := n.Groups; g != nil {
		per := fmt.Sprintf("per %s: %d groups in the cell, %d kept", strings.Join(g.Per, ", "), g.All, g.Kept)
		var vals []string
		for _, x := range g.First {
			if x.Shown != "" {
				vals = append(vals, x.Group+" → "+x.Shown)
			} else {
				vals = append(vals, x.Group)
			}
		}
		if len(vals) > 0 {
			per += ": " + strings.Join(vals, "; ")
			if g.Kept > len(vals) {
				per += "; ..."
			}
		}
		line("%s", per)
		if len(g.Dropped) > 0 {
			line("not counted: %s", strings.Join(g.Dropped, "; "))
		}
		if g.PartsIn != "" && len(n.Parts) > 0 {
			line("the parts below are shown in the group %s", g.PartsIn)
		}
	}
	line("%s", n.Additivity)
	switch {
	case n.Cell == nil:
	case len(n.Cell) == 0:
		line("cell: every row (no constraint)")
	default:
		line("cell: %s", strings.Join(n.Cell, ", "))
	}
	if n.Note != "" {
		line("%s", n.Note)
	}
	for i, p := range n.Parts {
		if i == len(n.Parts)-1 {
			writeNode(b, p, rest+"└─ ", rest+"   ")
		} else {
			writeNode(b, p, rest+"├─ ", rest+"│  ")
		}
	}
}

// isCall reports whether s[from:to] is one call, name(...).
func isCall(s string, from, to int, match []int) bool {
	open := strings.IndexByte(s[from:to], '(')
	return open > 0 && !strings.ContainsAny(s[from:from+open], " )+-*/<>=,'") && match[from+open] == to-1
}

// tidy drops the parentheses that model.Text writes around a whole
// expression and around a call's whole argument: ((a - b) / c) is shown
// (a - b) / c, sum((x * y)) sum(x * y).
func tidy(s string) string {
	match := make([]int, len(s))
	var open []int
	quote := byte(0)
	for i := 0; i < len(s); i++ {
		switch c := s[i]; {
		case quote != 0:
			if c == quote {
				quote = 0
			}
		case c == '\'' || c == '`':
			quote = c
		case c == '(':
			open = append(open, i)
		case c == ')' && len(open) > 0:
			o := open[len(open)-1]
			open = open[:len(open)-1]
			match[o] = i
		}
	}
	drop := make([]bool, len(s))
	for i := 0; i < len(s); i++ {
		j := match[i]
		if s[i] != '(' || j == 0 {
			continue
		}
		whole := i == 0 && j == len(s)-1
		inner := i > 0 && s[i-1] == '(' && j+1 < len(s) && s[j+1] == ')' && match[i-1] == j+1
		// where binds loosest: its predicate needs no parentheses up to
		// the end of the text or of the parentheses around it.
		narrowing := strings.HasSuffix(s[:i], "where ") && (j == len(s)-1 || s[j+1] == ')')
		// a name in parentheses before its edits: (revenue)[...]
		name := j+1 < len(s) && s[j+1] == '[' && (!strings.ContainsAny(s[i+1:j], " ()+-*/<>=,'") || isCall(s, i+1, j, match))
		if whole || inner || narrowing || name {
			drop[i], drop[j] = true, true
		}
	}
	var b strings.Builder
	for i := 0; i < len(s); i++ {
		if !drop[i] {
			b.WriteByte(s[i])
		}
	}
	return b.String()
}
