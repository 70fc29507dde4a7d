// Package model is what the rollwise language means: it resolves parsed
// .roll files into a model (tables, links, typed columns and measures,
// views), checks it (names, types, additivity, paths, cycles), and
// resolves a report's request into a Query. It knows nothing of plans or
// SQL: planner/plan plans a Query, and the reference evaluator
// (planner/reference) computes it from this package alone.
package model

import (
	"github.com/rollwise/rollwise/grammar"
)

// Type is the logical type of a column or expression.
type Type int

// The logical types. TypeNull is the type of the literal null, which fits
// anywhere.
const (
	TypeNull Type = iota
	TypeInteger
	TypeDecimal
	TypeFloat
	TypeText
	TypeDate
	TypeTimestamp
	TypeBoolean
)

var typeNames = map[Type]string{
	TypeNull: "null", TypeInteger: "integer", TypeDecimal: "decimal", TypeFloat: "float",
	TypeText: "text", TypeDate: "date", TypeTimestamp: "timestamp", TypeBoolean: "boolean",
}

func (t Type) String() string { return typeNames[t] }

// Numeric reports whether t is integer, decimal or float (or null).
func (t Type) Numeric() bool {
	return t == TypeInteger || t == TypeDecimal || t == TypeFloat || t == TypeNull
}

// Additivity is a column's fact class.
type Additivity int

// The fact classes.
const (
	Additive Additivity = iota
	NonAdditive
	SemiAdditive
)

// Model is a resolved, checked set of .roll files.
type Model struct {
	// Tables, Measures and Views keep declaration order.
	Tables   []*Table
	Measures []*Measure
	Views    []*View

	tables   map[string]*Table
	measures map[string]*Measure
}

// Table returns the table called name, or nil.
func (m *Model) Table(name string) *Table { return m.tables[name] }

// Measure returns the measure called name, or nil.
func (m *Model) Measure(name string) *Measure { return m.measures[name] }

// Table is a declared table: a warehouse relation with columns and links.
type Table struct {
	Name string
	// Relation is the warehouse relation generated SQL reads: the `at`
	// text split at dots (schema, name), or the table's name.
	Relation []string
	// File is the data file the embedded engine reads (already joined
	// with the model file's folder), or "".
	File string
	// NullTexts are the texts that stand for NULL in the table's CSV
	// files, besides the empty field (`with null "NA"`).
	NullTexts []string
	Pos       grammar.Pos
	Key       []*Column
	Columns   []*Column
	// Links are this table's many-to-one links to other tables.
	Links []*Link

	// columns indexes Columns by name once there are more than
	// smallTable of them; a smaller table is searched in order (a map
	// costs about 250 bytes, more than a one-column table's own model).
	columns map[string]*Column
}

// smallTable is the most columns a table has without an index by name.
const smallTable = 8

// Column returns the column called name, or nil.
func (t *Table) Column(name string) *Column {
	if t.columns != nil {
		return t.columns[name]
	}
	for _, c := range t.Columns {
		if c.Name == name {
			return c
		}
	}
	return nil
}

// addColumn appends c to the table's columns, indexing them by name once
// there are more than smallTable.
func (t *Table) addColumn(c *Column) {
	t.Columns = append(t.Columns, c)
	switch {
	case t.columns != nil:
		t.columns[c.Name] = c
	case len(t.Columns) > smallTable:
		t.columns = make(map[string]*Column, 2*len(t.Columns))
		for _, c := range t.Columns {
			t.columns[c.Name] = c
		}
	}
}

// Column is a stored or derived column.
type Column struct {
	Table *Table
	Name  string
	Type  Type
	Pos   grammar.Pos
	// Derived is the row expression of a derived column; nil when stored.
	Derived Expr
	// Additivity is the column's fact class; SemiDate is set for
	// semiadditive columns.
	Additivity Additivity
	SemiDate   *Column
}

// Stored reports whether the column is read from the relation.
func (c *Column) Stored() bool { return c.Derived == nil }

// String renders the column as table.column.
func (c *Column) String() string { return c.Table.Name + "." + c.Name }

// Link is a many-to-one link: each row of From points at (at most) one row
// of To, matching From[i] with To[i] (To is To's key).
type Link struct {
	From     *Table
	FromCols []*Column
	To       *Table
	ToCols   []*Column
	Pos      grammar.Pos
	// Required is the model's promise that every row of From finds its
	// row of To (so its link columns are never NULL), written `required`.
	// rollwise does not check it when it plans; results are wrong where
	// the data breaks it (`rollwise check --required` checks the data).
	Required bool
}

// String renders the link as "sales.store_id -> stores.store_id".
func (l *Link) String() string {
	s := ""
	for i, c := range l.FromCols {
		if i > 0 {
			s += ", "
		}
		s += c.String()
	}
	s += " -> "
	for i, c := range l.ToCols {
		if i > 0 {
			s += ", "
		}
		s += c.String()
	}
	return s
}

// Format says how a measure's values are shown.
type Format string

// The formats of `format`.
const (
	FormatNone     Format = ""
	FormatPercent  Format = "percent"
	FormatNumber   Format = "number"
	FormatInteger  Format = "integer"
	FormatCurrency Format = "currency"
)

// Measure is a named measure expression.
type Measure struct {
	Name   string
	Expr   Expr
	Format Format
	Doc    string
	Pos    grammar.Pos
	Type   Type
}

// TotalsMode says which total rows a query asks for.
type TotalsMode string

// The totals modes.
const (
	TotalsNone   TotalsMode = "none"
	TotalsGrand  TotalsMode = "grand"
	TotalsRollup TotalsMode = "rollup"
	TotalsAll    TotalsMode = "all"
)

// View is a named query declared in the model.
type View struct {
	Name     string
	Pos      grammar.Pos
	Measures []*Measure
	By       []*Column
	Where    Expr
	Totals   TotalsMode
}
