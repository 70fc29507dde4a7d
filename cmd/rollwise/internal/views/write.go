package views

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"time"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/durable"
)

// The layout of an --out folder DIR: DIR is a relative symbolic link to
// .NAME.rollwise/v-XXXX next to it (NAME is DIR's own name), the folder
// that holds the complete set of files. A run writes the new set to a
// fresh v-XXXX folder and then switches DIR to it with one rename of a
// symbolic link, which is atomic: whenever a run stops, DIR shows either
// the old set or the new one, each complete with its manifest. The store
// folder .NAME.rollwise also holds the lock file that keeps two runs on
// one DIR apart.
const (
	storeSuffix   = ".rollwise"
	versionPrefix = "v-"
	linkPrefix    = "link-"
	// previousPrefix follows versionPrefix in the name of a real folder
	// moved into the store to make way for the link.
	previousPrefix = "previous-"
	lockName       = "lock"
	// legacyStaging starts the staging folders that earlier versions of
	// rollwise left inside DIR when killed; they are not carried over.
	legacyStaging = ".rollwise-views-"
)

// lockWait is how long Write waits for another run on the same folder.
var lockWait = 30 * time.Second

// ErrBusy is returned (wrapped) by Write when another run held the
// folder's lock for the whole wait.
var ErrBusy = errors.New("another `rollwise views --out` is writing this folder")

// WriteReport says what Write did.
type WriteReport struct {
	// Written are the files written (new or changed), Unchanged those
	// that already held the right bytes, Removed the files of views the
	// model no longer has (listed in the folder's previous manifest).
	Written, Unchanged, Removed []string
	// Foreign are .sql files in the folder that rollwise did not write:
	// carried over to the new set unchanged, but Check reports them.
	Foreign []string
}

// fileSystem is what Write does to the disk, so that tests can make any
// step fail.
type fileSystem interface {
	Stat(name string) (fs.FileInfo, error)
	Lstat(name string) (fs.FileInfo, error)
	ReadFile(name string) ([]byte, error)
	ReadDir(name string) ([]os.DirEntry, error)
	Readlink(name string) (string, error)
	MkdirAll(name string) error
	MkdirTemp(dir, pattern string) (string, error)
	// WriteFile creates a new file, writes data, flushes it to disk and
	// closes it.
	WriteFile(name string, data []byte) error
	Symlink(target, name string) error
	Rename(from, to string) error
	// Remove removes a file or an empty folder.
	Remove(name string) error
	RemoveAll(name string) error
	// SyncDir flushes a folder's entries (the renames) to disk.
	SyncDir(name string) error
	// Lock takes an exclusive lock on the file name (creating it),
	// waiting at most wait; closing the result releases it.
	Lock(name string, wait time.Duration) (io.Closer, error)
}

// Write puts the set's files in dir so that dir always shows a complete
// set: the one it showed before or the new one. The files are written in
// full to a new folder of the store next to dir, flushed, and dir (a
// symbolic link) is switched to that folder by one atomic rename; the
// previous folder is removed after. A second run on the same dir waits
// for the first (up to 30 seconds, then fails with ErrBusy).
//
// A dir that is a real folder (written by an earlier rollwise, or made by
// hand) is moved into the store once and replaced by the link; between
// those two renames dir does not exist.
func Write(dir string, s *Set) (*WriteReport, error) {
	return write(osFS{}, dir, s)
}

func write(fsys fileSystem, dir string, s *Set) (*WriteReport, error) {
	files, err := s.Files()
	if err != nil {
		return nil, err
	}
	abs, err := filepath.Abs(dir)
	if err != nil {
		return nil, err
	}
	parent, name := filepath.Split(abs)
	if name == "" {
		return nil, fmt.Errorf("--out %s: the views need a folder of their own, not the root", dir)
	}
	w := &writer{fsys: fsys, dir: abs, name: name, parent: parent,
		store: filepath.Join(parent, "."+name+storeSuffix), report: &WriteReport{}}
	if err := w.makeStore(); err != nil {
		w.removeCreated()
		return nil, err
	}
	lock, err := fsys.Lock(filepath.Join(w.store, lockName), lockWait)
	if err != nil {
		w.removeCreated()
		if errors.Is(err, ErrBusy) {
			return nil, fmt.Errorf("%s: %w; waited %s, try again when it is done", dir, err, lockWait)
		}
		return nil, err
	}
	defer lock.Close()
	if err := w.run(files); err != nil {
		if !w.switched {
			w.removeCreated()
		}
		return nil, err
	}
	return w.report, nil
}

// writer is one run of Write.
type writer struct {
	fsys                     fileSystem
	dir, name, parent, store string
	report                   *WriteReport
	// created are the folders this run made (the store, and parents of
	// dir), outermost first: removed again if the run fails before the
	// switch, so that a failed run leaves nothing behind.
	created []string
	// switched is set once dir shows the new files.
	switched bool
}

