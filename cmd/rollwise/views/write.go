package views

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"
)

// stagingPrefix starts the name of the folder, inside the --out folder,
// where Write prepares the new files. One left behind means a run was
// killed; the next run removes it and Check reports it.
const stagingPrefix = ".rollwise-views-"

// WriteReport says what Write did.
type WriteReport struct {
	// Written are the files written (new or changed), Unchanged those
	// that already held the right bytes, Removed the files of views the
	// model no longer has (listed in the folder's previous manifest).
	Written, Unchanged, Removed []string
	// Foreign are .sql files in the folder that rollwise did not write:
	// left alone, but Check reports them.
	Foreign []string
}

// fileSystem is what Write does to the disk, so that tests can make any
// step fail.
type fileSystem interface {
	Stat(name string) (fs.FileInfo, error)
	ReadFile(name string) ([]byte, error)
	ReadDir(name string) ([]os.DirEntry, error)
	MkdirAll(name string) error
	MkdirTemp(dir, pattern string) (string, error)
	// WriteFile creates a new file, writes data, flushes it to disk and
	// closes it.
	WriteFile(name string, data []byte) error
	Rename(from, to string) error
	// Remove removes a file or an empty folder.
	Remove(name string) error
	RemoveAll(name string) error
	// SyncDir flushes a folder's entries (the renames) to disk.
	SyncDir(name string) error
}

// Write puts the set's files in dir, which it creates if needed, so that
// dir is either left as it was or complete: every file is first written
// in full to a staging folder inside dir; then the files are moved into
// place, each by an atomic rename, with the files they replace moved
// aside; if any step fails, the moves are undone in reverse order. Files
// of views the model no longer has (listed in dir's previous manifest)
// are removed the same way. A killed run can leave dir with some files
// new and some old, but never a half-written file; the next run completes
// it, and Check reports it until then.
func Write(dir string, s *Set) (*WriteReport, error) {
	return write(osFS{}, dir, s)
}

func write(fsys fileSystem, dir string, s *Set) (*WriteReport, error) {
	files, err := s.Files()
	if err != nil {
		return nil, err
	}
	created := false
	if _, err := fsys.Stat(dir); errors.Is(err, fs.ErrNotExist) {
		if err := fsys.MkdirAll(dir); err != nil {
			return nil, err
		}
		created = true
	} else if err != nil {
		return nil, err
	}
	w := &writer{fsys: fsys, dir: dir, report: &WriteReport{}}
	if err := w.run(files); err != nil {
		if created {
			// dir did not exist: leave it so. Remove takes only an empty
			// folder, so nothing of anyone's can go.
			fsys.Remove(dir) //nolint:errcheck // best effort, see above
		}
		return nil, err
	}
	return w.report, nil
}

// writer is one run of Write.
type writer struct {
	fsys    fileSystem
	dir     string
	staging string
	report  *WriteReport
	// moves are the renames done so far, undone in reverse on failure.
	moves [][2]string
}

func (w *writer) path(name string) string { return filepath.Join(w.dir, name) }

func (w *writer) run(files []File) error {
	entries, err := w.fsys.ReadDir(w.dir)
	if err != nil {
		return err
	}
	// A staging folder left by a killed run holds nothing worth keeping:
	// the files it held are either in place or rewritten now.
	for _, e := range entries {
		if e.IsDir() && strings.HasPrefix(e.Name(), stagingPrefix) {
			if err := w.fsys.RemoveAll(w.path(e.Name())); err != nil {
				return err
			}
		}
	}
	stale := w.plan(files, entries)
	w.staging, err = w.fsys.MkdirTemp(w.dir, stagingPrefix+"*")
	if err != nil {
		return err
	}
	var todo []File
	for _, f := range files {
		old, err := w.fsys.ReadFile(w.path(f.Name))
		if err == nil && string(old) == string(f.Data) {
			w.report.Unchanged = append(w.report.Unchanged, f.Name)
			continue
		}
		if err := w.fsys.WriteFile(filepath.Join(w.staging, f.Name), f.Data); err != nil {
			return w.fail(fmt.Errorf("writing %s: %w", f.Name, err))
		}
		todo = append(todo, f)
	}
	// Commit: move aside what is replaced or removed, move in what is
	// new. The manifest comes last among files, so it changes last.
	for _, name := range stale {
		if err := w.move(w.path(name), filepath.Join(w.staging, name+".old")); err != nil {
			return w.fail(err)
		}
		w.report.Removed = append(w.report.Removed, name)
	}
	for _, f := range todo {
		if _, err := w.fsys.Stat(w.path(f.Name)); err == nil {
			if err := w.move(w.path(f.Name), filepath.Join(w.staging, f.Name+".old")); err != nil {
				return w.fail(err)
			}
		}
		if err := w.move(filepath.Join(w.staging, f.Name), w.path(f.Name)); err != nil {
			return w.fail(err)
		}
		w.report.Written = append(w.report.Written, f.Name)
	}
	if err := w.fsys.SyncDir(w.dir); err != nil {
		return w.fail(err)
	}
	// Everything is in place: the staging folder holds only the old
	// files now. Failing to remove it does not undo the change.
	if err := w.fsys.RemoveAll(w.staging); err != nil {
		return fmt.Errorf("the views are written, but the staging folder %s could not be removed: %w", w.staging, err)
	}
	return nil
}

