//go:build !unix

package views

import (
	"io"
	"os"
	"time"
)

// lockFile only creates the lock file where flock does not exist: two
// runs on one folder are not kept apart there (see the Safety section of
// docs/cli.md).
func lockFile(name string, _ time.Duration) (io.Closer, error) {
	return os.OpenFile(name, os.O_RDWR|os.O_CREATE, 0o644)
}
