package engine

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
)

// A statement past the session's timeout fails with a message that names
// the timeout, and no longer runs on the server afterwards (issue 17,
// item 8): PostgreSQL gets a cancel request (and has statement_timeout),
// MySQL/MariaDB a KILL QUERY from a second connection (and
// max_statement_time / max_execution_time), SQLite an interrupt.
func TestStatementTimeoutOnServer(t *testing.T) {
	sleep := map[string]string{
		"postgres": "SELECT pg_sleep(30), %s",
		"mysql":    "SELECT SLEEP(30), %s",
		"sqlite":   "WITH RECURSIVE n(i) AS (SELECT 1 UNION ALL SELECT i + 1 FROM n) SELECT max(i), %s FROM n",
	}
	for _, name := range []string{"sqlite", "postgres", "mysql"} {
		t.Run(name, func(t *testing.T) {
			dsn := "sqlite:" + filepath.Join(t.TempDir(), "x.db") + "?mode=rwc"
			if name != "sqlite" {
				rw := liveEngine(t, name) // skips without a server
				rw.Close()
				dsn = os.Getenv(map[string]string{"postgres": "ROLLWISE_TEST_POSTGRES", "mysql": "ROLLWISE_TEST_MYSQL"}[name])
			} else if l, err := OpenLive(context.Background(), dsn, LiveOptions{Writable: true}); err == nil {
				l.Close() // creates the file
			}
			l, err := OpenLive(context.Background(), dsn, LiveOptions{StatementTimeout: time.Second})
			if err != nil {
				t.Fatal(err)
			}
			defer l.Close()
			tag := fmt.Sprintf("'livesafe_timeout_%d'", time.Now().UnixNano())
			start := time.Now()
			_, err = l.Query(context.Background(), fmt.Sprintf(sleep[name], tag), nil)
			took := time.Since(start)
			if err == nil || !strings.Contains(err.Error(), "ran past the timeout of 1s (--timeout) and was cancelled on the server") || took > 10*time.Second {
				t.Fatalf("after %v: %v", took, err)
			}
			if name == "sqlite" {
				return
			}
			watch, err := OpenLive(context.Background(), dsn, LiveOptions{})
			if err != nil {
				t.Fatal(err)
			}
			defer watch.Close()
			q := "SELECT count(*) FROM pg_stat_activity WHERE state = 'active' AND pid <> pg_backend_pid() AND strpos(query, " + tag + ") > 0"
			if name == "mysql" {
				q = "SELECT count(*) FROM information_schema.processlist WHERE id <> CONNECTION_ID() AND command = 'Query' AND INSTR(info, " + tag + ") > 0"
			}
			running := ""
			for deadline := time.Now().Add(5 * time.Second); time.Now().Before(deadline); time.Sleep(100 * time.Millisecond) {
				res, err := watch.Query(context.Background(), q, nil)
				if err != nil {
					t.Fatal(err)
				}
				if running = fmt.Sprint(res.Rows[0][0]); running == "0" {
					return
				}
			}
			t.Errorf("%s statements still run on the server 5 s after the timeout", running)
		})
	}
}

// Without a timeout given, a session has the defaults; a negative one
// means no bound.
func TestLiveOptionsDefaults(t *testing.T) {
	var o LiveOptions
	if o.connectTimeout() != DefaultConnectTimeout || o.statementTimeout() != DefaultStatementTimeout {
		t.Errorf("defaults: %v %v", o.connectTimeout(), o.statementTimeout())
	}
	if (LiveOptions{StatementTimeout: -1}).statementTimeout() != 0 {
		t.Error("a negative statement timeout is no bound")
	}
}
