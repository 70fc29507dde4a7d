// Package durable writes files and folders so that they survive a crash:
// each write is flushed to disk before it counts as done.
package durable

import (
	"os"
	"path/filepath"
)

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

// Replace puts data in the file name, atomically: it writes a new file
// in the same folder, flushes it to disk, renames it over name and
// flushes the folder, so that a reader (or a crash) sees the old text or
// the new, never a part of either. The file keeps its permissions; a
// symbolic link keeps pointing at the file it names, which is replaced.
func Replace(name string, data []byte) (err error) {
	if target, err := filepath.EvalSymlinks(name); err == nil {
		name = target
	}
	fi, err := os.Stat(name)
	if err != nil {
		return err
	}
	dir := filepath.Dir(name)
	f, err := os.CreateTemp(dir, "."+filepath.Base(name)+".*.tmp")
	if err != nil {
		return err
	}
	defer func() {
		if err != nil {
			f.Close()
			os.Remove(f.Name())
		}
	}()
	if _, err := f.Write(data); err != nil {
		return err
	}
	if err := f.Chmod(fi.Mode().Perm()); err != nil {
		return err
	}
	if err := f.Sync(); err != nil {
		return err
	}
	if err := f.Close(); err != nil {
		return err
	}
	if err := os.Rename(f.Name(), name); err != nil {
		return err
	}
	return SyncDir(dir)
}
