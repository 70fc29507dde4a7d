package format_test

import (
	"fmt"
	"reflect"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/grammar/format"
)

// The expected layouts are this package's own rules (its doc comment);
// the column blocks follow the house style of testdata/exec/shop.roll and
// testdata/tpch/tpch.roll (names padded to the longest plus two, as in
// the language reference's first model).
var layouts = []struct{ name, in, want string }{
	{"table columns aligned, keywords lower case, names (INTEGER) as written",
		"TABLE sales AT \"s\" From \"sales.csv\" { KEY id\nid integer\n store_id INTEGER -> stores.id REQUIRED\nprice decimal NonAdditive\nline = price*qty }\n",
		"table sales at \"s\" from \"sales.csv\" {\n  key id\n  id        integer\n  store_id  INTEGER  -> stores.id required\n  price     decimal  nonadditive\n  line      = price * qty\n}\n"},
	{"one declaration per line, blank line around tables",
		"measure a = 1 measure b = 2\ntable t { key id id integer } view v = a by t.id\n",
		"measure a = 1\nmeasure b = 2\n\ntable t {\n  key id\n  id  integer\n}\n\nview v = a by t.id\n"},
	{"measure blocks: = and tails aligned, a blank line ends a block",
		"measure revenue = sum(s.p*s.q) \"paid\"\nmeasure rate=revenue/ 2 format percent\n\n\n\nmeasure longer_name = 1\n",
		"measure revenue = sum(s.p * s.q)  \"paid\"\nmeasure rate    = revenue / 2     format percent\n\nmeasure longer_name = 1\n"},
	{"comments stay: trailing ones aligned, own-line ones indented",
		"-- head\n\ntable t { -- the table\n  -- the key\n  key id\n  id integer -- first\n  name text -- second\n  -- last\n}  -- done\n-- lead\nmeasure m = count(t.id)\n",
		"-- head\n\ntable t {  -- the table\n  -- the key\n  key id\n  id    integer  -- first\n  name  text     -- second\n  -- last\n}  -- done\n\n-- lead\nmeasure m = count(t.id)\n"},
	{"spacing: calls, unary minus, edits, in, keyword after a dot",
		"measure m = - sum ( s.x ) [ s.d = DATE '2026-01-01' ; DROP s.k ] + - - 1 - -2 where s.Date IN ( 'a' , 'b' ) and not s.b\n",
		"measure m = -sum(s.x)[s.d = date '2026-01-01'; drop s.k] + - -1 - -2 where s.Date in ('a', 'b') and not s.b\n"},
	// Found by TestRandomLayouts: with a comment between the dot and the
	// name, the name (a keyword) was lower-cased into another column.
	{"a keyword after a dot and a comment is a name as written",
		"measure m = sum(s. -- noise\nDATE)\n",
		"measure m = sum(s.  -- noise\n    DATE)\n"},
	{"links, semiadditive, count(*)",
		"table x { key a,b\nlink ( a , b ) -> y ( c , d ) required\nbal decimal semiadditive ( x.day )\nday date }\nmeasure n = count( * per x.a having n > 1 )\n",
		"table x {\n  key a, b\n  link (a, b) -> y (c, d) required\n  bal  decimal  semiadditive(x.day)\n  day  date\n}\n\nmeasure n = count(* per x.a having n > 1)\n"},
	{"line breaks inside a declaration kept, continuation indented by nesting",
		"measure grade = CASE\nwhen sum(s.q) > 5 then 'big'\n\n\n     else coalesce(\n  sum(s.q),\n0) END\n    \"grade\"\n",
		"measure grade = case\n    when sum(s.q) > 5 then 'big'\n\n    else coalesce(\n      sum(s.q),\n      0) end\n  \"grade\"\n"},
	{"a comment inside a declaration",
		"measure m = sum(s.x) -- why\n  where s.y = 1\n",
		"measure m = sum(s.x)  -- why\n  where s.y = 1\n"},
	{"a multi-line column ends the block",
		"table t {\n key id\n id integer\n longer_name = id\n   + 1\n b text\n}\n",
		"table t {\n  key id\n  id  integer\n  longer_name = id\n    + 1\n  b  text\n}\n"},
	{"a derived column's expression does not widen the type column",
		"table t {\n key id\n id integer -> u.id\n twice = id * 2 + id * 3 nonadditive\n}\n",
		"table t {\n  key id\n  id     integer  -> u.id\n  twice  = id * 2 + id * 3  nonadditive\n}\n"},
	{"byte order mark, CRLF, trailing spaces",
		"\uFEFFmeasure m = 1   -- c  \r\n\r\n\r\nmeasure n = 2\r\n",
		"measure m = 1  -- c\n\nmeasure n = 2\n"},
	{"views aligned, with totals",
		"view a = m by t.c WITH TOTALS grand\nview bb = m, n by t.c where t.c <> 'x'\n",
		"view a  = m by t.c with totals grand\nview bb = m, n by t.c where t.c <> 'x'\n"},
	{"a string written over two lines is kept as it is",
		"measure m = count(s.x) where s.t = 'a\n  b'\n",
		"measure m = count(s.x) where s.t = 'a\n  b'\n"},
	{"declarations and columns after other than ASCII on their line",
		"table t { key id id text -> u.`é` `é` text } measure a = count(t.id) where t.id = 'é' measure b = 1\n",
		"table t {\n  key id\n  id   text  -> u.`é`\n  `é`  text\n}\n\nmeasure a = count(t.id) where t.id = 'é'\nmeasure b = 1\n"},
	{"empty file", "\n\n  -- only\n\n", "-- only\n"},
}

