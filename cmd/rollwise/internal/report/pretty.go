package report

import (
	"io"
	"strings"

	"github.com/jedib0t/go-pretty/v6/table"
	"github.com/jedib0t/go-pretty/v6/text"
)

// The labels of rolled-up group cells.
const (
	totalText = "Total"
	allText   = "All"
)

// ANSI escapes for bold text; written only when Options.Color is set.
const (
	boldOn  = "\x1b[1m"
	boldOff = "\x1b[0m"
)

// writeTable writes a chunk of aligned columns: numbers right-aligned,
// values shown by their measure's format, rolled-up cells labelled Total
// (All in the grand total), NULL group values as (null), with the column
// settings cfgs; the first chunk has the header. With o.Color, total rows
// are bold.
func writeTable(w io.Writer, p *prepared, o Options, cfgs []table.ColumnConfig, first bool) error {
	tw := newWriter(p, func(label string) string { return label }, o.Color, first)
	style := table.StyleLight
	style.Options.DrawBorder = false
	style.Options.SeparateColumns = true
	style.Options.SeparateHeader = true
	style.Options.SeparateRows = false
	style.Options.SeparateFooter = false
	style.Format.Header = text.FormatDefault
	tw.SetStyle(style)
	tw.SetColumnConfigs(cfgs)
	// go-pretty pads the last column; drop the trailing spaces.
	lines := strings.Split(tw.Render(), "\n")
	for i, l := range lines {
		lines[i] = strings.TrimRight(l, " ")
	}
	_, err := io.WriteString(w, strings.Join(lines, "\n")+"\n")
	return err
}

// chunkConfigs decides the table format's column settings on the first
// chunk: alignment, wrapping to o.Width, and each column's width as a
// minimum, so that later chunks line up; a later text value that is
// wider wraps.
func chunkConfigs(p *prepared, o Options) []table.ColumnConfig {
	cfgs := columnConfigs(p)
	if o.Width > 0 {
		cfgs = fitWidth(p, o.Width)
	}
	for j, w := range naturalWidths(p) {
		if cfgs[j].WidthMax > 0 {
			w = min(w, cfgs[j].WidthMax)
		}
		cfgs[j].WidthMin = w
		if !p.numeric[j] && cfgs[j].WidthMax == 0 && len(p.rows) == BufferRows {
			cfgs[j].WidthMax, cfgs[j].WidthMaxEnforcer = w, text.WrapSoft
		}
	}
	return cfgs
}

// writeMarkdown writes a chunk of a GitHub-style table with the same
// display text as the table format; the Total and All labels are bold.
// The first chunk has the header.
func writeMarkdown(w io.Writer, p *prepared, first bool) error {
	tw := newWriter(p, func(label string) string { return "**" + label + "**" }, false, first)
	tw.SetColumnConfigs(columnConfigs(p))
	style := table.StyleDefault
	style.Format.Header = text.FormatDefault
	style.Markdown.PadContent = true
	tw.SetStyle(style)
	_, err := io.WriteString(w, tw.RenderMarkdown()+"\n")
	return err
}

// newWriter builds a table writer holding p's rows (and header, with
// header set), with rolled-up labels passed through label, and total rows
// in bold when boldTotals is set.
func newWriter(p *prepared, label func(string) string, boldTotals, header bool) table.Writer {
	tw := table.NewWriter()
	if header {
		tw.AppendHeader(headerRow(p))
	}
	for _, r := range p.rows {
		row := displayRow(r, label)
		if boldTotals && len(r.rolledUp) > 0 {
			for j := range row {
				if s, _ := row[j].(string); s != "" {
					row[j] = boldOn + s + boldOff
				}
			}
		}
		tw.AppendRow(row)
	}
	return tw
}

// headerRow is the row of column names.
func headerRow(p *prepared) table.Row {
	h := make(table.Row, len(p.cols))
	for j, c := range p.cols {
		h[j] = c.Name
	}
	return h
}

// displayRow is a row's display text.
func displayRow(r preparedRow, label func(string) string) table.Row {
	row := make(table.Row, len(r.cells))
	for j, c := range r.cells {
		switch {
		case c.rolled && r.grand:
			row[j] = label(allText)
		case c.rolled:
			row[j] = label(totalText)
		default:
			row[j] = c.show
		}
	}
	return row
}

// columnConfigs right-aligns the numeric columns and left-aligns the
// others.
func columnConfigs(p *prepared) []table.ColumnConfig {
	cfgs := make([]table.ColumnConfig, len(p.cols))
	for j, numeric := range p.numeric {
		cfgs[j].Number = j + 1
		cfgs[j].Align, cfgs[j].AlignHeader = text.AlignLeft, text.AlignLeft
		if numeric {
			cfgs[j].Align, cfgs[j].AlignHeader = text.AlignRight, text.AlignRight
		}
	}
	return cfgs
}

// naturalWidths are the widths of p's columns: their widest heading or
// display text.
func naturalWidths(p *prepared) []int {
	widths := make([]int, len(p.cols))
	for j, c := range p.cols {
		widths[j] = text.StringWidthWithoutEscSequences(c.Name)
	}
	for _, r := range p.rows {
		for j, cell := range displayRow(r, func(label string) string { return label }) {
			widths[j] = max(widths[j], text.StringWidthWithoutEscSequences(cell.(string)))
		}
	}
	return widths
}

// minWrapWidth is the narrowest fitWidth makes a text column (or its
// heading's width, if wider).
const minWrapWidth = 12

// fitWidth returns column configs that keep the table format's lines
// within width by wrapping the widest text columns (at spaces where it
// can), but not their headings. Numbers are never wrapped or cut: when they alone are too wide,
// the lines stay long.
func fitWidth(p *prepared, width int) []table.ColumnConfig {
	cfgs := columnConfigs(p)
	widths := naturalWidths(p)
	floor := make([]int, len(p.cols)) // headings are not wrapped
	for j, c := range p.cols {
		floor[j] = max(text.StringWidthWithoutEscSequences(c.Name), minWrapWidth)
	}
	// Each column has a space either side, and columns are separated by
	// one rule character.
	total := len(widths) - 1
	for _, w := range widths {
		total += w + 2
	}
	for total > width {
		widest := -1
		for j, w := range widths {
			if !p.numeric[j] && w > floor[j] && (widest < 0 || w > widths[widest]) {
				widest = j
			}
		}
		if widest < 0 {
			break
		}
		widths[widest]--
		total--
		cfgs[widest].WidthMax = widths[widest]
		cfgs[widest].WidthMaxEnforcer = text.WrapSoft
	}
	return cfgs
}
