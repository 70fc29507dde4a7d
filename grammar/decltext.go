package grammar

import (
	"strings"
)

// DeclarationText returns the source text of the declaration whose name
// starts at offset in src (a measure's Pos, say), from its keyword to its
// last token: the tokens up to the next `table`, `measure` or `view`
// keyword, comments inside kept and comments after it left out. It
// returns "" when offset does not fall inside src.
func DeclarationText(src string, offset int) string {
	if offset < 0 || offset >= len(src) {
		return ""
	}
	start := offset
	before := strings.TrimRight(src[:offset], " \t\r\n")
	for _, kw := range []string{"table", "measure", "view"} {
		if n := len(before) - len(kw); n >= 0 && strings.EqualFold(before[n:], kw) {
			start = n
			break
		}
	}
	lx, err := lexDef.LexString("", src[offset:])
	if err != nil {
		return ""
	}
	end := offset
	for {
		t, err := lx.Next()
		if err != nil || t.EOF() {
			break
		}
		if t.Type == tokWhitespace || t.Type == tokComment {
			continue
		}
		if t.Type == tokKeyword && end > offset {
			switch strings.ToLower(t.Value) {
			case "table", "measure", "view":
				return src[start:end]
			}
		}
		end = offset + t.Pos.Offset + len(t.Value)
	}
	return src[start:end]
}
