package main

import (
	"bytes"
	"context"
	"fmt"
	"net"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/livetest"
	"github.com/rollwise/rollwise/planner/model"
)

// silentServer accepts connections and never answers, as a hung or
// frozen database server does (issue 17, item 8). It returns its address.
func silentServer(t *testing.T) string {
	t.Helper()
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	var mu sync.Mutex
	var held []net.Conn
	go func() {
		for {
			c, err := ln.Accept()
			if err != nil {
				return
			}
			mu.Lock()
			held = append(held, c)
			mu.Unlock()
		}
	}()
	t.Cleanup(func() {
		ln.Close()
		mu.Lock()
		defer mu.Unlock()
		for _, c := range held {
			c.Close()
		}
	})
	return ln.Addr().String()
}

// mainWithin runs the command line and fails the test if it has not
// returned within limit (instead of hanging the test run).
func mainWithin(t *testing.T, limit time.Duration, args ...string) (int, string) {
	t.Helper()
	type result struct {
		code int
		msg  string
	}
	done := make(chan result, 1)
	go func() {
		var out, errb bytes.Buffer
		code := Main(args, strings.NewReader(""), &out, &errb)
		done <- result{code, out.String() + errb.String()}
	}()
	select {
	case r := <-done:
		return r.code, r.msg
	case <-time.After(limit):
		t.Fatalf("%v still runs after %v", args, limit)
	}
	return 0, ""
}

// A server that accepts and never answers: run, verify and check give up
// after --connect-timeout and say so, for PostgreSQL and MySQL URLs.
func TestLiveConnectTimeout(t *testing.T) {
	t.Parallel()
	addr := silentServer(t)
	for _, scheme := range []string{"postgres", "mysql"} {
		dsn := scheme + "://u:p@" + addr + "/db"
		for _, args := range [][]string{
			{"run", shopModel, "-m", "revenue", "-b", "stores.region"},
			{"verify", shopModel, "--sql", "../../testdata/verify/right_grand.sql", "-m", "revenue", "-b", "sales.item", "--totals", "grand"},
			{"check", writeRequiredShop(t, true)},
		} {
			start := time.Now()
			code, msg := mainWithin(t, 20*time.Second, append(args, "--dsn", dsn, "--connect-timeout", "300ms")...)
			if code != exitFindings || !strings.Contains(msg, "no answer within 300ms (--connect-timeout)") {
				t.Errorf("%s %s: exit %d after %v, want %d and a message that names the timeout:\n%s", args[0], scheme, code, time.Since(start), exitFindings, msg)
			}
		}
	}
}

// shopForLive loads the shop model for a live test database of its own.
func shopForLive(t *testing.T) *model.Model {
	t.Helper()
	m, err := loadModel(&env{stdout: &bytes.Buffer{}, stderr: &bytes.Buffer{}}, []string{shopModel})
	if err != nil {
		t.Fatal(err)
	}
	return m.Model
}

// serverRuns lists the statements of other sessions that hold tag and
// still run on the server, waiting up to 5 s for them to stop ("" for
// SQLite, which runs in this process).
func serverRuns(t *testing.T, e *livetest.Engine, tag string) string {
	t.Helper()
	var q string
	switch e.Name {
	case "postgres":
		q = "SELECT query FROM pg_stat_activity WHERE state = 'active' AND pid <> pg_backend_pid() AND strpos(query, " + tag + ") > 0"
	case "mysql":
		q = "SELECT info FROM information_schema.processlist WHERE id <> CONNECTION_ID() AND command = 'Query' AND INSTR(info, " + tag + ") > 0"
	default:
		return ""
	}
	var last string
	for deadline := time.Now().Add(5 * time.Second); time.Now().Before(deadline); time.Sleep(100 * time.Millisecond) {
		res, err := e.Live.Query(context.Background(), q, nil)
		if err != nil {
			t.Fatal(err)
		}
		if len(res.Rows) == 0 {
			return ""
		}
		last = fmt.Sprint(res.Rows)
	}
	return last
}

