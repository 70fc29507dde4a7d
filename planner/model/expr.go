package model

import (
	"github.com/rollwise/rollwise/grammar"
)

// Expr is a resolved, typed expression: a row expression (over columns) or
// a measure expression (over aggregates and measures).
type Expr interface {
	// Type is the expression's logical type.
	Type() Type
	// Position is where the expression starts in its file.
	Position() grammar.Pos
}

// ColRef reads a column (stored or derived) of the current row, following
// links from the iteration table when the column is on another table.
type ColRef struct {
	Pos grammar.Pos
	Col *Column
}

// Lit is a literal. Text holds the value as written for numbers, the value
// for strings and dates, "true"/"false" for booleans; T is TypeNull for null.
type Lit struct {
	Pos  grammar.Pos
	T    Type
	Text string
}

// BinOp is + - * / || = <> < <= > >= and or.
type BinOp struct {
	Pos  grammar.Pos
	Op   string
	L, R Expr
	T    Type
}

// UnOp is - or not.
type UnOp struct {
	Pos grammar.Pos
	Op  string
	X   Expr
}

// Func is a scalar function: coalesce, nullif, abs, round, least, greatest,
// lower, upper, cast (CastTo), extract and date_trunc (Unit).
type Func struct {
	Pos    grammar.Pos
	Name   string
	Args   []Expr
	Unit   string
	CastTo Type
	T      Type
}

// WhenArm is one `when cond then value` arm of a CaseExpr.
type WhenArm struct {
	Cond, Then Expr
}

// CaseExpr is a searched case (a simple case is resolved into a searched
// one).
type CaseExpr struct {
	Pos   grammar.Pos
	Whens []WhenArm
	Else  Expr
	T     Type
}

// InExpr is `x [not] in (list)`.
type InExpr struct {
	Pos  grammar.Pos
	X    Expr
	List []Expr
	Not  bool
}

// IsNullExpr is `x is [not] null`.
type IsNullExpr struct {
	Pos grammar.Pos
	X   Expr
	Not bool
}

// Agg is a row-wise aggregate over the rows of its iteration table that
// belong to the cell.
type Agg struct {
	Pos grammar.Pos
	// Func is sum, avg, min, max, count, median, stddev or variance.
	Func     string
	Distinct bool
	// Arg is the row expression; nil for count(*).
	Arg   Expr
	Table *Table
	T     Type
}

// MeasureRef uses another measure, evaluated in the same cell.
type MeasureRef struct {
	Pos     grammar.Pos
	Measure *Measure
}

// NarrowExpr evaluates X in the cell AND Pred (a row predicate).
type NarrowExpr struct {
	Pos  grammar.Pos
	X    Expr
	Pred Expr
}

// EditKind says what a cell edit does.
type EditKind int

// The cell edits of language.md.
const (
	EditPin EditKind = iota
	EditDrop
	EditUngroup
	// The time edits of language.md ("Time"); Col is the date column D.
	EditLatest   // D = latest
	EditEarliest // D = earliest
	EditBack     // D back N UNIT
	EditToDate   // D to date UNIT
	EditRunning  // D running
	EditLast     // D last N UNIT
)

// Time reports whether k is a time edit.
func (k EditKind) Time() bool { return k >= EditLatest }

// CellEdit is one edit of the cell. Col is nil for `drop` or `ungroup` of
// everything and for `drop T` (then Table is set). N and Unit are the
// count and unit (day, week, month, quarter or year) of a time edit.
type CellEdit struct {
	Pos    grammar.Pos
	Kind   EditKind
	Col    *Column
	Table  *Table
	Values []*Lit
	N      int
	Unit   string
}

// EditExpr evaluates X in the cell changed by Edits, applied in order.
type EditExpr struct {
	Pos   grammar.Pos
	X     Expr
	Edits []*CellEdit
}

// PerAgg is AGG(X per Per... having Having): X evaluated once per distinct
// value of the Per columns in the cell, groups kept where Having holds, the
// results aggregated with Func. X is nil for count(* per ...).
type PerAgg struct {
	Pos    grammar.Pos
	Func   string
	X      Expr
	Per    []*Column
	Having Expr
	T      Type
}

