// Package livetest gives tests live databases loaded with a model's data:
// SQLite always (embedded), PostgreSQL and MySQL/MariaDB when
// ROLLWISE_TEST_POSTGRES and ROLLWISE_TEST_MYSQL hold a server's URL
// (.ci/databases.sh starts throwaway ones and sets them). Without a
// server the tests that need it are skipped with a message that says how
// to run them, except under CI=true, where a missing server fails them:
// CI must not pass by skipping.
//
// The servers are for tests only: each model's data goes into a database
// of its own (PostgreSQL: a database; MySQL: a default database, plus a
// database per schema the model's relations name), dropped and created
// afresh; Empty's databases, which tests load case after case, are
// dropped again when the test ends.
package livetest

import (
	"context"
	"fmt"
	"net/url"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/engine"
	"github.com/rollwise/rollwise/planner/model"
)

// EnvPostgres and EnvMySQL name the environment variables that hold the
// test servers' URLs.
const (
	EnvPostgres = "ROLLWISE_TEST_POSTGRES"
	EnvMySQL    = "ROLLWISE_TEST_MYSQL"
)

// Names are the live engines, in the order tests run them.
var Names = []string{"sqlite", "postgres", "mysql"}

// ServerURL returns the URL of the test server for engine name ("" for
// SQLite, which needs none), or reports why there is none: a skip, or a
// failure under CI=true.
func ServerURL(t testing.TB, name string) string {
	t.Helper()
	env := map[string]string{"postgres": EnvPostgres, "mysql": EnvMySQL}[name]
	if env == "" {
		return ""
	}
	u := os.Getenv(env)
	if u == "" {
		msg := fmt.Sprintf("%s is not set: no %s server to test on (start one with `. .ci/databases.sh; start_databases`)", env, name)
		if os.Getenv("CI") == "true" {
			t.Fatal(msg + "; under CI=true every engine must run")
		}
		t.Skip(msg)
	}
	return u
}

// Engine is a live database holding one model's data.
type Engine struct {
	Name string
	// DSN reaches the database (for run --dsn).
	DSN  string
	Live *engine.Live
}

var unsafeChars = regexp.MustCompile(`[^a-z0-9_]`)

// Open returns engine name loaded with m's data (dataDir as for --data),
// in databases named after tag (letters, digits and _): two packages that
// test in parallel must use different tags. The caller closes it.
func Open(t testing.TB, name, tag string, m *model.Model, dataDir string) *Engine {
	t.Helper()
	e := connect(t, name, dbPrefix()+safeName(tag), schemas(m))
	if err := engine.LoadInto(context.Background(), e.Live, m, dataDir); err != nil {
		e.Close()
		t.Fatalf("%s: %v", name, err)
	}
	return e
}

// Empty returns engine name with an empty database of its own, named
// after tag and the process (so that concurrent runs never share one),
// for a test that loads data itself, case after case
// (engine.LoadInto). The database is dropped when the test ends.
func Empty(t testing.TB, name, tag string) *Engine {
	t.Helper()
	db := fmt.Sprintf("%s%s_%d", dbPrefix(), safeName(tag), os.Getpid())
	e := connect(t, name, db, nil)
	server := ServerURL(t, name)
	t.Cleanup(func() {
		e.Close()
		if err := drop(context.Background(), name, server, db); err != nil {
			t.Errorf("%s: dropping the test database %s: %v", name, db, err)
		}
	})
	return e
}

// EnvPrefix names the environment variable that, when set, replaces
// rollwise_test_ at the start of the test databases' names, so that two
// checkouts testing at once on one server keep to their own databases.
const EnvPrefix = "ROLLWISE_TEST_DB_PREFIX"

// dbPrefix starts the name of every test database.
func dbPrefix() string {
	if p := os.Getenv(EnvPrefix); p != "" {
		return "rollwise_test_" + safeName(p) + "_"
	}
	return "rollwise_test_"
}

func safeName(tag string) string { return unsafeChars.ReplaceAllString(strings.ToLower(tag), "_") }

// connect creates database db afresh (with the given schemas) on engine
// name and connects to it.
func connect(t testing.TB, name, db string, schemas []string) *Engine {
	t.Helper()
	server := ServerURL(t, name)
	if name != "sqlite" { // SQLite's databases are the process's own (sqliteDir)
		holdServer(t, name, server)
	}
	ctx := context.Background()
	var dsn string
	var err error
	switch name {
	case "postgres":
		dsn, err = freshPostgres(ctx, server, db)
	case "mysql":
		dsn, err = freshMySQL(ctx, server, db, schemas)
	case "sqlite":
		dsn, err = freshSQLite(db, schemas)
	default:
		t.Fatalf("no live engine %q", name)
	}
	if err != nil {
		t.Fatalf("%s: preparing a test database: %v", name, err)
	}
	l, err := engine.OpenLive(ctx, dsn, engine.LiveOptions{Writable: true})
	if err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	return &Engine{Name: name, DSN: dsn, Live: l}
}