// makeStore makes dir's parent folders and the store, remembering which.
func (w *writer) makeStore() error {
	var missing []string
	for p := w.store; ; p = filepath.Dir(p) {
		if _, err := w.fsys.Stat(p); err == nil {
			break
		} else if !errors.Is(err, fs.ErrNotExist) || p == filepath.Dir(p) {
			return err
		}
		missing = append([]string{p}, missing...)
	}
	for _, p := range missing {
		if err := w.fsys.MkdirAll(p); err != nil {
			return err
		}
		w.created = append(w.created, p)
	}
	return nil
}

// removeCreated removes, innermost first, the folders the run made; the
// store loses its lock file first. Remove takes only an empty folder, so
// nothing of anyone's can go.
func (w *writer) removeCreated() {
	for i := len(w.created) - 1; i >= 0; i-- {
		if w.created[i] == w.store {
			w.fsys.Remove(filepath.Join(w.store, lockName)) //nolint:errcheck // best effort, see above
		}
		w.fsys.Remove(w.created[i]) //nolint:errcheck // best effort, see above
	}
}

// current returns the folder whose files dir shows now ("" when dir does
// not exist) and whether dir is a real folder rather than our link.
func (w *writer) current() (cur string, real bool, err error) {
	info, err := w.fsys.Lstat(w.dir)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		// A run killed while replacing a real folder left it here.
		prev, err := filepath.Glob(filepath.Join(w.store, versionPrefix+previousPrefix+"*"))
		if err != nil || len(prev) == 0 {
			return "", false, err
		}
		return prev[0], false, nil
	case err != nil:
		return "", false, err
	case info.IsDir():
		return w.dir, true, nil
	case info.Mode()&fs.ModeSymlink == 0:
		return "", false, fmt.Errorf("%s is a file, not a folder: give --out a folder", w.dir)
	}
	target, err := w.fsys.Readlink(w.dir)
	if err != nil {
		return "", false, err
	}
	version, ok := strings.CutPrefix(filepath.ToSlash(target), "."+w.name+storeSuffix+"/")
	if !ok || !strings.HasPrefix(version, versionPrefix) || strings.Contains(version, "/") {
		return "", false, fmt.Errorf("%s is a symbolic link to %s, which rollwise did not make; give --out a folder (or remove the link)", w.dir, target)
	}
	return filepath.Join(w.store, version), false, nil
}

func (w *writer) run(files []File) error {
	cur, real, err := w.current()
	if err != nil {
		return err
	}
	if err := w.removeLeftovers(cur); err != nil {
		return err
	}
	next, err := w.fsys.MkdirTemp(w.store, versionPrefix+"*")
	if err != nil {
		return err
	}
	if err := w.fill(next, cur, files); err != nil {
		w.fsys.RemoveAll(next) //nolint:errcheck // best effort: the next run removes it too
		return fmt.Errorf("%w (the folder is as it was)", err)
	}
	if err := w.switchTo(next, cur, real); err != nil {
		w.fsys.RemoveAll(next) //nolint:errcheck // best effort: the next run removes it too
		return fmt.Errorf("%w (the folder is as it was)", err)
	}
	w.switched = true
	if err := w.fsys.SyncDir(w.parent); err != nil {
		return fmt.Errorf("the views are written, but flushing %s to disk failed: %w", w.parent, err)
	}
	if real {
		cur = filepath.Join(w.store, versionPrefix+previousPrefix+filepath.Base(next))
	}
	// dir shows the new files: failing to remove the old ones does not
	// undo the change (and the next run removes them).
	if cur != "" {
		if err := w.fsys.RemoveAll(cur); err != nil {
			return fmt.Errorf("the views are written, but the previous files in %s could not be removed: %w", cur, err)
		}
	}
	return nil
}

// removeLeftovers removes what killed runs left in the store: versions
// other than the current one, and links never renamed into place.
func (w *writer) removeLeftovers(cur string) error {
	entries, err := w.fsys.ReadDir(w.store)
	if err != nil {
		return err
	}
	for _, e := range entries {
		p := filepath.Join(w.store, e.Name())
		if (strings.HasPrefix(e.Name(), versionPrefix) && p != cur) || strings.HasPrefix(e.Name(), linkPrefix) {
			if err := w.fsys.RemoveAll(p); err != nil {
				return err
			}
		}
	}
	return nil
}

// fill writes the set's files to folder next, with the files of cur that
// rollwise did not write carried over, and flushes it.
func (w *writer) fill(next, cur string, files []File) error {
	var entries []os.DirEntry
	if cur != "" {
		var err error
		if entries, err = w.fsys.ReadDir(cur); err != nil {
			return err
		}
	}
	carry := w.plan(cur, files, entries)
	for _, f := range files {
		if old, err := w.fsys.ReadFile(filepath.Join(cur, f.Name)); cur != "" && err == nil && string(old) == string(f.Data) {
			w.report.Unchanged = append(w.report.Unchanged, f.Name)
		} else {
			w.report.Written = append(w.report.Written, f.Name)
		}
		if err := w.fsys.WriteFile(filepath.Join(next, f.Name), f.Data); err != nil {
			return fmt.Errorf("writing %s: %w", f.Name, err)
		}
	}
	for _, name := range carry {
		if err := w.copyTree(filepath.Join(cur, name), filepath.Join(next, name)); err != nil {
			return fmt.Errorf("carrying over %s: %w", name, err)
		}
	}
	return w.fsys.SyncDir(next)
}