// Type implementations.

func (e *ColRef) Type() Type     { return e.Col.Type }
func (e *Lit) Type() Type        { return e.T }
func (e *BinOp) Type() Type      { return e.T }
func (e *UnOp) Type() Type       { return unType(e) }
func (e *Func) Type() Type       { return e.T }
func (e *CaseExpr) Type() Type   { return e.T }
func (e *InExpr) Type() Type     { return TypeBoolean }
func (e *IsNullExpr) Type() Type { return TypeBoolean }
func (e *Agg) Type() Type        { return e.T }
func (e *MeasureRef) Type() Type { return e.Measure.Type }
func (e *NarrowExpr) Type() Type { return e.X.Type() }
func (e *EditExpr) Type() Type   { return e.X.Type() }
func (e *PerAgg) Type() Type     { return e.T }

func unType(e *UnOp) Type {
	if e.Op == "not" {
		return TypeBoolean
	}
	return e.X.Type()
}

// Position implementations.

func (e *ColRef) Position() grammar.Pos     { return e.Pos }
func (e *Lit) Position() grammar.Pos        { return e.Pos }
func (e *BinOp) Position() grammar.Pos      { return e.Pos }
func (e *UnOp) Position() grammar.Pos       { return e.Pos }
func (e *Func) Position() grammar.Pos       { return e.Pos }
func (e *CaseExpr) Position() grammar.Pos   { return e.Pos }
func (e *InExpr) Position() grammar.Pos     { return e.Pos }
func (e *IsNullExpr) Position() grammar.Pos { return e.Pos }
func (e *Agg) Position() grammar.Pos        { return e.Pos }
func (e *MeasureRef) Position() grammar.Pos { return e.Pos }
func (e *NarrowExpr) Position() grammar.Pos { return e.Pos }
func (e *EditExpr) Position() grammar.Pos   { return e.Pos }
func (e *PerAgg) Position() grammar.Pos     { return e.Pos }

// Walk calls fn for e and every expression below it (not following measure
// references nor going into a Computed node), depth first, parents first.
// fn returns false to skip the children.
func Walk(e Expr, fn func(Expr) bool) {
	if e == nil || !fn(e) {
		return
	}
	switch e := e.(type) {
	case *BinOp:
		Walk(e.L, fn)
		Walk(e.R, fn)
	case *UnOp:
		Walk(e.X, fn)
	case *Func:
		for _, a := range e.Args {
			Walk(a, fn)
		}
	case *CaseExpr:
		for _, w := range e.Whens {
			Walk(w.Cond, fn)
			Walk(w.Then, fn)
		}
		Walk(e.Else, fn)
	case *InExpr:
		Walk(e.X, fn)
		for _, a := range e.List {
			Walk(a, fn)
		}
	case *IsNullExpr:
		Walk(e.X, fn)
	case *Agg:
		Walk(e.Arg, fn)
	case *NarrowExpr:
		Walk(e.X, fn)
		Walk(e.Pred, fn)
	case *EditExpr:
		Walk(e.X, fn)
		for _, ed := range e.Edits {
			for _, v := range ed.Values {
				Walk(v, fn)
			}
		}
	case *PerAgg:
		Walk(e.X, fn)
		Walk(e.Having, fn)
	}
}

// Columns returns the columns a row expression reads, in first-use order,
// looking through derived columns into what they read.
func Columns(e Expr) []*Column {
	var out []*Column
	seen := map[*Column]bool{}
	var visit func(Expr)
	visit = func(e Expr) {
		Walk(e, func(x Expr) bool {
			if c, ok := x.(*ColRef); ok && !seen[c.Col] {
				seen[c.Col] = true
				out = append(out, c.Col)
				if c.Col.Derived != nil {
					visit(c.Col.Derived)
				}
			}
			return true
		})
	}
	visit(e)
	return out
}
