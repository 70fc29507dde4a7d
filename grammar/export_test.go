package grammar

import (
	"encoding/json"
	"fmt"
	"reflect"
)

// FastPathDiff parses src with the fast path (fast.go) and with
// participle alone, and describes the first difference ("" if none): in
// the syntax tree of a declaration the fast path accepted (compared with
// participle's for the same tokens), in the resulting file, or in the
// diagnostics. It also counts the declarations handed to the parsers and
// those the fast path declined though participle accepts them, so that a
// test can require that the fast path is taken.
func FastPathDiff(src string) (diff string, decls, missed int) {
	const name = "m.roll"
	var diags Diagnostics
	if len(src) <= MaxSourceBytes && scanErrors(name, src, &diags) {
		d := declReader{sc: newScanner(name, src)}
		for {
			chunk, ok := d.next(&diags)
			if chunk == nil {
				break
			}
			if !ok {
				continue
			}
			decls++
			fast, ok := fastDecl(chunk, &arena{})
			sf, err := parseTokens(parser, chunk)
			if !ok {
				if err == nil {
					missed++
				}
				continue
			}
			if err != nil {
				return fmt.Sprintf("the fast path accepts a declaration at %v that participle refuses: %v", chunk[0].Pos, err), decls, missed
			}
			want := []*syntaxDecl{fast}
			if !reflect.DeepEqual(sf.Decls, want) {
				return fmt.Sprintf("syntax trees differ at %v:\nparticiple %s\nfast path  %s", chunk[0].Pos, dump(sf.Decls), dump(want)), decls, missed
			}
		}
	}
	ff, fd := parseFile(name, src, true)
	pf, pd := parseFile(name, src, false)
	if !reflect.DeepEqual(fd, pd) {
		return fmt.Sprintf("diagnostics differ:\nparticiple %s\nfast path  %s", dump(pd), dump(fd)), decls, missed
	}
	if !reflect.DeepEqual(ff, pf) {
		return fmt.Sprintf("files differ:\nparticiple %s\nfast path  %s", dump(pf), dump(ff)), decls, missed
	}
	return "", decls, missed
}

// FastExprDiff does the same for ParseExpr.
func FastExprDiff(src string) string {
	fe, fd := parseExpr("--where", src, true)
	pe, pd := parseExpr("--where", src, false)
	if !reflect.DeepEqual(fd, pd) || !reflect.DeepEqual(fe, pe) {
		return fmt.Sprintf("participle %s %s\nfast path  %s %s", dump(pe), dump(pd), dump(fe), dump(fd))
	}
	return ""
}

func dump(v any) string {
	b, err := json.Marshal(v)
	if err != nil {
		return fmt.Sprintf("%#v", v)
	}
	return string(b)
}
