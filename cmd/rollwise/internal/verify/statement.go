package verify

import (
	"fmt"
	"strings"
)

// The handwritten SQL arrives in pull requests and runs on a live
// database: before anything reaches the server, CheckQuery makes sure it
// is exactly one query that reads. It reads the text as the engine's own
// lexer does for strings, quoted names, comments and dollar quoting, so
// that a ';' or a keyword inside them is never taken for code, and code
// is never hidden inside what looks like a comment. The read-only session
// the query then runs in (engine.LiveOptions) is the guarantee; this
// check gives a clear error first, and covers what a read-only
// transaction does not (DDL commits it on MySQL, and a second statement).

// sqlToken is a word outside strings, quoted names and comments, or one
// of the characters ; and (.
type sqlToken struct {
	text   string // a word in upper case, ";" or "("
	pos    int    // byte offset in the text
	quoted bool   // a quoted name, compared as written (in upper case)
}

// firstWords may start the query: a SELECT, a WITH ... SELECT, VALUES,
// and on PostgreSQL and DuckDB TABLE name; on DuckDB FROM-first.
var firstWords = map[string]bool{"SELECT": true, "WITH": true, "VALUES": true, "TABLE": true, "FROM": true}

// writeWords change data, schema, rights, files or the session wherever
// they appear outside strings and quoted names (INTO: SELECT INTO creates
// a table, INTO OUTFILE writes a file on the server; UPDATE: FOR UPDATE
// locks rows, as FOR SHARE does, which CheckQuery refuses too).
var writeWords = map[string]bool{
	"INSERT": true, "UPDATE": true, "DELETE": true, "MERGE": true, "UPSERT": true, "COPY": true,
	"CREATE": true, "DROP": true, "ALTER": true, "TRUNCATE": true, "GRANT": true, "REVOKE": true,
	"INTO": true, "ATTACH": true, "DETACH": true, "PRAGMA": true, "CALL": true,
	"COMMIT": true, "ROLLBACK": true, "SAVEPOINT": true,
}

// writeFunctions write, reach outside the session, or run SQL text of
// their own (query_to_xml, dblink); refused when called, by bare or
// quoted name.
var writeFunctions = map[string]bool{
	"SET_CONFIG": true, "DBLINK": true, "DBLINK_EXEC": true, "DBLINK_SEND_QUERY": true, "DBLINK_CONNECT": true,
	"LO_EXPORT": true, "LO_IMPORT": true, "LO_UNLINK": true, "LO_PUT": true, "LO_FROM_BYTEA": true,
	"PG_FILE_WRITE": true, "PG_TERMINATE_BACKEND": true, "PG_CANCEL_BACKEND": true, "PG_RELOAD_CONF": true,
	"PG_ROTATE_LOGFILE": true, "PG_PROMOTE": true, "PG_SWITCH_WAL": true,
	"QUERY_TO_XML": true, "QUERY_TO_XMLSCHEMA": true, "QUERY_TO_XML_AND_XMLSCHEMA": true, "CURSOR_TO_XML": true,
	"NEXTVAL": true, "SETVAL": true, "LOAD_EXTENSION": true, "WRITEFILE": true, "SYS_EXEC": true, "SYS_EVAL": true,
}

