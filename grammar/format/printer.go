package format

import (
	"strings"

	"github.com/rollwise/rollwise/grammar"
)

// A segment is what the layout puts on a line of its own (or on several,
// when it was written on several): a declaration, a table's header up to
// its "{", one item of a table, or a table's "}".
type segKind int

const (
	segMeasure segKind = iota
	segView
	segTable
	segColumn
	segItem // key or link
	segClose
)

type segment struct {
	kind segKind
	// toks are the segment's tokens with the comments among them.
	toks []*tok
	// trailing is a comment after its last token, on the same line.
	trailing *tok
}

// How an entry takes part in aligning blocks.
type role int

const (
	aligned     role = iota // its cells are aligned with its block's
	transparent             // not aligned, and does not end a block (a comment line, a key)
	breaker                 // ends a block (a line of several, a table's header or "}")
)

// An entry is one printed line, or several for a segment written on
// several lines.
type entry struct {
	indent int
	blank  bool // a blank line before it
	role   role
	// cells are the parts of an aligned line, its comment last; gaps
	// are the least spaces after each, flex marks the cells that do not
	// widen their column (a derived column's expression), pads the
	// spaces after each once aligned.
	cells []string
	gaps  []int
	flex  []bool
	pads  []int
	// text is the entry when it has no cells: continuation lines
	// indented, or a comment.
	text string
}

type printer struct {
	toks    []tok
	entries []*entry
	// lastDecl is the kind of the last declaration printed, declared
	// says whether there was one; leading is the first entry after it
	// (the comments that lead into the next declaration start there).
	lastDecl segKind
	declared bool
	leading  int
	// opened says the last entry was a table's header.
	opened bool
}

// segment cuts the tokens into segments, sending each to add, and the
// comments between them to addComment.
func (p *printer) segment(f *grammar.File) {
	starts := map[int]segKind{}
	for _, t := range f.Tables {
		starts[t.Pos.Offset] = segTable
		for _, c := range t.Columns {
			starts[c.Pos.Offset] = segColumn
		}
	}
	for _, m := range f.Measures {
		starts[m.Pos.Offset] = segMeasure
	}
	for _, v := range f.Views {
		starts[v.Pos.Offset] = segView
	}
	var cur *segment
	var pending []*tok // comments after cur's last token
	prevEnd := 0       // the line where the token before ends
	end := func() {
		if cur == nil {
			for _, c := range pending {
				p.addComment(c, 0, c.blank)
			}
			return
		}
		last := cur.toks[len(cur.toks)-1]
		if len(pending) > 0 && pending[0].Line == last.endLine {
			cur.trailing, pending = pending[0], pending[1:]
		}
		p.add(cur, cur.toks[0].blank)
		inside := cur.kind == segTable || cur.kind == segColumn || cur.kind == segItem
		for _, c := range pending {
			indent := 0
			if inside {
				indent = 2
			}
			p.addComment(c, indent, c.blank)
		}
	}
	for i := range p.toks {
		t := &p.toks[i]
		t.blank = prevEnd > 0 && t.Line > prevEnd+1
		prevEnd = t.endLine
		if t.Kind == "comment" {
			pending = append(pending, t)
			continue
		}
		kind, start := starts[t.off]
		switch {
		case start:
		case t.is("key") || t.is("link"):
			kind, start = segItem, true
		case t.is("}"):
			kind, start = segClose, true
		}
		if !start {
			cur.toks = append(cur.toks, pending...)
			cur.toks = append(cur.toks, t)
			pending = nil
			continue
		}
		end()
		cur, pending = &segment{kind: kind, toks: []*tok{t}}, nil
	}
	end()
}

// addComment adds a comment on a line of its own.
func (p *printer) addComment(c *tok, indent int, blank bool) {
	p.push(&entry{indent: indent, blank: blank, role: transparent, text: c.text()})
}

// push appends an entry; the first line of the file and the first line
// inside a table's braces have no blank line before them.
func (p *printer) push(e *entry) {
	if len(p.entries) == 0 || p.opened {
		e.blank = false
	}
	p.opened = false
	p.entries = append(p.entries, e)
}

// add lays out one segment as an entry.
func (p *printer) add(s *segment, blank bool) {
	e := &entry{blank: blank, role: breaker}
	switch s.kind {
	case segColumn, segItem:
		e.indent = 2
	case segClose:
		e.blank = false
	}
	if s.kind == segTable || s.kind == segMeasure || s.kind == segView {
		if p.declared && (p.lastDecl == segTable || s.kind == segTable || p.lastDecl != s.kind) {
			if p.leading < len(p.entries) {
				p.entries[p.leading].blank = true
			} else {
				e.blank = true
			}
		}
		p.lastDecl, p.declared = s.kind, true
	}
	if oneLine(s.toks) {
		p.cells(e, s)
	} else {
		e.text = block(s.toks, e.indent)
		if s.trailing != nil {
			e.text += "  " + s.trailing.text()
		}
	}
	p.push(e)
	p.opened = s.kind == segTable
	if s.kind == segMeasure || s.kind == segView || s.kind == segClose {
		p.leading = len(p.entries)
	}
}

