package engine

import (
	"context"
	"database/sql"
	"errors"
	"fmt"
	"net/url"
	"path/filepath"
	"sort"
	"strings"

	"modernc.org/sqlite"
)

// sqliteTarget splits sqlite:PATH[?mode=M&attach=NAME=FILE...] into the
// file to open, its open mode, and the files to attach by schema name.
func sqliteTarget(dsn string) (path, mode string, attach map[string]string, err error) {
	_, rest, _ := strings.Cut(dsn, ":")
	rest = strings.TrimPrefix(rest, "//")
	path, query, _ := strings.Cut(rest, "?")
	if path == "" {
		return "", "", nil, errors.New("sqlite: name the database file: sqlite:PATH")
	}
	q, err := url.ParseQuery(query)
	if err != nil {
		return "", "", nil, err
	}
	mode, attach = "rw", map[string]string{}
	for k, vs := range q {
		switch k {
		case "mode":
			mode = vs[0]
			if mode != "rw" && mode != "rwc" && mode != "ro" {
				return "", "", nil, fmt.Errorf("sqlite: mode is ro, rw or rwc, not %q", mode)
			}
		case "attach":
			for _, v := range vs {
				name, file, ok := strings.Cut(v, "=")
				if !ok || name == "" || file == "" {
					return "", "", nil, fmt.Errorf("sqlite: attach takes NAME=FILE, not %q", v)
				}
				if !filepath.IsAbs(file) {
					file = filepath.Join(filepath.Dir(path), file)
				}
				attach[name] = file
			}
		default:
			return "", "", nil, fmt.Errorf("sqlite URL parameter %q is not supported (mode, attach)", k)
		}
	}
	return path, mode, attach, nil
}

// sqliteURI is file as a URI filename (sqlite.org/uri.html): %, ? and #
// in the path are escaped, the open mode is a parameter.
func sqliteURI(file, mode string) string {
	return "file:" + strings.NewReplacer("%", "%25", "?", "%3f", "#", "%23").Replace(file) + "?mode=" + mode
}

func openSQLite(ctx context.Context, dsn string, o LiveOptions) (*Live, error) {
	path, mode, attach, err := sqliteTarget(dsn)
	if err != nil {
		return nil, err
	}
	if !o.Writable {
		mode = "ro"
	}
	db, err := sql.Open("sqlite", sqliteURI(path, mode))
	if err != nil {
		return nil, err
	}
	names := make([]string, 0, len(attach))
	for n := range attach {
		names = append(names, n)
	}
	sort.Strings(names)
	// Attached files open in the main file's mode, so that a read-only
	// session never creates a missing one.
	var setup []string
	for _, n := range names {
		setup = append(setup, "ATTACH DATABASE "+quoteSQLiteString(sqliteURI(attach[n], mode))+" AS "+quoteSQLiteIdent(n))
	}
	if !o.Writable {
		// query_only refuses every change on the connection, to the main
		// and the attached files alike (sqlite.org/pragma.html#pragma_query_only).
		setup = append(setup, "PRAGMA query_only = 1")
	}
	l, err := newLive(ctx, "sqlite", db, o, setup...)
	if err != nil {
		return nil, err
	}
	if !o.Writable {
		if err := l.conn.Raw(func(dc any) error {
			a, ok := dc.(sqlite.AuthorizerRegisterer)
			if !ok {
				return errors.New("this SQLite driver cannot refuse writes")
			}
			return a.RegisterAuthorizer(readOnlyAuthorizer)
		}); err != nil {
			l.Close()
			return nil, err
		}
	}
	var v string
	if err := l.conn.QueryRowContext(ctx, "SELECT sqlite_version()").Scan(&v); err != nil {
		l.Close()
		return nil, err
	}
	l.Server = "SQLite " + v
	return l, nil
}

func quoteSQLiteString(s string) string { return "'" + strings.ReplaceAll(s, "'", "''") + "'" }
func quoteSQLiteIdent(s string) string  { return "`" + strings.ReplaceAll(s, "`", "``") + "`" }

// readPragmas are the pragmas a read-only session may run: those that
// only report (sqlite.org/pragma.html).
var readPragmas = map[string]bool{
	"table_info": true, "table_xinfo": true, "table_list": true, "index_list": true, "index_info": true,
	"index_xinfo": true, "database_list": true, "foreign_key_list": true, "collation_list": true,
	"function_list": true, "pragma_list": true, "module_list": true, "compile_options": true,
}

// readOnlyAuthorizer lets a statement read and call functions, and
// refuses whatever writes, attaches or detaches a file, or sets a pragma
// (sqlite.org/c3ref/set_authorizer.html): a second line of defence after
// query_only, which a pragma could otherwise turn off.
func readOnlyAuthorizer(action sqlite.AuthorizerActionCode, arg1, arg2, _, _ string) sqlite.AuthorizerReturnCode {
	switch action {
	case sqlite.AuthRead, sqlite.AuthSelect, sqlite.AuthRecursive, sqlite.AuthTransaction, sqlite.AuthSavepoint:
		return sqlite.AuthorizerOK
	case sqlite.AuthFunction:
		if strings.EqualFold(arg2, "load_extension") {
			return sqlite.AuthorizerDeny
		}
		return sqlite.AuthorizerOK
	case sqlite.AuthPragma:
		if readPragmas[strings.ToLower(arg1)] {
			return sqlite.AuthorizerOK
		}
	}
	return sqlite.AuthorizerDeny
}
