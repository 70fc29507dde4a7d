package grammar

// Token is one token of a model file, for tools that work on the text
// (an editor's highlighting, the language server): its kind, its text and
// where it starts (line and column counted from 1, the column in
// characters).
type Token struct {
	// Kind is one of: comment, name (a name, backquoted or not), keyword,
	// string (single-quoted), text (double-quoted), number, operator, or
	// bad (a character or an unterminated quote the language does not
	// accept).
	Kind string
	Text string
	Line int
	Col  int
}

var tokenKinds = map[string]string{
	"Comment": "comment", "QIdent": "name", "Ident": "name", "Keyword": "keyword", "String": "string",
	"DString": "text", "Number": "number", "Op": "operator", "Unterminated": "bad", "Bad": "bad",
}

// Tokens splits src into tokens as the parser sees them, without white
// space. It never fails: what the language does not accept is a "bad"
// token.
func Tokens(filename, src string) []Token {
	lx, err := lexDef.LexString(filename, src)
	if err != nil {
		return nil
	}
	names := map[int]string{}
	for name, t := range lexDef.Symbols() {
		names[int(t)] = name
	}
	var out []Token
	for {
		t, err := lx.Next()
		if err != nil || t.EOF() {
			return out
		}
		kind, ok := tokenKinds[names[int(t.Type)]]
		if !ok {
			continue // white space
		}
		out = append(out, Token{Kind: kind, Text: t.Value, Line: t.Pos.Line, Col: t.Pos.Column})
	}
}