// Close closes the connection (the data stays until the next Open).
func (e *Engine) Close() { e.Live.Close() }

// schemas lists the schemas the model's relations name, sorted.
func schemas(m *model.Model) []string {
	seen := map[string]bool{}
	for _, t := range m.Tables {
		if len(t.Relation) == 2 {
			seen[t.Relation[0]] = true
		}
	}
	var out []string
	for s := range seen {
		out = append(out, s)
	}
	sort.Strings(out)
	return out
}

// drop drops database db of engine name (SQLite: its folder).
func drop(ctx context.Context, name, server, db string) error {
	if name == "sqlite" {
		return os.RemoveAll(sqliteDir(db))
	}
	admin, err := engine.OpenLive(ctx, server, engine.LiveOptions{Writable: true})
	if err != nil {
		return err
	}
	defer admin.Close()
	if name == "postgres" {
		return admin.Exec(ctx, `DROP DATABASE IF EXISTS "`+db+`" WITH (FORCE)`)
	}
	return admin.Exec(ctx, "DROP DATABASE IF EXISTS `"+db+"`")
}

// freshPostgres drops and creates database db on the server and returns
// its URL.
func freshPostgres(ctx context.Context, server, db string) (string, error) {
	admin, err := engine.OpenLive(ctx, server, engine.LiveOptions{Writable: true})
	if err != nil {
		return "", err
	}
	defer admin.Close()
	if err := admin.Exec(ctx, `DROP DATABASE IF EXISTS "`+db+`" WITH (FORCE)`); err != nil {
		return "", err
	}
	// Byte order for text, as DuckDB sorts, where the server has the
	// C.UTF-8 locale; its default otherwise.
	if err := admin.Exec(ctx, `CREATE DATABASE "`+db+`" ENCODING 'UTF8' TEMPLATE template0 LOCALE 'C.UTF-8'`); err != nil {
		if err := admin.Exec(ctx, `CREATE DATABASE "`+db+`" ENCODING 'UTF8' TEMPLATE template0`); err != nil {
			return "", err
		}
	}
	u, err := url.Parse(server)
	if err != nil {
		return "", err
	}
	u.Path = "/" + db
	return u.String(), nil
}

// freshMySQL drops and creates database db (the connection's default
// database) and the model's schemas, and returns the URL of db.
func freshMySQL(ctx context.Context, server, db string, schemas []string) (string, error) {
	admin, err := engine.OpenLive(ctx, server, engine.LiveOptions{Writable: true})
	if err != nil {
		return "", err
	}
	defer admin.Close()
	for _, s := range append([]string{db}, schemas...) {
		q := "`" + strings.ReplaceAll(s, "`", "``") + "`"
		if err := admin.Exec(ctx, "DROP DATABASE IF EXISTS "+q); err != nil {
			return "", err
		}
		if err := admin.Exec(ctx, "CREATE DATABASE "+q+" CHARACTER SET utf8mb4"); err != nil {
			return "", err
		}
	}
	u, err := url.Parse(server)
	if err != nil {
		return "", err
	}
	u.Path = "/" + db
	return u.String(), nil
}

// freshSQLite returns a new SQLite database, with a file attached for each
// schema, in a folder of the temp dir named after db and the process
// (emptied first, and kept after the test: the engine may serve later
// tests of the run). The folders that ended processes left are removed.
func freshSQLite(db string, schemas []string) (string, error) {
	removeStaleSQLite(db)
	dir := sqliteDir(db)
	if err := os.RemoveAll(dir); err != nil {
		return "", err
	}
	if err := os.MkdirAll(dir, 0o700); err != nil {
		return "", err
	}
	q := url.Values{"mode": {"rwc"}}
	for i, s := range schemas {
		q.Add("attach", fmt.Sprintf("%s=schema%d.db", s, i))
	}
	return "sqlite:" + filepath.Join(dir, "main.db") + "?" + q.Encode(), nil
}

// sqliteDir is the folder of SQLite database db of this process: test
// processes never share one, so SQLite needs no lock (holdServer).
func sqliteDir(db string) string {
	return filepath.Join(os.TempDir(), fmt.Sprintf("%s_%d_%d", db, os.Getuid(), os.Getpid()))
}

// removeStaleSQLite removes the folders of SQLite database db that
// processes which have ended left behind.
func removeStaleSQLite(db string) {
	prefix := filepath.Join(os.TempDir(), fmt.Sprintf("%s_%d_", db, os.Getuid()))
	dirs, _ := filepath.Glob(prefix + "*")
	for _, d := range dirs {
		pid, err := strconv.Atoi(strings.TrimPrefix(d, prefix))
		if err == nil && pid != os.Getpid() && !running(pid) {
			os.RemoveAll(d)
		}
	}
}
