package langserver

import (
	"fmt"
	"strings"
	"unicode/utf16"
	"unicode/utf8"

	"github.com/tliron/glsp"
	protocol "github.com/tliron/glsp/protocol_3_16"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
)

// symbol is what a name in a model file stands for.
type symbol struct {
	measure *model.Measure
	table   *model.Table
	column  *model.Column
}

func (y symbol) same(o symbol) bool {
	return y.measure == o.measure && y.table == o.table && y.column == o.column
}

// occurrence is a name token and what it stands for.
type occurrence struct {
	tok grammar.Token
	sym symbol
}

// occurrences resolves every name token of a file: a measure, a table
// (before a dot, after `table` or `->`), a column (after table and a dot,
// or a bare name inside a table's braces).
func occurrences(m *model.Model, path, src string) []occurrence {
	if m == nil {
		return nil
	}
	toks := grammar.Tokens(path, src)
	var out []occurrence
	var current, pending *model.Table
	for i, t := range toks {
		prev, next := grammar.Token{}, grammar.Token{}
		if i > 0 {
			prev = toks[i-1]
		}
		if i+1 < len(toks) {
			next = toks[i+1]
		}
		switch {
		case t.Kind == "operator" && t.Text == "{":
			current = pending
			continue
		case t.Kind == "operator" && t.Text == "}":
			current = nil
			continue
		case t.Kind == "keyword" && prev.Text != ".":
			continue
		case t.Kind != "name" && t.Kind != "keyword":
			continue
		}
		name := unquote(t.Text)
		var y symbol
		switch {
		case prev.Kind == "operator" && prev.Text == "." && i >= 2:
			if tb := m.Table(unquote(toks[i-2].Text)); tb != nil {
				y.column = tb.Column(name)
			}
		case next.Kind == "operator" && next.Text == ".":
			y.table = m.Table(name)
		case strings.EqualFold(prev.Text, "table") && prev.Kind == "keyword":
			y.table = m.Table(name)
			pending = y.table
		case current != nil && current.Column(name) != nil && next.Text != "(":
			y.column = current.Column(name)
		default:
			y.measure = m.Measure(name)
			if y.measure == nil && next.Text != "(" {
				y.table = m.Table(name)
			}
		}
		if y.measure != nil || y.table != nil || y.column != nil {
			out = append(out, occurrence{tok: t, sym: y})
		}
	}
	return out
}

func unquote(s string) string {
	if len(s) >= 2 && s[0] == '`' && s[len(s)-1] == '`' {
		return s[1 : len(s)-1]
	}
	return s
}

// at finds the occurrence under the cursor.
func (s *Server) at(p protocol.TextDocumentPositionParams) (*workspace, *occurrence) {
	path := uriPath(p.TextDocument.URI)
	w := s.workspace(path)
	src := w.src[path]
	line, col := column(src, p.Position)
	for _, o := range occurrences(w.model, path, src) {
		n := utf8.RuneCountInString(o.tok.Text)
		if o.tok.Line == line && col >= o.tok.Col && col <= o.tok.Col+n {
			return w, &o
		}
	}
	return w, nil
}

// declaration is where a symbol is declared.
func (y symbol) declaration() grammar.Pos {
	switch {
	case y.measure != nil:
		return y.measure.Pos
	case y.column != nil:
		return y.column.Pos
	default:
		return y.table.Pos
	}
}

func (s *Server) definition(_ *glsp.Context, p *protocol.DefinitionParams) (any, error) {
	w, o := s.at(p.TextDocumentPositionParams)
	if o == nil {
		return nil, nil
	}
	return s.location(w, o.sym.declaration(), nameOf(o.sym)), nil
}

func (s *Server) location(w *workspace, pos grammar.Pos, name string) protocol.Location {
	src, ok := w.src[pos.File]
	if !ok {
		src, _ = s.text(pos.File)
	}
	start := position(src, pos.Line, pos.Col)
	end := position(src, pos.Line, pos.Col+utf8.RuneCountInString(name))
	return protocol.Location{URI: pathURI(pos.File), Range: protocol.Range{Start: start, End: end}}
}

func nameOf(y symbol) string {
	switch {
	case y.measure != nil:
		return y.measure.Name
	case y.column != nil:
		return y.column.Name
	default:
		return y.table.Name
	}
}

func (s *Server) references(_ *glsp.Context, p *protocol.ReferenceParams) ([]protocol.Location, error) {
	w, o := s.at(p.TextDocumentPositionParams)
	if o == nil {
		return nil, nil
	}
	decl := o.sym.declaration()
	out := []protocol.Location{}
	for _, f := range w.paths {
		for _, x := range occurrences(w.model, f, w.src[f]) {
			if !x.sym.same(o.sym) {
				continue
			}
			isDecl := f == decl.File && x.tok.Line == decl.Line && x.tok.Col == decl.Col
			if isDecl && !p.Context.IncludeDeclaration {
				continue
			}
			out = append(out, s.location(w, grammar.Pos{File: f, Line: x.tok.Line, Col: x.tok.Col}, x.tok.Text))
		}
	}
	return out, nil
}

func (s *Server) hover(_ *glsp.Context, p *protocol.HoverParams) (*protocol.Hover, error) {
	_, o := s.at(p.TextDocumentPositionParams)
	if o == nil {
		return nil, nil
	}
	return &protocol.Hover{Contents: protocol.MarkupContent{Kind: protocol.MarkupKindMarkdown, Value: describe(o.sym)}}, nil
}