// An interrupt (SIGINT) stops the command at once and cancels its
// statement on the server. The command runs in a child process (this
// test binary, running TestInterruptChild), so that the signal reaches
// only it.
func TestLiveInterruptCancelsOnServer(t *testing.T) {
	t.Parallel()
	m := shopForLive(t)
	// PostgreSQL only: MySQL's test schemas are shared by every test
	// process on the server; engine.TestStatementTimeoutOnServer stops a
	// MySQL/MariaDB statement the same way (KILL QUERY).
	for _, name := range []string{"postgres"} {
		t.Run(name, func(t *testing.T) {
			e := livetest.Open(t, name, "interrupt", m, "")
			defer e.Close()
			tag := fmt.Sprintf("'livesafe_interrupt_%d'", time.Now().UnixNano())
			sleep := map[string]string{"postgres": "SELECT pg_sleep(60) AS slept, %s AS revenue", "mysql": "SELECT SLEEP(60) AS slept, %s AS revenue"}[name]
			path := filepath.Join(t.TempDir(), "slow.sql")
			if err := os.WriteFile(path, []byte(fmt.Sprintf(sleep, tag)), 0o644); err != nil {
				t.Fatal(err)
			}
			cmd := exec.Command(os.Args[0], "-test.run=^TestInterruptChild$")
			cmd.Env = append(os.Environ(), "ROLLWISE_INTERRUPT_CHILD="+strings.Join([]string{"verify", shopModel, "--dsn", e.DSN, "--sql", path, "-m", "revenue"}, "\x1f"))
			var out bytes.Buffer
			cmd.Stdout, cmd.Stderr = &out, &out
			if err := cmd.Start(); err != nil {
				t.Fatal(err)
			}
			// Wait for the statement to run on the server.
			started := false
			for deadline := time.Now().Add(15 * time.Second); !started && time.Now().Before(deadline); time.Sleep(100 * time.Millisecond) {
				started = serverRunsNow(t, e, tag)
			}
			if !started {
				cmd.Process.Kill()
				t.Fatalf("the statement never ran on the server:\n%s", out.String())
			}
			start := time.Now()
			cmd.Process.Signal(syscall.SIGINT)
			done := make(chan error, 1)
			go func() { done <- cmd.Wait() }()
			select {
			case <-done:
			case <-time.After(10 * time.Second):
				cmd.Process.Kill()
				t.Fatalf("still running 10 s after SIGINT:\n%s", out.String())
			}
			if !strings.Contains(out.String(), "interrupted: the statement was cancelled on the server") {
				t.Errorf("after %v the output does not say it was interrupted:\n%s", time.Since(start), out.String())
			}
			if running := serverRuns(t, e, tag); running != "" {
				t.Errorf("the server still runs the statement: %s", running)
			}
		})
	}
}

// serverRunsNow reports whether a statement holding tag runs now.
func serverRunsNow(t *testing.T, e *livetest.Engine, tag string) bool {
	q := map[string]string{
		"postgres": "SELECT count(*) FROM pg_stat_activity WHERE state = 'active' AND pid <> pg_backend_pid() AND strpos(query, " + tag + ") > 0",
		"mysql":    "SELECT count(*) FROM information_schema.processlist WHERE id <> CONNECTION_ID() AND command = 'Query' AND INSTR(info, " + tag + ") > 0",
	}[e.Name]
	res, err := e.Live.Query(context.Background(), q, nil)
	if err != nil {
		t.Fatal(err)
	}
	return fmt.Sprint(res.Rows[0][0]) != "0"
}

// TestInterruptChild is the child process of
// TestLiveInterruptCancelsOnServer: it runs the command line it is given
// and exits with its status. Without the variable it does nothing.
func TestInterruptChild(t *testing.T) {
	args := os.Getenv("ROLLWISE_INTERRUPT_CHILD")
	if args == "" {
		return
	}
	os.Exit(Main(strings.Split(args, "\x1f"), strings.NewReader(""), os.Stdout, os.Stderr))
}
