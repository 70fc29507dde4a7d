//go:build unix

package views

import (
	"errors"
	"io"
	"os"
	"syscall"
	"time"
)

// lockFile takes an exclusive flock on the file name, created if needed,
// trying every 50 ms for at most wait; the lock is released when the
// returned file is closed, or when the process ends however it ends.
func lockFile(name string, wait time.Duration) (io.Closer, error) {
	f, err := os.OpenFile(name, os.O_RDWR|os.O_CREATE, 0o644)
	if err != nil {
		return nil, err
	}
	deadline := time.Now().Add(wait)
	for {
		err := syscall.Flock(int(f.Fd()), syscall.LOCK_EX|syscall.LOCK_NB)
		switch {
		case err == nil:
			return f, nil
		case !errors.Is(err, syscall.EWOULDBLOCK):
			f.Close()
			return nil, err
		case time.Now().After(deadline):
			f.Close()
			return nil, ErrBusy
		}
		time.Sleep(50 * time.Millisecond)
	}
}
