package grammar

import (
	"github.com/alecthomas/participle/v2"
	"github.com/alecthomas/participle/v2/lexer"
)

// The concrete grammar, as participle structs. Each struct is one
// production; its EBNF is in testdata/grammar.ebnf (a golden file), and
// convert.go turns these structs into the syntax tree of ast.go.

// keywords are reserved (case-insensitive); write `name` in backquotes to use
// one as a name. After a dot, a keyword needs no backquotes.
var keywords = []string{
	"table", "at", "from", "key", "link", "measure", "view", "by", "where",
	"with", "totals", "format", "per", "having", "distinct", "and", "or",
	"not", "in", "between", "is", "null", "case", "when", "then", "else",
	"end", "drop", "ungroup", "as", "true", "false", "additive",
	"nonadditive", "semiadditive", "date", "timestamp", "required",
}

var parser = participle.MustBuild[syntaxFile](
	participle.Lexer(lexDef),
	participle.CaseInsensitive("Keyword"),
	participle.Elide("Comment", "Whitespace"),
	participle.UseLookahead(3),
)

// File = Decl* .
type syntaxFile struct {
	Decls []*syntaxDecl `parser:"@@*"`
}

// Decl = Table | Measure | View .
type syntaxDecl struct {
	Table   *syntaxTable   `parser:"  @@"`
	Measure *syntaxMeasure `parser:"| @@"`
	View    *syntaxView    `parser:"| @@"`
}

// Name = Ident | QIdent .
type syntaxName struct {
	Pos  lexer.Position
	Text string `parser:"@(Ident | QIdent)"`
}

// Member = Ident | QIdent | Keyword .  (the part after a dot)
type syntaxMember struct {
	Pos  lexer.Position
	Text string `parser:"@(Ident | QIdent | Keyword)"`
}

// Ref = Name ("." Member)? .
type syntaxRef struct {
	Pos    lexer.Position
	First  *syntaxName   `parser:"@@"`
	Second *syntaxMember `parser:"(\".\" @@)?"`
}

// Table = "table" Name ("at" DString)? ("from" DString)? ("with" "null" DString ("," DString)*)? "{" Item* "}" .
type syntaxTable struct {
	Pos   lexer.Position
	Name  *syntaxName     `parser:"\"table\" @@"`
	At    *syntaxString   `parser:"(\"at\" @@)?"`
	From  *syntaxString   `parser:"(\"from\" @@)?"`
	Nulls []*syntaxString `parser:"(\"with\" \"null\" @@ (\",\" @@)*)?"`
	Items []*syntaxItem   `parser:"\"{\" @@* \"}\""`
}

// DString is a double-quoted string with its position.
type syntaxString struct {
	Pos  lexer.Position
	Text string `parser:"@DString"`
}

// Item = "key" Name ("," Name)* | Link | Column .
type syntaxItem struct {
	Pos    lexer.Position
	Key    []*syntaxName `parser:"  \"key\" @@ (\",\" @@)*"`
	Link   *syntaxLink   `parser:"| @@"`
	Column *syntaxColumn `parser:"| @@"`
}

// Link = "link" "(" Name ("," Name)* ")" "->" Name "(" Name ("," Name)* ")" "required"? .
type syntaxLink struct {
	Pos      lexer.Position
	From     []*syntaxName `parser:"\"link\" \"(\" @@ (\",\" @@)* \")\""`
	Table    *syntaxName   `parser:"\"->\" @@"`
	To       []*syntaxName `parser:"\"(\" @@ (\",\" @@)* \")\""`
	Required bool          `parser:"@\"required\"?"`
}

// Column = Name ("=" Expr | Type) Option* .
type syntaxColumn struct {
	Pos     lexer.Position
	Name    *syntaxName     `parser:"@@"`
	Expr    *syntaxExpr     `parser:"( \"=\" @@"`
	Type    *syntaxMember   `parser:"| @@ )"`
	Options []*syntaxOption `parser:"@@*"`
}

// Option = LinkOption | "additive" | "nonadditive" | "semiadditive" "(" Ref ")" .
type syntaxOption struct {
	Pos         lexer.Position
	Link        *syntaxLinkOption `parser:"  @@"`
	Additive    bool              `parser:"| @\"additive\""`
	Nonadditive bool              `parser:"| @\"nonadditive\""`
	Semi        *syntaxRef        `parser:"| \"semiadditive\" \"(\" @@ \")\""`
}