// CheckQuery checks that text, the handwritten SQL of file name for
// dialect, is exactly one query that only reads, and returns that query
// without what follows its last token (a ';', comments). An error names
// file:line:col and says what to write instead.
func CheckQuery(dialect, name, text string) (string, error) {
	toks, err := sqlTokens(dialect, text)
	if err != nil {
		return "", fmt.Errorf("%s:%v", name, err)
	}
	at := func(pos int, format string, args ...any) error {
		line, col := lineCol(text, pos)
		return fmt.Errorf("%s:%d:%d: %s", name, line, col, fmt.Sprintf(format, args...))
	}
	end, first := -1, -1
	for i, t := range toks {
		switch {
		case t.text == ";":
			if first >= 0 && end < 0 {
				end = t.pos
			}
		case end >= 0:
			return "", at(t.pos, "a second statement starts here: verify runs exactly one query; remove everything after the first ';'")
		case first < 0:
			first = i
		}
	}
	if first < 0 {
		return "", inputErr("%s holds no SQL statement: write one SELECT", name)
	}
	lead := firstWord(toks[first:])
	if lead == nil || lead.quoted || !firstWords[lead.text] || (lead.text == "FROM" && dialect != "duckdb") {
		pos := toks[first].pos
		if lead != nil {
			pos = lead.pos
		}
		return "", at(pos, "verify runs a query that reads: start it with SELECT or WITH ... SELECT")
	}
	for i, t := range toks {
		if end >= 0 && t.pos >= end {
			break
		}
		if !t.quoted && (writeWords[t.text] || t.text == "SHARE" && i > 0 && (toks[i-1].text == "FOR" || toks[i-1].text == "KEY")) {
			return "", at(t.pos, "%s changes the database or locks rows: verify runs a query that only reads; remove it", t.text)
		}
		if writeFunctions[t.text] && i+1 < len(toks) && toks[i+1].text == "(" {
			return "", at(t.pos, "%s reaches outside the query or writes: verify runs a query that only reads; remove the call", strings.ToLower(t.text))
		}
	}
	if end < 0 {
		end = len(text)
	}
	return text[:end], nil
}

// firstWord is the first word of toks, past opening parentheses.
func firstWord(toks []sqlToken) *sqlToken {
	for i := range toks {
		if toks[i].text != "(" {
			return &toks[i]
		}
	}
	return nil
}

// lineCol turns a byte offset into a 1-based line and column (in runes).
func lineCol(text string, pos int) (int, int) {
	line := 1 + strings.Count(text[:pos], "\n")
	start := strings.LastIndexByte(text[:pos], '\n') + 1
	return line, 1 + len([]rune(text[start:pos]))
}

// lexer reads SQL text the way dialect's engine does.
type lexer struct {
	dialect string
	text    string
	i       int
	toks    []sqlToken
}

// sqlTokens returns the words, ';' and '(' of text outside strings,
// quoted names and comments. An unterminated string, quoted name or
// comment is an error (LINE:COL: ...), as is a MySQL comment whose
// content runs (/*! ... */).
func sqlTokens(dialect, text string) ([]sqlToken, error) {
	lx := &lexer{dialect: dialect, text: text}
	for lx.i < len(text) {
		if err := lx.next(); err != nil {
			return nil, err
		}
	}
	return lx.toks, nil
}

func (lx *lexer) fail(pos int, what string) error {
	line, col := lineCol(lx.text, pos)
	return fmt.Errorf("%d:%d: %s", line, col, what)
}

// next reads one token, string, quoted name or comment.
func (lx *lexer) next() error {
	t, i, my := lx.text, lx.i, lx.dialect == "mysql"
	c := t[i]
	switch {
	case c == ';' || c == '(':
		lx.toks = append(lx.toks, sqlToken{text: string(c), pos: i})
		lx.i++
	case c == '-' && strings.HasPrefix(t[i:], "--") && (!my || i+2 == len(t) || t[i+2] <= ' '):
		lx.skipLine()
	case c == '#' && my:
		lx.skipLine()
	case c == '/' && strings.HasPrefix(t[i:], "/*"):
		return lx.blockComment()
	case c == '\'':
		return lx.quoted(i, '\'', my)
	case c == '"' && my:
		return lx.quoted(i, '"', true) // a string in MySQL's default mode
	case c == '"' || c == '`' || (c == '[' && lx.dialect == "sqlite"):
		closing := map[byte]byte{'"': '"', '`': '`', '[': ']'}[c]
		start := i
		if err := lx.quoted(i, closing, false); err != nil {
			return err
		}
		name := strings.ReplaceAll(t[start+1:lx.i-1], string(closing)+string(closing), string(closing))
		lx.toks = append(lx.toks, sqlToken{text: strings.ToUpper(name), pos: start, quoted: true})
	case c == '$' && !my:
		return lx.dollar()
	case isWordStart(c):
		j := i
		for j < len(t) && isWordPart(t[j]) {
			j++
		}
		word := t[i:j]
		if (word == "E" || word == "e") && j < len(t) && t[j] == '\'' && !my {
			lx.i = j
			return lx.quoted(j, '\'', true) // E'...': backslash escapes
		}
		lx.toks = append(lx.toks, sqlToken{text: strings.ToUpper(word), pos: i})
		lx.i = j
	default:
		lx.i++
	}
	return nil
}

