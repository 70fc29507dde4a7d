package views

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
	"time"
)

// Two versions of the shop's views: v2 changes a measure (one file
// changes), drops a view block (one file goes) and adds one (one file
// comes); the other files stay as they are.
func twoVersions(t *testing.T) (v1, v2 *Set) {
	t.Helper()
	src := shopSource(t)
	v1 = generate(t, src, Options{})
	changed := strings.Replace(src, "measure margin_rate  = (revenue - cost) / revenue", "measure margin_rate  = (revenue - cost) / cost", 1)
	changed = strings.Replace(changed, "view by_item = revenue, items, avg_price, mid_line\n  by sales.item\n", "view by_store = fees by stores.id\n", 1)
	if changed == src || !strings.Contains(changed, "by_store") {
		t.Fatal("the shop model changed; update twoVersions")
	}
	return v1, generate(t, changed, Options{})
}

// snapshot reads a folder tree: every file's content and every folder
// (with a trailing slash); nil if the folder does not exist.
func snapshot(t *testing.T, dir string) map[string]string {
	t.Helper()
	if _, err := os.Stat(dir); errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	dir, err := filepath.EvalSymlinks(dir) // the --out link, followed
	if err != nil {
		t.Fatal(err)
	}
	out := map[string]string{}
	err = filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(dir, p)
		if d.IsDir() {
			out[rel+"/"] = ""
			return nil
		}
		b, err := os.ReadFile(p)
		out[rel] = string(b)
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

// complete is the snapshot of a folder holding exactly the set's files.
func complete(t *testing.T, s *Set) map[string]string {
	t.Helper()
	files, err := s.Files()
	if err != nil {
		t.Fatal(err)
	}
	out := map[string]string{"./": ""}
	for _, f := range files {
		out[f.Name] = string(f.Data)
	}
	return out
}

func sameTree(a, b map[string]string) bool {
	if (a == nil) != (b == nil) || len(a) != len(b) {
		return false
	}
	for k, v := range a {
		if w, ok := b[k]; !ok || w != v {
			return false
		}
	}
	return true
}

func treeNames(m map[string]string) string {
	var out []string
	for k := range m {
		out = append(out, k)
	}
	sort.Strings(out)
	return strings.Join(out, " ")
}

// faulty is the disk with one step made to fail: the n-th step that
// changes something. Steps after it succeed, as the undoing must.
type faulty struct {
	osFS
	n, step int
}

var errInjected = errors.New("injected failure")

func (f *faulty) fail() error {
	f.step++
	if f.step == f.n {
		return errInjected
	}
	return nil
}

func (f *faulty) MkdirAll(name string) error {
	if err := f.fail(); err != nil {
		return err
	}
	return f.osFS.MkdirAll(name)
}

func (f *faulty) MkdirTemp(dir, pattern string) (string, error) {
	if err := f.fail(); err != nil {
		return "", err
	}
	return f.osFS.MkdirTemp(dir, pattern)
}

// WriteFile fails half-way: half the bytes are on disk when it fails, as
// when the disk fills up.
func (f *faulty) WriteFile(name string, data []byte) error {
	if err := f.fail(); err != nil {
		f.osFS.WriteFile(name, data[:len(data)/2]) //nolint:errcheck // the failure is the point
		return err
	}
	return f.osFS.WriteFile(name, data)
}

func (f *faulty) Rename(from, to string) error {
	if err := f.fail(); err != nil {
		return err
	}
	return f.osFS.Rename(from, to)
}

func (f *faulty) Symlink(target, name string) error {
	if err := f.fail(); err != nil {
		return err
	}
	return f.osFS.Symlink(target, name)
}

func (f *faulty) SyncDir(name string) error {
	if err := f.fail(); err != nil {
		return err
	}
	return f.osFS.SyncDir(name)
}

// storeNames lists the store next to dir.
func storeNames(t *testing.T, dir string) []string {
	t.Helper()
	entries, _ := os.ReadDir(filepath.Join(filepath.Dir(dir), "."+filepath.Base(dir)+storeSuffix))
	var out []string
	for _, e := range entries {
		out = append(out, e.Name())
	}
	return out
}

// startAs prepares dir for a test that starts "fresh" (nothing there),
// from a "link" to set s, or from a "legacy" real folder holding s.
func startAs(t *testing.T, start, dir string, s *Set) {
	t.Helper()
	switch start {
	case "link":
		if _, err := Write(dir, s); err != nil {
			t.Fatal(err)
		}
	case "legacy":
		legacyFolder(t, dir, s)
	}
}

// legacyFolder writes set s into dir as a real folder, the way an earlier
// rollwise did.
func legacyFolder(t *testing.T, dir string, s *Set) {
	t.Helper()
	files, _ := s.Files()
	if err := os.MkdirAll(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	for _, f := range files {
		if err := os.WriteFile(filepath.Join(dir, f.Name), f.Data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

// Whichever step fails, the folder is as it was and the store holds no
// leftovers; a fresh run that fails leaves nothing at all. Once no step
// fails, the folder is complete and the store holds the lock and the one
// version dir shows.
func TestWriteIsAllOrNothing(t *testing.T) {
	v1, v2 := twoVersions(t)
	for _, start := range []string{"fresh", "link", "legacy"} {
		failures := 0
		for n := 1; ; n++ {
			parent := t.TempDir()
			dir := filepath.Join(parent, "out", "views")
			startAs(t, start, dir, v1)
			before, beforeStore := snapshot(t, dir), storeNames(t, dir)
			_, err := write(&faulty{n: n}, dir, v2)
			after := snapshot(t, dir)
			if err != nil && strings.Contains(err.Error(), "the views are written") {
				// The flush after the switch: the new set is in place.
				if !errors.Is(err, errInjected) || !sameTree(after, complete(t, v2)) {
					t.Errorf("%s step %d: %v, and the folder holds %s", start, n, err, treeNames(after))
				}
				continue
			}
			if err == nil {
				if !sameTree(after, complete(t, v2)) {
					t.Errorf("%s: after success the folder holds %s", start, treeNames(after))
				}
				if st := storeNames(t, dir); len(st) != 2 || st[0] != lockName || !strings.HasPrefix(st[1], versionPrefix) {
					t.Errorf("%s: after success the store holds %v", start, st)
				}
				break
			}
			failures++
			if !errors.Is(err, errInjected) {
				t.Fatalf("%s step %d: unexpected error %v", start, n, err)
			}
			if !sameTree(before, after) {
				t.Errorf("%s: failing step %d changed the folder:\nbefore %s\nafter  %s", start, n, treeNames(before), treeNames(after))
			}
			if st := storeNames(t, dir); strings.Join(st, " ") != strings.Join(beforeStore, " ") && !(start == "legacy" && len(st) == 1 && st[0] == lockName) {
				t.Errorf("%s: failing step %d left %v in the store (before: %v)", start, n, st, beforeStore)
			}
			if start == "fresh" {
				if left, _ := os.ReadDir(parent); len(left) != 0 {
					t.Errorf("fresh: failing step %d left %v", n, left)
				}
			}
			if n > 100 {
				t.Fatal("Write never succeeds")
			}
		}
		// The steps that can fail before the switch: making the folders
		// (fresh: out and the store), the version folder, each of the 8
		// files, the flush, the link, the rename over dir (legacy: two
		// renames).
		if want := map[string]int{"fresh": 14, "link": 12, "legacy": 14}[start]; failures != want {
			t.Errorf("%s: %d steps were made to fail, want %d", start, failures, want)
		}
	}
}

// Write reports what it did and carries over the files it did not write.
func TestWriteReport(t *testing.T) {
	v1, v2 := twoVersions(t)
	dir := filepath.Join(t.TempDir(), "views")
	if _, err := Write(dir, v1); err != nil {
		t.Fatal(err)
	}
	for name, data := range map[string]string{"notes.sql": "-- mine\n", "docs/README": "read me\n"} {
		os.MkdirAll(filepath.Dir(filepath.Join(dir, name)), 0o755) //nolint:errcheck // checked by WriteFile
		if err := os.WriteFile(filepath.Join(dir, name), []byte(data), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	rep, err := Write(dir, v2)
	if err != nil {
		t.Fatal(err)
	}
	got := strings.Join([]string{strings.Join(rep.Written, ","), strings.Join(rep.Removed, ","), strings.Join(rep.Foreign, ",")}, " | ")
	want := "by_region.sql,by_store.sql,manifest.json | by_item.sql | notes.sql"
	if got != want {
		t.Errorf("written | removed | foreign = %q, want %q", got, want)
	}
	if len(rep.Unchanged) != 5 {
		t.Errorf("unchanged %v", rep.Unchanged)
	}
	snap := snapshot(t, dir)
	if snap["notes.sql"] != "-- mine\n" || snap["docs/README"] != "read me\n" {
		t.Error("the files rollwise did not write were not carried over")
	}
	delete(snap, "notes.sql")
	delete(snap, "docs/README")
	delete(snap, "docs/")
	if !sameTree(snap, complete(t, v2)) {
		t.Errorf("folder holds %s", treeNames(snap))
	}
}

// A real folder (from an earlier rollwise) becomes the link, its files of
// views kept or replaced, a staging folder an earlier run left dropped;
// a link rollwise did not make, or a file, is refused.
func TestRealFolderBecomesTheLink(t *testing.T) {
	v1, v2 := twoVersions(t)
	dir := filepath.Join(t.TempDir(), "views")
	legacyFolder(t, dir, v1)
	if err := os.Mkdir(filepath.Join(dir, legacyStaging+"123"), 0o755); err != nil {
		t.Fatal(err)
	}
	if _, err := Write(dir, v2); err != nil {
		t.Fatal(err)
	}
	if target, err := os.Readlink(dir); err != nil || !strings.HasPrefix(target, ".views.rollwise/v-") {
		t.Fatalf("dir is not the link: %q %v", target, err)
	}
	if snap := snapshot(t, dir); !sameTree(snap, complete(t, v2)) {
		t.Errorf("folder holds %s", treeNames(snap))
	}
	other := filepath.Join(t.TempDir(), "elsewhere")
	os.Mkdir(other, 0o755)                                             //nolint:errcheck // the link below is what counts
	os.Symlink(other, filepath.Join(filepath.Dir(dir), "mine"))        //nolint:errcheck // checked by Write's error
	os.WriteFile(filepath.Join(filepath.Dir(dir), "file"), nil, 0o644) //nolint:errcheck // idem
	for name, want := range map[string]string{"mine": "which rollwise did not make", "file": "is a file, not a folder"} {
		if _, err := Write(filepath.Join(filepath.Dir(dir), name), v1); err == nil || !strings.Contains(err.Error(), want) {
			t.Errorf("%s: error %v, want %q", name, err, want)
		}
	}
}

// A second run waits for the first; past the wait it fails with ErrBusy
// and leaves the folder alone.
func TestBusyFolderFailsClearly(t *testing.T) {
	v1, v2 := twoVersions(t)
	dir := filepath.Join(t.TempDir(), "views")
	if _, err := Write(dir, v1); err != nil {
		t.Fatal(err)
	}
	held, err := lockFile(filepath.Join(filepath.Dir(dir), ".views"+storeSuffix, lockName), 0)
	if err != nil {
		t.Fatal(err)
	}
	defer func(w time.Duration) { lockWait = w }(lockWait)
	lockWait = 300 * time.Millisecond
	_, err = Write(dir, v2)
	if !errors.Is(err, ErrBusy) || !strings.Contains(err.Error(), "waited 300ms") {
		t.Errorf("error %v, want ErrBusy after the wait", err)
	}
	if snap := snapshot(t, dir); !sameTree(snap, complete(t, v1)) {
		t.Errorf("a refused run changed the folder: %s", treeNames(snap))
	}
	held.Close()
	if _, err := Write(dir, v2); err != nil {
		t.Errorf("once released: %v", err)
	}
}
