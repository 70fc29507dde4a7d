//go:build unix

package livetest

import (
	"crypto/sha256"
	"encoding/hex"
	"os"
	"path/filepath"
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
