package grammar

import "github.com/alecthomas/participle/v2/lexer"

// Limits on how much one model declares, its files together: with the
// size cap (MaxSourceBytes) they keep `check` of any model within 5 s of
// CPU and 500 MB on a 2-core machine (issue 17 item 5; docs/cli.md,
// "Safety"). What is declared costs more than its bytes of source: a
// one-column table is 25 bytes of source and some 900 bytes of memory
// once resolved, a view is planned (about 10 µs), a short measure or
// derived column costs as much as a long one; so at the cap a model of
// nothing but tables, views or short measures went past the target. Real
// models declare hundreds of tables and a few thousand names.
const (
	// MaxTables is the most tables a model may declare.
	MaxTables = 50_000
	// MaxViews is the most views a model may declare.
	MaxViews = 20_000
	// MaxNames is the most tables, table items (columns, keys, links),
	// measures and views a model may declare together. The synthetic
	// model of the benchmarks just under the size cap declares 261,000.
	MaxNames = 300_000
)

// Declared counts what the files of a model parsed so far declare,
// against MaxTables, MaxViews and MaxNames (ParseLazyIn). Over reports
// whether a declaration went past a limit, when the files after it need
// not be parsed.
type Declared struct {
	Tables, Views, Names int
	Over                 bool
}

// limitHint says what to do with a model over a limit.
const limitHint = "split the model into smaller models, each read on its own (the limit keeps check within 5 s and 500 MB; see docs/cli.md, Safety)"

// LimitCodes are the codes of the errors that refuse a model over a
// limit on what it declares.
var LimitCodes = []string{"too-many-tables", "too-many-views", "too-many-names"}

// ParseLazyIn is ParseLazy for one file of a model whose files before it
// declared what n counts: the declaration that takes the model past a
// limit (MaxTables, MaxViews, MaxNames) is an error at its position (one
// of LimitCodes), and the file is not parsed further, so that no more
// than the limits are ever held.
func ParseLazyIn(filename, src string, n *Declared) (*File, Diagnostics) {
	return parseFile(filename, src, true, &lazySource{src: src}, n)
}

// admit counts the declaration d and says whether it is within the
// limits; when it is not, it adds the error to diags.
func (n *Declared) admit(d *syntaxDecl, diags *Diagnostics) bool {
	if n == nil {
		return true
	}
	switch {
	case d.Table != nil:
		if n.Tables >= MaxTables {
			return n.refuse(d.Table.Pos, "too-many-tables", MaxTables, "tables", diags)
		}
		if left := MaxNames - n.Names - 1; left < len(d.Table.Items) {
			p := d.Table.Pos
			if left >= 0 {
				p = d.Table.Items[left].Pos
			}
			return n.refuse(p, "too-many-names", MaxNames, "names (tables, their columns, keys and links, measures and views together)", diags)
		}
		n.Tables++
		n.Names += 1 + len(d.Table.Items)
		return true
	case d.View != nil && n.Views >= MaxViews:
		return n.refuse(d.View.Pos, "too-many-views", MaxViews, "views", diags)
	case d.View != nil:
		n.Views++
	}
	if n.Names >= MaxNames {
		p := d.Measure.Pos
		if d.View != nil {
			p = d.View.Pos
		}
		return n.refuse(p, "too-many-names", MaxNames, "names (tables, their columns, keys and links, measures and views together)", diags)
	}
	n.Names++
	return true
}

// refuse adds the error of a declaration at p over a limit and returns
// false.
func (n *Declared) refuse(p lexer.Position, code string, limit int, what string, diags *Diagnostics) bool {
	n.Over = true
	diags.Errorf(pos(p), code, "the model declares more than %d %s, the most a model may declare", limit, what).Suggestion = limitHint
	return false
}
