//go:build unix

package livetest

import (
	"fmt"
	"os"
	"testing"
)

// TestLocksInOneOrder: asking for the MySQL server's lock takes the
// PostgreSQL server's too (first), so that no two test processes hold one
// each while waiting for the other's.
func TestLocksInOneOrder(t *testing.T) {
	pg := fmt.Sprintf("postgres://lock-order-test-%d/none", os.Getpid())
	my := fmt.Sprintf("mysql://lock-order-test-%d/none", os.Getpid())
	t.Setenv(EnvPostgres, pg)
	t.Setenv(EnvMySQL, my)
	t.Setenv(EnvPrefix, "")
	holdServer(t, "mysql", my)
	locksMu.Lock()
	defer locksMu.Unlock()
	for _, key := range []string{lockKey("postgres", pg), lockKey("mysql", my)} {
		if locks[key] == nil {
			t.Errorf("no lock held for %q", key)
		}
	}
}