// oneLine reports whether toks were written on one line, without a
// comment among them.
func oneLine(toks []*tok) bool {
	for i, t := range toks {
		if t.Kind == "comment" || t.endLine != t.Line || i > 0 && t.Line != toks[i-1].endLine {
			return false
		}
	}
	return true
}

// cells cuts a one-line segment into the cells of its kind.
func (p *printer) cells(e *entry, s *segment) {
	t, n := s.toks, len(s.toks)
	var cuts []int // where each cell after the first starts
	switch s.kind {
	case segMeasure:
		tail := n
		for i := 3; i < n; i++ {
			if t[i].is("format") || t[i].Kind == "text" {
				tail = i
				break
			}
		}
		cuts, e.gaps = []int{2, tail}, []int{1, 2, 2}
	case segView:
		cuts, e.gaps = []int{2}, []int{1, 2}
	case segColumn:
		opts := 2
		if t[1].is("=") {
			for opts = 2; opts < n && !isOption(t[opts]); opts++ {
			}
			e.flex = []bool{false, true}
		}
		cuts, e.gaps = []int{1, opts}, []int{2, 2, 2}
	default:
		e.gaps = []int{2}
	}
	from := 0
	for _, c := range append(cuts, n) {
		e.cells = append(e.cells, joinLine(t, from, c))
		from = c
	}
	if s.trailing != nil {
		e.cells = append(e.cells, s.trailing.text())
	} else {
		for len(e.cells) > 1 && e.cells[len(e.cells)-1] == "" {
			e.cells = e.cells[:len(e.cells)-1]
		}
	}
	e.flex = append(e.flex, make([]bool, len(e.cells))...)
	switch s.kind {
	case segMeasure, segView, segColumn:
		e.role = aligned
	case segItem:
		e.role = transparent
	}
}

// isOption reports whether t starts a column option.
func isOption(t *tok) bool {
	return t.is("->") || t.is("additive") || t.is("nonadditive") || t.is("semiadditive")
}

// block prints a segment written on several lines: its line breaks (at
// most one blank line in a row) and comments kept, continuation lines
// indented past indent by two spaces and two more per open parenthesis,
// bracket or case.
func block(toks []*tok, indent int) string {
	var b strings.Builder
	var code []*tok // the tokens other than comments, so far
	depth := 0
	for i, t := range toks {
		if i > 0 {
			prev := toks[i-1]
			switch {
			case t.Line > prev.endLine:
				b.WriteByte('\n')
				if t.Line > prev.endLine+1 {
					b.WriteByte('\n')
				}
				d := depth
				if t.closes() {
					d--
				}
				b.WriteString(strings.Repeat(" ", indent+2+2*max(d, 0)))
			case t.Kind == "comment":
				b.WriteString("  ")
			case space(at(code, len(code)-2), code[len(code)-1], t):
				b.WriteByte(' ')
			}
		}
		b.WriteString(t.text())
		if t.Kind == "comment" {
			continue
		}
		code = append(code, t)
		if t.opens() {
			depth++
		} else if t.closes() {
			depth--
		}
	}
	return b.String()
}

// print aligns the blocks and prints the entries.
func (p *printer) print() string {
	p.align()
	var b strings.Builder
	for i, e := range p.entries {
		if i > 0 && e.blank {
			b.WriteByte('\n')
		}
		b.WriteString(strings.Repeat(" ", e.indent))
		if e.cells == nil {
			b.WriteString(e.text)
		}
		for k, c := range e.cells {
			b.WriteString(c)
			if k < len(e.cells)-1 {
				b.WriteString(strings.Repeat(" ", e.pads[k]))
			}
		}
		b.WriteByte('\n')
	}
	return b.String()
}

// align sets the pads of every entry with cells. A block is a run of
// aligned entries with no blank line and no breaker between them; in it,
// as in a tab writer, a column's width is taken over each run of lines
// that have a cell after that column. A column empty on all those lines
// takes no room.
func (p *printer) align() {
	var run []*entry
	for _, e := range p.entries {
		if e.blank || e.role == breaker {
			alignRun(run)
			run = nil
		}
		if e.cells != nil {
			e.pads = make([]int, len(e.cells))
			if e.role == aligned {
				run = append(run, e)
			} else {
				alignRun([]*entry{e})
			}
		}
	}
	alignRun(run)
}

func alignRun(run []*entry) {
	for k := 0; ; k++ {
		any := false
		for i := 0; i < len(run); {
			if len(run[i].cells) <= k+1 {
				i++
				continue
			}
			any = true
			j, w, empty := i, 0, true
			for ; j < len(run) && len(run[j].cells) > k+1; j++ {
				c := run[j].cells[k]
				if !run[j].flex[k] {
					w = max(w, width(c))
				}
				empty = empty && c == ""
			}
			for _, e := range run[i:j] {
				if !empty {
					e.pads[k] = max(w-width(e.cells[k]), 0) + e.gaps[k]
				}
			}
			i = j
		}
		if !any {
			return
		}
	}
}