// describe is a symbol's hover text: a measure's definition, type,
// format, description, iteration tables and additivity; a column's type,
// table and links; a table's relation, key and links.
func describe(y symbol) string {
	var b strings.Builder
	switch {
	case y.measure != nil:
		m := y.measure
		fmt.Fprintf(&b, "```\nmeasure %s = %s\n```\n\n", m.Name, model.Text(m.Expr))
		fmt.Fprintf(&b, "type %s", m.Type)
		if m.Format != "" {
			fmt.Fprintf(&b, ", format %s", m.Format)
		}
		b.WriteString("\n\n")
		if m.Doc != "" {
			b.WriteString(m.Doc + "\n\n")
		}
		if ts := iterationTables(m); len(ts) > 0 {
			fmt.Fprintf(&b, "iterates over: %s\n\n", strings.Join(ts, ", "))
		}
		if model.AdditiveMeasure(m.Expr) {
			b.WriteString("additive: its subtotals equal the sums of their rows")
		} else {
			b.WriteString("not additive: every total is re-evaluated in its own cell, never summed")
		}
	case y.column != nil:
		c := y.column
		fmt.Fprintf(&b, "column %s: %s", c, c.Type)
		if a := additivityWord(c); a != "" {
			b.WriteString(", " + a)
		}
		if c.Derived != nil {
			fmt.Fprintf(&b, "\n\n```\n%s = %s\n```", c.Name, model.Text(c.Derived))
		}
		fmt.Fprintf(&b, "\n\ntable %s", c.Table.Name)
		for _, l := range c.Table.Links {
			for _, fc := range l.FromCols {
				if fc == c {
					fmt.Fprintf(&b, "\n\nlinks: %s", l)
				}
			}
		}
	default:
		t := y.table
		fmt.Fprintf(&b, "table %s at %s, %d columns", t.Name, strings.Join(t.Relation, "."), len(t.Columns))
		if len(t.Key) > 0 {
			var key []string
			for _, c := range t.Key {
				key = append(key, c.Name)
			}
			fmt.Fprintf(&b, ", key %s", strings.Join(key, ", "))
		}
		for _, l := range t.Links {
			fmt.Fprintf(&b, "\n\nlinks: %s", l)
		}
	}
	return b.String()
}

func additivityWord(c *model.Column) string {
	switch {
	case c.SemiDate != nil:
		return "semiadditive over " + c.SemiDate.String()
	case c.Additivity == model.NonAdditive:
		return "nonadditive"
	}
	return ""
}

// iterationTables names the tables whose rows a measure's aggregates
// iterate over, through the measures it builds on, in first-use order.
func iterationTables(m *model.Measure) []string {
	var out []string
	for _, t := range model.IterationTables(m.Expr) {
		out = append(out, t.Name)
	}
	return out
}

func (s *Server) completion(_ *glsp.Context, p *protocol.CompletionParams) (any, error) {
	path := uriPath(p.TextDocument.URI)
	w := s.workspace(path)
	if w.model == nil {
		return []protocol.CompletionItem{}, nil
	}
	src := w.src[path]
	line, col := column(src, p.Position)
	before := []rune(lineText(src, line))
	before = before[:min(col-1, len(before))]
	word := len(before)
	for word > 0 && (isWordRune(before[word-1]) || before[word-1] == '`') {
		word--
	}
	items := []protocol.CompletionItem{}
	add := func(label string, kind protocol.CompletionItemKind, detail string) {
		items = append(items, protocol.CompletionItem{Label: label, Kind: &kind, Detail: &detail})
	}
	if word > 0 && before[word-1] == '.' {
		// table.column after a dot.
		start := word - 1
		for start > 0 && (isWordRune(before[start-1]) || before[start-1] == '`') {
			start--
		}
		if t := w.model.Table(unquote(string(before[start : word-1]))); t != nil {
			for _, c := range t.Columns {
				add(c.Name, protocol.CompletionItemKindField, c.Type.String())
			}
		}
		return items, nil
	}
	for _, m := range w.model.Measures {
		add(m.Name, protocol.CompletionItemKindFunction, "measure: "+model.Text(m.Expr))
	}
	for _, t := range w.model.Tables {
		add(t.Name, protocol.CompletionItemKindClass, "table")
	}
	return items, nil
}

func (s *Server) formatting(_ *glsp.Context, p *protocol.DocumentFormattingParams) ([]protocol.TextEdit, error) {
	path := uriPath(p.TextDocument.URI)
	src, ok := s.text(path)
	if !ok {
		return nil, nil
	}
	out, err := s.format(path, src)
	if err != nil || out == src {
		return []protocol.TextEdit{}, nil // a model that does not parse is left as it is
	}
	// One edit over the whole document, which ends on its last line
	// after that line's last character (counted in UTF-16 units).
	last := src[strings.LastIndex(src, "\n")+1:]
	end := protocol.Position{Line: protocol.UInteger(strings.Count(src, "\n")), Character: protocol.UInteger(len(utf16.Encode([]rune(last))))}
	return []protocol.TextEdit{{Range: protocol.Range{End: end}, NewText: out}}, nil
}