func TestLayouts(t *testing.T) {
	for _, c := range layouts {
		t.Run(c.name, func(t *testing.T) {
			got := formatOK(t, "in.roll", c.in)
			if got != c.want {
				t.Errorf("got:\n%s\nwant:\n%s", got, c.want)
			}
			checkFormatted(t, "in.roll", c.in, got)
		})
	}
}

// TestParseErrorsAreReturned: a file that does not parse gives its
// errors with file:line:col, and no text.
func TestParseErrorsAreReturned(t *testing.T) {
	out, diags := format.Source("bad.roll", "measure a = 1\nmeasure b = sum(s.x\n")
	if out != "" || len(diags) == 0 || !diags.HasErrors() {
		t.Fatalf("got %q, %v", out, diags)
	}
	if p := diags[0].Pos; p.File != "bad.roll" || p.Line != 3 && p.Line != 2 || p.Col < 1 {
		t.Errorf("position %v", p)
	}
}

// tb is what the checks need of a test, plain or rapid's.
type tb interface {
	Helper()
	Errorf(format string, args ...any)
	Fatalf(format string, args ...any)
}

func formatOK(t tb, name, src string) string {
	t.Helper()
	out, diags := format.Source(name, src)
	if diags != nil {
		t.Fatalf("%s does not format: %v", name, diags)
	}
	return out
}

// checkFormatted asserts what formatting must keep: the result parses to
// the same syntax tree, has the same tokens (comments included; keywords
// compared without case, comments without the white space at their end),
// and formatting it again changes nothing.
func checkFormatted(t tb, name, src, out string) {
	t.Helper()
	if err := sameTokens(src, out); err != nil {
		t.Errorf("%s: %v\nformatted:\n%s", name, err, out)
	}
	if err := sameTree(name, src, out); err != nil {
		t.Errorf("%s: %v\nformatted:\n%s", name, err, out)
	}
	if again := formatOK(t, name, out); again != out {
		t.Errorf("%s: formatting is not idempotent; first:\n%s\nsecond:\n%s", name, out, again)
	}
}

func sameTokens(a, b string) error {
	ta, tb := tokens(a), tokens(b)
	for i := 0; i < len(ta) || i < len(tb); i++ {
		if i >= len(ta) || i >= len(tb) || ta[i] != tb[i] {
			return fmt.Errorf("the tokens differ at token %d: %v before, %v after", i, nth(ta, i), nth(tb, i))
		}
	}
	return nil
}

func nth(ts []string, i int) string {
	if i < len(ts) {
		return ts[i]
	}
	return "(none)"
}

func tokens(src string) []string {
	var out []string
	for _, t := range grammar.Tokens("x.roll", src) {
		text := t.Text
		switch t.Kind {
		case "keyword":
			text = strings.ToLower(text)
		case "comment":
			text = strings.TrimRight(text, " \t\r")
		case "bad":
			if text == "\uFEFF" {
				continue
			}
		}
		out = append(out, t.Kind+" "+text)
	}
	return out
}

// sameTree parses both texts and compares their syntax trees without
// positions, and with the names that are keywords in lower case: a
// column's type and cast's "as" type (`DATE`) are keywords that the
// formatter writes in lower case, and the language reads without case.
func sameTree(name, a, b string) error {
	fa, da := grammar.Parse(name, a)
	fb, db := grammar.Parse(name, b)
	if da.HasErrors() || db.HasErrors() {
		return fmt.Errorf("parse errors: before %v, after %v", da, db)
	}
	zeroPositions(reflect.ValueOf(fa))
	zeroPositions(reflect.ValueOf(fb))
	if !reflect.DeepEqual(fa, fb) {
		return fmt.Errorf("the syntax trees differ")
	}
	return nil
}

var (
	posType   = reflect.TypeOf(grammar.Pos{})
	identType = reflect.TypeOf(grammar.Ident{})
)

func zeroPositions(v reflect.Value) {
	switch v.Kind() {
	case reflect.Pointer, reflect.Interface:
		if !v.IsNil() {
			zeroPositions(v.Elem())
		}
	case reflect.Slice:
		for i := 0; i < v.Len(); i++ {
			zeroPositions(v.Index(i))
		}
	case reflect.Struct:
		if v.Type() == posType {
			v.Set(reflect.Zero(posType))
			return
		}
		if v.Type() == identType {
			name := v.FieldByName("Name")
			if ts := grammar.Tokens("", name.String()); len(ts) == 1 && ts[0].Kind == "keyword" {
				name.SetString(strings.ToLower(name.String()))
			}
		}
		for i := 0; i < v.NumField(); i++ {
			zeroPositions(v.Field(i))
		}
	}
}