// plan reads the folder's previous manifest and lists the files to
// remove (those it lists that are no longer generated) and the .sql files
// rollwise did not write.
func (w *writer) plan(files []File, entries []os.DirEntry) []string {
	want := map[string]bool{}
	for _, f := range files {
		want[f.Name] = true
	}
	ours := map[string]bool{}
	if b, err := w.fsys.ReadFile(w.path(ManifestFile)); err == nil {
		// An unreadable manifest lists nothing: nothing is removed.
		if m, err := readManifest(b); err == nil {
			for _, v := range m.Views {
				if v.File == filepath.Base(v.File) && v.File != ManifestFile {
					ours[v.File] = true
				}
			}
		}
	}
	var stale []string
	for _, e := range entries {
		name := e.Name()
		switch {
		case e.IsDir() || want[name]:
		case ours[name]:
			stale = append(stale, name)
		case strings.HasSuffix(name, ".sql"):
			w.report.Foreign = append(w.report.Foreign, name)
		}
	}
	sort.Strings(stale)
	return stale
}

// move renames a file and remembers it, to be undone on failure.
func (w *writer) move(from, to string) error {
	if err := w.fsys.Rename(from, to); err != nil {
		return err
	}
	w.moves = append(w.moves, [2]string{from, to})
	return nil
}

// fail undoes the moves done so far, newest first, and removes the
// staging folder. If an undo fails, the staging folder is kept, since it
// may hold the only copy of a previous file, and the error says where.
func (w *writer) fail(cause error) error {
	for i := len(w.moves) - 1; i >= 0; i-- {
		m := w.moves[i]
		if err := w.fsys.Rename(m[1], m[0]); err != nil {
			return fmt.Errorf("%w; then undoing it failed (%v): the previous files are in %s", cause, err, w.staging)
		}
	}
	w.moves = nil
	if err := w.fsys.RemoveAll(w.staging); err != nil {
		return fmt.Errorf("%w (the folder is as it was, apart from %s)", cause, w.staging)
	}
	return fmt.Errorf("%w (the folder is as it was)", cause)
}

// osFS is the real disk.
type osFS struct{}

func (osFS) Stat(name string) (fs.FileInfo, error)         { return os.Stat(name) }
func (osFS) ReadFile(name string) ([]byte, error)          { return os.ReadFile(name) }
func (osFS) ReadDir(name string) ([]os.DirEntry, error)    { return os.ReadDir(name) }
func (osFS) MkdirAll(name string) error                    { return os.MkdirAll(name, 0o755) }
func (osFS) MkdirTemp(dir, pattern string) (string, error) { return os.MkdirTemp(dir, pattern) }
func (osFS) Rename(from, to string) error                  { return os.Rename(from, to) }
func (osFS) Remove(name string) error                      { return os.Remove(name) }
func (osFS) RemoveAll(name string) error                   { return os.RemoveAll(name) }

func (osFS) WriteFile(name string, data []byte) error {
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

func (osFS) SyncDir(name string) error {
	d, err := os.Open(name)
	if err != nil {
		return err
	}
	defer d.Close()
	return d.Sync()
}
