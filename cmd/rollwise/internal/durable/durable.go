// Package durable writes files and folders so that they survive a crash:
// each write is flushed to disk before it counts as done.
package durable

import "os"

// WriteNew creates the file name (which must not exist), writes data,
// flushes it to disk and closes it.
func WriteNew(name string, data []byte) error {
	f, err := os.OpenFile(name, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
	if err != nil {
		return err
	}
	if _, err := f.Write(data); err != nil {
		f.Close()
		return err
	}
	if err := f.Sync(); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}

// SyncDir flushes a folder's entries (new names, renames) to disk.
func SyncDir(name string) error {
	d, err := os.Open(name)
	if err != nil {
		return err
	}
	defer d.Close()
	return d.Sync()
}