// LinkOption = "->" Ref "required"? .
type syntaxLinkOption struct {
	Pos      lexer.Position
	Target   *syntaxRef `parser:"\"->\" @@"`
	Required bool       `parser:"@\"required\"?"`
}

// Measure = "measure" Name "=" Expr ("format" Name)? DString? .
type syntaxMeasure struct {
	Pos    lexer.Position
	Name   *syntaxName   `parser:"\"measure\" @@ \"=\""`
	Expr   *syntaxExpr   `parser:"@@"`
	Format *syntaxName   `parser:"(\"format\" @@)?"`
	Doc    *syntaxString `parser:"@@?"`
}

// View = "view" Name "=" Name ("," Name)* "by" Ref ("," Ref)* ("where" Expr)? Totals? .
type syntaxView struct {
	Pos      lexer.Position
	Name     *syntaxName   `parser:"\"view\" @@ \"=\""`
	Measures []*syntaxName `parser:"@@ (\",\" @@)*"`
	By       []*syntaxRef  `parser:"\"by\" @@ (\",\" @@)*"`
	Where    *syntaxExpr   `parser:"(\"where\" @@)?"`
	Totals   *syntaxTotals `parser:"@@?"`
}

// Totals = "with" "totals" Name? .
type syntaxTotals struct {
	Pos  lexer.Position
	With bool        `parser:"@\"with\" \"totals\""`
	Mode *syntaxName `parser:"@@?"`
}

// Expr = Or ("where" Or)* .  (narrowing binds loosest)
type syntaxExpr struct {
	Left  *syntaxOr   `parser:"@@"`
	Where []*syntaxOr `parser:"(\"where\" @@)*"`
}

// Or = And ("or" And)* .
type syntaxOr struct {
	Left  *syntaxAnd   `parser:"@@"`
	Right []*syntaxAnd `parser:"(\"or\" @@)*"`
}

// And = Not ("and" Not)* .
type syntaxAnd struct {
	Left  *syntaxNot   `parser:"@@"`
	Right []*syntaxNot `parser:"(\"and\" @@)*"`
}

// Not = "not" Not | Cmp .
type syntaxNot struct {
	Pos lexer.Position
	Not *syntaxNot `parser:"  \"not\" @@"`
	Cmp *syntaxCmp `parser:"| @@"`
}

// Cmp = Sum (CmpOp Sum | IsNull | In | Between)? .
type syntaxCmp struct {
	Left    *syntaxSum     `parser:"@@"`
	Op      *syntaxOp      `parser:"( @@"`
	Right   *syntaxSum     `parser:"  @@"`
	IsNull  *syntaxIsNull  `parser:"| @@"`
	In      *syntaxIn      `parser:"| @@"`
	Between *syntaxBetween `parser:"| @@ )?"`
}

// CmpOp = "=" | "<>" | "!=" | "<=" | ">=" | "<" | ">" .
type syntaxOp struct {
	Pos lexer.Position
	Op  string `parser:"@(\"=\" | \"<>\" | \"!=\" | \"<=\" | \">=\" | \"<\" | \">\")"`
}

// IsNull = "is" "not"? "null" .
type syntaxIsNull struct {
	Pos lexer.Position
	Not bool `parser:"\"is\" @\"not\"? \"null\""`
}

// In = "not"? "in" "(" Sum ("," Sum)* ")" .
type syntaxIn struct {
	Pos   lexer.Position
	Not   bool         `parser:"@\"not\"? \"in\""`
	Items []*syntaxSum `parser:"\"(\" @@ (\",\" @@)* \")\""`
}

// Between = "not"? "between" Sum "and" Sum .
type syntaxBetween struct {
	Pos  lexer.Position
	Not  bool       `parser:"@\"not\"? \"between\""`
	Low  *syntaxSum `parser:"@@ \"and\""`
	High *syntaxSum `parser:"@@"`
}

// Sum = Product (("+" | "-" | "||") Product)* .
type syntaxSum struct {
	Left *syntaxProduct `parser:"@@"`
	Rest []*syntaxSumOp `parser:"@@*"`
}

// SumOp is one operator and its right operand.
type syntaxSumOp struct {
	Pos   lexer.Position
	Op    string         `parser:"@(\"+\" | \"-\" | \"||\")"`
	Right *syntaxProduct `parser:"@@"`
}

// Product = Unary (("*" | "/") Unary)* .
type syntaxProduct struct {
	Left *syntaxUnary       `parser:"@@"`
	Rest []*syntaxProductOp `parser:"@@*"`
}

