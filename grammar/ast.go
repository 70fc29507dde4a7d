package grammar

// The syntax tree of a model: declarations and expressions, each node with
// the position of its first token. Names are not resolved here; that is the
// planner's job.

// File is one parsed .roll file.
type File struct {
	Name   string
	Tables []*TableDecl
	// Measures and Views keep their order in the file.
	Measures []*MeasureDecl
	Views    []*ViewDecl
}

// Ident is a name with its position.
type Ident struct {
	Pos  Pos
	Name string
}

// StringLit is a double-quoted string (after at, from, or as documentation).
type StringLit struct {
	Pos   Pos
	Value string
}

// TableDecl is `table NAME [at "REL"] [from "FILE"] [with null "TEXT", ...] { ... }`.
type TableDecl struct {
	Pos  Pos
	Name Ident
	At   *StringLit
	From *StringLit
	// Nulls are the texts that stand for NULL in the table's CSV files,
	// besides the empty field.
	Nulls   []*StringLit
	Key     []Ident
	KeyPos  Pos
	Columns []*ColumnDecl
	Links   []*LinkDecl
}

// Additivity is a column's fact class.
type Additivity int

// The fact classes of dimensional modelling.
const (
	// AdditivityDefault means no option was written.
	AdditivityDefault Additivity = iota
	Additive
	NonAdditive
	SemiAdditive
)

// ColumnDecl is a stored column (Type set) or a derived column (Expr set).
type ColumnDecl struct {
	Pos  Pos
	Name Ident
	Type *Ident
	Expr Expr
	// Link is the target of a `-> TABLE.KEYCOL` option; LinkRequired
	// says it is written `required`.
	Link          *Ref
	LinkRequired  bool
	Additivity    Additivity
	AdditivityPos Pos
	// SemiDate is the date column of `semiadditive(TABLE.DATECOL)`.
	SemiDate *Ref
}

// LinkDecl is `link (COL, ...) -> TABLE (KEYCOL, ...) [required]`.
type LinkDecl struct {
	Pos      Pos
	From     []Ident
	Table    Ident
	To       []Ident
	Required bool
}

// MeasureDecl is `measure NAME = EXPR [format F] ["doc"]`. Expr is nil
// in a file of ParseLazy: Expression gives it.
type MeasureDecl struct {
	Pos    Pos
	Name   Ident
	Expr   Expr
	Format *Ident
	Doc    string
	lazy   *lazySource
}

// ViewDecl is `view NAME = M, ... by T.C, ... [where P] [with totals [MODE]]`.
type ViewDecl struct {
	Pos       Pos
	Name      Ident
	Measures  []Ident
	By        []*Ref
	Where     Expr
	HasTotals bool
	// TotalsMode is nil when `with totals` has no mode (meaning rollup).
	TotalsMode *Ident
}

// Expr is any expression node.
type Expr interface {
	Position() Pos
}

// Ref is `table.column`, or a bare name (a measure, or a column of the own
// table inside a derived column).
type Ref struct {
	Pos Pos
	// Table is "" for a bare name.
	Table string
	Name  string
	// NamePos is where Name starts (after the dot, for qualified refs).
	NamePos Pos
}

// NumberLit is a numeric literal, kept as written.
type NumberLit struct {
	Pos  Pos
	Text string
}

// StringValue is a single-quoted string literal, unescaped.
type StringValue struct {
	Pos   Pos
	Value string
}

// DateLit is `date '...'` or `timestamp '...'`.
type DateLit struct {
	Pos       Pos
	Value     string
	Timestamp bool
}

// BoolLit is true or false.
type BoolLit struct {
	Pos   Pos
	Value bool
}

// NullLit is null.
type NullLit struct {
	Pos Pos
}

// Binary is an infix operation: + - * / || = <> < <= > >= and or.
type Binary struct {
	Pos  Pos
	Op   string
	L, R Expr
}

// Unary is `-x` or `not x`.
type Unary struct {
	Pos Pos
	Op  string
	X   Expr
}

// IsNull is `x is [not] null`.
type IsNull struct {
	Pos Pos
	X   Expr
	Not bool
}

// In is `x [not] in (a, b)`.
type In struct {
	Pos  Pos
	X    Expr
	List []Expr
	Not  bool
}

// Between is `x [not] between lo and hi`.
type Between struct {
	Pos    Pos
	X      Expr
	Lo, Hi Expr
	Not    bool
}

// When is one `when COND then VALUE` arm.
type When struct {
	Cond, Then Expr
}

// Case is `case [operand] when ... then ... [else ...] end`.
type Case struct {
	Pos     Pos
	Operand Expr
	Whens   []When
	Else    Expr
}

// Call is a function or aggregate call, with the extra forms the language
// allows inside the parentheses: `*`, `distinct`, `per ... having ...`,
// `as TYPE` (cast) and `from EXPR` (extract).
type Call struct {
	Pos      Pos
	Func     Ident
	Star     bool
	Distinct bool
	Args     []Expr
	Per      []*Ref
	Having   Expr
	As       *Ident
	From     Expr
}

// Narrow is `x where pred`.
type Narrow struct {
	Pos  Pos
	X    Expr
	Pred Expr
}

// EditKind says what a cell edit does.
type EditKind int

// The cell edits.
const (
	EditPin EditKind = iota
	EditDrop
	EditUngroup
	// EditTime is a time edit: `D = latest`, `D = earliest`, `D back N
	// UNIT`, `D to date UNIT`, `D running`, `D last N UNIT`.
	EditTime
)

// TimeEdit is the part of a time edit after its date column. Word is
// latest, earliest, back, to, running or last as written; the resolver
// checks the words, the number and the unit.
type TimeEdit struct {
	Pos  Pos
	Word Ident
	// Date is set when `date` follows the word (`to date UNIT`).
	Date bool
	N    *NumberLit
	Unit *Ident
}

// Edit is one cell edit inside brackets. Target is nil for `drop` and
// `ungroup` alone; Values holds the pinned value(s) of a pin.
type Edit struct {
	Pos    Pos
	Kind   EditKind
	Target *Ref
	Values []Expr
	// InList is true for `T.C in (...)`, false for `T.C = v`.
	InList bool
	// Time is set for EditTime.
	Time *TimeEdit
}

// Edited is `x[edit; edit...]`.
type Edited struct {
	Pos   Pos
	X     Expr
	Edits []*Edit
}

// Position implementations.

func (e *Ref) Position() Pos         { return e.Pos }
func (e *NumberLit) Position() Pos   { return e.Pos }
func (e *StringValue) Position() Pos { return e.Pos }
func (e *DateLit) Position() Pos     { return e.Pos }
func (e *BoolLit) Position() Pos     { return e.Pos }
func (e *NullLit) Position() Pos     { return e.Pos }
func (e *Binary) Position() Pos      { return e.Pos }
func (e *Unary) Position() Pos       { return e.Pos }
func (e *IsNull) Position() Pos      { return e.Pos }
func (e *In) Position() Pos          { return e.Pos }
func (e *Between) Position() Pos     { return e.Pos }
func (e *Case) Position() Pos        { return e.Pos }
func (e *Call) Position() Pos        { return e.Pos }
func (e *Narrow) Position() Pos      { return e.Pos }
func (e *Edited) Position() Pos      { return e.Pos }
