//go:build unix

package livetest

import (
	"crypto/sha256"
	"encoding/hex"
	"os"
	"path/filepath"
	"sync"
	"syscall"
	"testing"
)

var (
	locksMu sync.Mutex
	locks   = map[string]*os.File{}
)

// holdServer takes, once per process, an exclusive lock named after the
// engine and its server, held until the process exits. Test databases have
// fixed names (and MySQL's schemas are databases of the server), so two
// test processes on one machine, two packages or two checkouts, must not
// load them on one server at the same time: the second waits. On
// PostgreSQL, where a model's schemas live inside its test database, a
// process with its own ROLLWISE_TEST_DB_PREFIX has databases of its own
// and takes a lock of its own. SQLite needs none: its databases are each
// process's own (sqliteDir).
//
// Whichever server is asked for first, a process takes the locks of every
// server set in its environment, in one order (PostgreSQL, then MySQL):
// its parallel tests ask in any order, and two processes that took the
// two locks in opposite orders would each wait for the other to exit.
func holdServer(t testing.TB, name, server string) {
	t.Helper()
	locksMu.Lock()
	defer locksMu.Unlock()
	for _, n := range []string{"postgres", "mysql"} {
		s := server
		if n != name {
			s = os.Getenv(map[string]string{"postgres": EnvPostgres, "mysql": EnvMySQL}[n])
		}
		if s != "" {
			lockOne(t, n, s)
		}
	}
}

// lockOne takes the lock of engine name on server, once per process
// (locksMu held).
func lockOne(t testing.TB, name, server string) {
	t.Helper()
	key := lockKey(name, server)
	if locks[key] != nil {
		return
	}
	sum := sha256.Sum256([]byte(key))
	path := filepath.Join(os.TempDir(), "rollwise-livetest-"+hex.EncodeToString(sum[:6])+".lock")
	f, err := os.OpenFile(path, os.O_CREATE|os.O_RDWR, 0o666)
	if err != nil {
		t.Fatalf("%s: locking the test server: %v", name, err)
	}
	if err := syscall.Flock(int(f.Fd()), syscall.LOCK_EX|syscall.LOCK_NB); err != nil {
		t.Logf("%s: another test process uses the test server; waiting for it to finish", name)
		if err := syscall.Flock(int(f.Fd()), syscall.LOCK_EX); err != nil {
			f.Close()
			t.Fatalf("%s: locking the test server: %v", name, err)
		}
	}
	locks[key] = f // held, open, until the process exits
}

// lockKey names the lock of engine name on server.
func lockKey(name, server string) string {
	key := name + " " + server
	if p := os.Getenv(EnvPrefix); p != "" && name == "postgres" {
		key += " " + dbPrefix()
	}
	return key
}

// running reports whether process pid is still running.
func running(pid int) bool {
	return syscall.Kill(pid, 0) != syscall.ESRCH
}