// ProductOp is one operator and its right operand.
type syntaxProductOp struct {
	Pos   lexer.Position
	Op    string       `parser:"@(\"*\" | \"/\")"`
	Right *syntaxUnary `parser:"@@"`
}

// Unary = "-" Unary | Postfix .
type syntaxUnary struct {
	Pos  lexer.Position
	Neg  *syntaxUnary   `parser:"  \"-\" @@"`
	Post *syntaxPostfix `parser:"| @@"`
}

// Postfix = Primary ("[" Edit (";" Edit)* "]")* .
type syntaxPostfix struct {
	Primary *syntaxPrimary    `parser:"@@"`
	Edits   []*syntaxEditList `parser:"@@*"`
}

// EditList is one bracketed list of cell edits.
type syntaxEditList struct {
	Pos   lexer.Position
	Edits []*syntaxEdit `parser:"\"[\" @@ (\";\" @@)* \"]\""`
}

// Edit = ("drop" | "ungroup") Ref? | Ref ("=" Sum | "in" "(" Sum ("," Sum)* ")" | TimeEdit) .
type syntaxEdit struct {
	Pos    lexer.Position
	Kind   string          `parser:"( @(\"drop\" | \"ungroup\")"`
	Target *syntaxRef      `parser:"  @@? )"`
	Pin    *syntaxRef      `parser:"| ( @@"`
	Value  *syntaxSum      `parser:"  ( \"=\" @@"`
	In     []*syntaxSum    `parser:"  | \"in\" \"(\" @@ (\",\" @@)* \")\""`
	Time   *syntaxTimeEdit `parser:"  | @@ ) )"`
}

// TimeEdit = Ident "date"? Number? Name? .  (back N UNIT, last N UNIT,
// to date UNIT, running: the words are checked when the model resolves)
type syntaxTimeEdit struct {
	Pos  lexer.Position
	Word *syntaxName `parser:"@@"`
	Date bool        `parser:"@\"date\"?"`
	N    *syntaxNum  `parser:"@@?"`
	Unit *syntaxName `parser:"@@?"`
}

// Num is a number with its position.
type syntaxNum struct {
	Pos  lexer.Position
	Text string `parser:"@Number"`
}

// Primary = Number | String | "date" String | "timestamp" String | "true" |
// "false" | "null" | Case | Call | "(" Expr ")" | Ref .
type syntaxPrimary struct {
	Pos       lexer.Position
	Number    *string     `parser:"  @Number"`
	String    *string     `parser:"| @String"`
	Date      *string     `parser:"| \"date\" @String"`
	Timestamp *string     `parser:"| \"timestamp\" @String"`
	Bool      *string     `parser:"| @(\"true\" | \"false\")"`
	Null      bool        `parser:"| @\"null\""`
	Case      *syntaxCase `parser:"| @@"`
	Call      *syntaxCall `parser:"| @@"`
	Paren     *syntaxExpr `parser:"| \"(\" @@ \")\""`
	Ref       *syntaxRef  `parser:"| @@"`
}

// Case = "case" Expr? When+ ("else" Expr)? "end" .
type syntaxCase struct {
	Pos     lexer.Position
	Operand *syntaxExpr   `parser:"\"case\" @@?"`
	Whens   []*syntaxWhen `parser:"@@+"`
	Else    *syntaxExpr   `parser:"(\"else\" @@)? \"end\""`
}

// When = "when" Expr "then" Expr .
type syntaxWhen struct {
	Pos  lexer.Position
	Cond *syntaxExpr `parser:"\"when\" @@"`
	Then *syntaxExpr `parser:"\"then\" @@"`
}

// Call = Name "(" ("*" | "distinct"? Expr ("," Expr)*)? ("per" Ref ("," Ref)* ("having" Expr)?)?
// ("as" Member)? ("from" Expr)? ")" .
type syntaxCall struct {
	Pos      lexer.Position
	Func     *syntaxName   `parser:"@@ \"(\""`
	Star     bool          `parser:"( @\"*\""`
	Distinct bool          `parser:"| ( @\"distinct\"?"`
	Args     []*syntaxExpr `parser:"  @@ (\",\" @@)* ) )?"`
	Per      []*syntaxRef  `parser:"(\"per\" @@ (\",\" @@)*"`
	Having   *syntaxExpr   `parser:"  (\"having\" @@)? )?"`
	As       *syntaxMember `parser:"(\"as\" @@)?"`
	From     *syntaxExpr   `parser:"(\"from\" @@)? \")\""`
}
