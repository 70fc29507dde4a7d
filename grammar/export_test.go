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
	ff, fd := parseFile(name, src, true, nil, nil)
	pf, pd := parseFile(name, src, false, nil, nil)
	if diff := lazyDiff(name, src, ff, fd); diff != "" {
		return diff, decls, missed
	}
	if !reflect.DeepEqual(fd, pd) {
		return fmt.Sprintf("diagnostics differ:\nparticiple %s\nfast path  %s", dump(pd), dump(fd)), decls, missed
	}
	if !reflect.DeepEqual(ff, pf) {
		return fmt.Sprintf("files differ:\nparticiple %s\nfast path  %s", dump(pf), dump(ff)), decls, missed
	}
	return "", decls, missed
}

// lazyDiff describes the first difference between ParseLazy's file and
// diagnostics and Parse's (f and d), with each lazy measure's expression
// parsed again ("" if none).
func lazyDiff(name, src string, f *File, d Diagnostics) string {
	lf, ld := ParseLazy(name, src)
	if !reflect.DeepEqual(ld, d) {
		return fmt.Sprintf("diagnostics differ:\nParse     %s\nParseLazy %s", dump(d), dump(ld))
	}
	if len(lf.Measures) != len(f.Measures) {
		return fmt.Sprintf("ParseLazy has %d measures, Parse %d", len(lf.Measures), len(f.Measures))
	}
	for i, m := range lf.Measures {
		if m.Expr != nil || m.lazy == nil {
			return fmt.Sprintf("ParseLazy kept the expression of measure %s", m.Name.Name)
		}
		again := *m
		again.Expr, again.lazy = m.Expression(), nil
		if !reflect.DeepEqual(&again, f.Measures[i]) {
			return fmt.Sprintf("measure %d parsed again differs:\nParse     %s\nParseLazy %s", i, dump(f.Measures[i]), dump(&again))
		}
	}
	if !reflect.DeepEqual(lf.Tables, f.Tables) || !reflect.DeepEqual(lf.Views, f.Views) {
		return fmt.Sprintf("tables or views differ:\nParse     %s\nParseLazy %s", dump(f), dump(lf))
	}
	return ""
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