// plan reads cur's manifest, reports the files of views the model no
// longer has (which are not carried over) and the .sql files rollwise
// did not write, and returns the entries to carry over: everything that
// is neither generated now nor listed by the manifest.
func (w *writer) plan(cur string, files []File, entries []os.DirEntry) []string {
	want := map[string]bool{}
	for _, f := range files {
		want[f.Name] = true
	}
	ours := map[string]bool{}
	if b, err := w.fsys.ReadFile(filepath.Join(cur, ManifestFile)); cur != "" && err == nil {
		// An unreadable manifest lists nothing: everything is carried over.
		if m, err := readManifest(b); err == nil {
			for _, v := range m.Views {
				ours[v.File] = true
			}
		}
	}
	var carry []string
	for _, e := range entries {
		name := e.Name()
		switch {
		case want[name] || (e.IsDir() && strings.HasPrefix(name, legacyStaging)):
		case ours[name]:
			w.report.Removed = append(w.report.Removed, name)
		default:
			if !e.IsDir() && strings.HasSuffix(name, ".sql") {
				w.report.Foreign = append(w.report.Foreign, name)
			}
			carry = append(carry, name)
		}
	}
	sort.Strings(w.report.Removed)
	return carry
}

// copyTree copies a file, a folder or a symbolic link (as a link).
func (w *writer) copyTree(from, to string) error {
	info, err := w.fsys.Lstat(from)
	switch {
	case err != nil:
		return err
	case info.Mode()&fs.ModeSymlink != 0:
		target, err := w.fsys.Readlink(from)
		if err != nil {
			return err
		}
		return w.fsys.Symlink(target, to)
	case info.IsDir():
		if err := w.fsys.MkdirAll(to); err != nil {
			return err
		}
		entries, err := w.fsys.ReadDir(from)
		if err != nil {
			return err
		}
		for _, e := range entries {
			if err := w.copyTree(filepath.Join(from, e.Name()), filepath.Join(to, e.Name())); err != nil {
				return err
			}
		}
		return nil
	}
	b, err := w.fsys.ReadFile(from)
	if err != nil {
		return err
	}
	return w.fsys.WriteFile(to, b)
}

// switchTo points dir at folder next with one rename of a new symbolic
// link over it. A real folder at dir is first moved into the store (and
// moved back if the link cannot be put in place).
func (w *writer) switchTo(next, cur string, real bool) error {
	link := filepath.Join(w.store, linkPrefix+filepath.Base(next))
	if err := w.fsys.Symlink("."+w.name+storeSuffix+"/"+filepath.Base(next), link); err != nil {
		return err
	}
	if real {
		aside := filepath.Join(w.store, versionPrefix+previousPrefix+filepath.Base(next))
		if err := w.fsys.Rename(cur, aside); err != nil {
			w.fsys.Remove(link) //nolint:errcheck // best effort: the next run removes it too
			return err
		}
		if err := w.fsys.Rename(link, w.dir); err != nil {
			if undo := w.fsys.Rename(aside, cur); undo != nil {
				return fmt.Errorf("%w; then moving the previous folder back failed (%v): it is %s", err, undo, aside)
			}
			w.fsys.Remove(link) //nolint:errcheck // best effort: the next run removes it too
			return err
		}
	} else if err := w.fsys.Rename(link, w.dir); err != nil {
		w.fsys.Remove(link) //nolint:errcheck // best effort: the next run removes it too
		return err
	}
	return nil
}

// osFS is the real disk.
type osFS struct{}

func (osFS) Stat(name string) (fs.FileInfo, error)         { return os.Stat(name) }
func (osFS) Lstat(name string) (fs.FileInfo, error)        { return os.Lstat(name) }
func (osFS) ReadFile(name string) ([]byte, error)          { return os.ReadFile(name) }
func (osFS) ReadDir(name string) ([]os.DirEntry, error)    { return os.ReadDir(name) }
func (osFS) Readlink(name string) (string, error)          { return os.Readlink(name) }
func (osFS) MkdirAll(name string) error                    { return os.MkdirAll(name, 0o755) }
func (osFS) MkdirTemp(dir, pattern string) (string, error) { return os.MkdirTemp(dir, pattern) }
func (osFS) Symlink(target, name string) error             { return os.Symlink(target, name) }
func (osFS) Rename(from, to string) error                  { return os.Rename(from, to) }
func (osFS) Remove(name string) error                      { return os.Remove(name) }
func (osFS) RemoveAll(name string) error                   { return os.RemoveAll(name) }

func (osFS) Lock(name string, wait time.Duration) (io.Closer, error) { return lockFile(name, wait) }

func (osFS) WriteFile(name string, data []byte) error { return durable.WriteNew(name, data) }
func (osFS) SyncDir(name string) error                { return durable.SyncDir(name) }
