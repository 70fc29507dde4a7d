//go:build unix

package livetest

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"syscall"
	"testing"
)

// TestHoldServerKeepsOthersOut: once a process holds a server, another
// open of the lock (as a second test process would make) cannot take it,
// while the holder may ask again without waiting.
func TestHoldServerKeepsOthersOut(t *testing.T) {
	server := "postgres://example.invalid:1/" + t.Name()
	holdServer(t, "postgres", server)
	holdServer(t, "postgres", server) // again: no deadlock
	sum := sha256.Sum256([]byte(lockKey("postgres", server)))
	f, err := os.Open(filepath.Join(os.TempDir(), "rollwise-livetest-"+hex.EncodeToString(sum[:6])+".lock"))
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	if err := syscall.Flock(int(f.Fd()), syscall.LOCK_EX|syscall.LOCK_NB); err == nil {
		t.Error("a second holder took the lock of a held server")
	}
}

// TestSQLiteFoldersAreThisProcesss: SQLite's databases (which take no
// lock) sit in a folder of this process's own, and creating one removes
// the folders that ended processes left, never a running process's.
func TestSQLiteFoldersAreThisProcesss(t *testing.T) {
	db := "rollwise_test_stale_" + strconv.Itoa(os.Getpid())
	ended := exec.Command("true")
	if err := ended.Run(); err != nil {
		t.Skip(err)
	}
	prefix := filepath.Join(os.TempDir(), fmt.Sprintf("%s_%d_", db, os.Getuid()))
	left, alive := prefix+strconv.Itoa(ended.Process.Pid), prefix+strconv.Itoa(os.Getppid())
	for _, d := range []string{left, alive} {
		if err := os.MkdirAll(d, 0o700); err != nil {
			t.Fatal(err)
		}
	}
	t.Cleanup(func() { os.RemoveAll(alive); os.RemoveAll(sqliteDir(db)) })
	dsn, err := freshSQLite(db, nil)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(dsn, sqliteDir(db)) || !strings.HasSuffix(sqliteDir(db), "_"+strconv.Itoa(os.Getpid())) {
		t.Errorf("dsn %s is not in this process's folder", dsn)
	}
	if _, err := os.Stat(left); err == nil {
		t.Errorf("%s, left by an ended process, is still there", left)
	}
	if _, err := os.Stat(alive); err != nil {
		t.Errorf("%s, a running process's, was removed: %v", alive, err)
	}
}
