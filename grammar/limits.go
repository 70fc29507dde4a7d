package grammar

import (
	"sort"

	"github.com/alecthomas/participle/v2/lexer"
)

// Limits on how much one model declares, its files together: with the
// size cap (MaxSourceBytes) they keep `check` of any model within 5 s of
// CPU and 500 MB on a 2-core machine (issue 17 item 5; docs/cli.md,
// "Safety"). What is declared costs more than its bytes of source: a
// one-column table is 25 bytes of source and some 900 bytes of memory
// once resolved, a view is planned (about 10 µs), a short measure or
// derived column costs as much as a long one, and a derived column's
// expression is held as a tree; so at the cap a model of nothing but
// tables, views, short measures or derived columns went past the target.
// Real models declare hundreds of tables and a few thousand names.
const (
	// MaxTables is the most tables a model may declare.
	MaxTables = 50_000
	// MaxViews is the most views a model may declare.
	MaxViews = 20_000
	// MaxNames is the most tables, table items (columns, keys, links),
	// measures and views a model may declare together. The synthetic
	// model of the benchmarks just under the size cap declares 261,000.
	MaxNames = 300_000
	// MaxDerivedTokens is the most tokens the derived columns of a model
	// may hold together, each counted from its name to the item after it:
	// a derived column's expression is held as a tree while the model is
	// resolved (about 130 bytes of memory a token, where a measure's is
	// parsed again when needed), so that 16 MiB of derived columns took
	// 8 s of CPU and 830 MB. 250,000 tokens are some 10,000 derived
	// columns of a long expression, or 40,000 of a short one.
	MaxDerivedTokens = 250_000
)

// Declared counts what the files of a model parsed so far declare,
// against MaxTables, MaxViews, MaxNames and MaxDerivedTokens
// (ParseLazyIn). Over reports
// whether a declaration went past a limit, when the files after it need
// not be parsed.
type Declared struct {
	Tables, Views, Names, DerivedTokens int
	Over                                bool
}

// limitHint says what to do with a model over a limit.
const limitHint = "split the model into smaller models, each read on its own (the limit keeps check within 5 s and 500 MB; see docs/cli.md, Safety)"

// LimitCodes are the codes of the errors that refuse a model over a
// limit on what it declares.
var LimitCodes = []string{"too-many-tables", "too-many-views", "too-many-names", "too-many-derived"}

// ParseLazyIn is ParseLazy for one file of a model whose files before it
// declared what n counts: the declaration that takes the model past a
// limit (MaxTables, MaxViews, MaxNames, MaxDerivedTokens) is an error
// at its position (one of LimitCodes), and the file is not parsed
// further, so that no more than the limits are ever held.
func ParseLazyIn(filename, src string, n *Declared) (*File, Diagnostics) {
	return parseFile(filename, src, true, &lazySource{src: src}, n)
}

// namesKind is what MaxNames counts, in its error.
const namesKind = "names (tables, their columns, keys and links, measures and views together)"

// admit counts the declaration d, made of the tokens toks, and says
// whether it is within the limits; when it is not, it adds the error to
// diags.
func (n *Declared) admit(d *syntaxDecl, toks []lexer.Token, diags *Diagnostics) bool {
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
			return n.refuse(p, "too-many-names", MaxNames, namesKind, diags)
		}
		if !n.admitDerived(d.Table.Items, toks, diags) {
			return false
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
		return n.refuse(p, "too-many-names", MaxNames, namesKind, diags)
	}
	n.Names++
	return true
}

// admitDerived counts the tokens of a table's derived columns, each from
// its first token to the next item's (or to the table's end), and says
// whether they are within MaxDerivedTokens.
func (n *Declared) admitDerived(items []*syntaxItem, toks []lexer.Token, diags *Diagnostics) bool {
	// at is the index of the first token at or after offset off.
	at := func(off int) int {
		return sort.Search(len(toks), func(i int) bool { return toks[i].Pos.Offset >= off })
	}
	for i, it := range items {
		if it.Column == nil || it.Column.Expr == nil {
			continue
		}
		end := len(toks)
		if i+1 < len(items) {
			end = at(items[i+1].Pos.Offset)
		}
		n.DerivedTokens += end - at(it.Pos.Offset)
		if n.DerivedTokens > MaxDerivedTokens {
			return n.refuse(it.Pos, "too-many-derived", MaxDerivedTokens, "tokens in derived columns", diags)
		}
	}
	return true
}

// refuse adds the error of a declaration at p over a limit and returns
// false.
func (n *Declared) refuse(p lexer.Position, code string, limit int, what string, diags *Diagnostics) bool {
	n.Over = true
	diags.Errorf(pos(p), code, "the model declares more than %d %s, the most a model may declare", limit, what).Suggestion = limitHint
	return false
}