func isWordStart(c byte) bool {
	return c == '_' || c >= 'A' && c <= 'Z' || c >= 'a' && c <= 'z' || c >= 0x80
}
func isWordPart(c byte) bool { return isWordStart(c) || c >= '0' && c <= '9' || c == '$' }

func (lx *lexer) skipLine() {
	if j := strings.IndexByte(lx.text[lx.i:], '\n'); j >= 0 {
		lx.i += j + 1
		return
	}
	lx.i = len(lx.text)
}

// blockComment skips /* ... */, nested on PostgreSQL and DuckDB. MySQL
// runs the content of /*! ... */ (and MariaDB of /*M! ... */): refused.
func (lx *lexer) blockComment() error {
	start, t := lx.i, lx.text
	if lx.dialect == "mysql" && (strings.HasPrefix(t[start:], "/*!") || strings.HasPrefix(t[start:], "/*M!")) {
		return lx.fail(start, "MySQL runs the text of a /*! ... */ comment: write it as plain SQL")
	}
	nests := lx.dialect == "postgres" || lx.dialect == "duckdb"
	depth, i := 0, start
	for i < len(t) {
		switch {
		case strings.HasPrefix(t[i:], "/*") && (depth == 0 || nests):
			depth++
			i += 2
		case strings.HasPrefix(t[i:], "*/"):
			depth--
			i += 2
			if depth == 0 {
				lx.i = i
				return nil
			}
		default:
			i++
		}
	}
	return lx.fail(start, "this comment is never closed: end it with */")
}

// quoted skips a string or quoted name that starts at start and ends at
// closing; a doubled closing character stands for itself, and with
// backslash a backslash escapes the next character.
func (lx *lexer) quoted(start int, closing byte, backslash bool) error {
	t := lx.text
	for i := start + 1; i < len(t); i++ {
		switch {
		case backslash && t[i] == '\\':
			i++
		case t[i] == closing && i+1 < len(t) && t[i+1] == closing:
			i++
		case t[i] == closing:
			lx.i = i + 1
			return nil
		}
	}
	return lx.fail(start, fmt.Sprintf("this %s is never closed: end it with %c", map[bool]string{true: "string", false: "quoted name"}[closing == '\'' || lx.dialect == "mysql" && closing == '"'], closing))
}

// dollar skips a dollar-quoted string ($$...$$, $tag$...$tag$) on
// PostgreSQL and DuckDB; a $ that starts none ($1, a lone $) is skipped.
func (lx *lexer) dollar() error {
	t, start := lx.text, lx.i
	j := start + 1
	for j < len(t) && t[j] != '$' && isWordPart(t[j]) {
		j++
	}
	tagOK := j < len(t) && t[j] == '$' && (j == start+1 || !(t[start+1] >= '0' && t[start+1] <= '9'))
	if !tagOK {
		lx.i = start + 1
		return nil
	}
	tag := t[start : j+1]
	k := strings.Index(t[j+1:], tag)
	if k < 0 {
		return lx.fail(start, "this "+tag+" string is never closed: end it with "+tag)
	}
	lx.i = j + 1 + k + len(tag)
	return nil
}
