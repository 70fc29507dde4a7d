package pipeline

import (
	"runtime/debug"
	"testing"
)

// TestLimitMemory: check's soft memory limit is set while it works and
// the one before is put back after; a limit set with GOMEMLIMIT is left
// as it is.
func TestLimitMemory(t *testing.T) {
	before := debug.SetMemoryLimit(-1)
	t.Setenv("GOMEMLIMIT", "")
	restore := LimitMemory()
	if got := debug.SetMemoryLimit(-1); got != CheckMemory {
		t.Errorf("the limit while checking is %d, want %d", got, CheckMemory)
	}
	restore()
	if got := debug.SetMemoryLimit(-1); got != before {
		t.Errorf("the limit after is %d, want %d as before", got, before)
	}
	t.Setenv("GOMEMLIMIT", "1GiB")
	restore = LimitMemory()
	if got := debug.SetMemoryLimit(-1); got != before {
		t.Errorf("with GOMEMLIMIT set, the limit is %d, want %d", got, before)
	}
	restore()
}
