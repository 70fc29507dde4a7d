package views

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
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
	out := map[string]string{}
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
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

func (f *faulty) SyncDir(name string) error {
	if err := f.fail(); err != nil {
		return err
	}
	return f.osFS.SyncDir(name)
}

// Whichever step fails, the folder is as it was; once no step fails, it
// is complete.
func TestWriteIsAllOrNothing(t *testing.T) {
	v1, v2 := twoVersions(t)
	for _, fresh := range []bool{false, true} {
		failures := 0
		for n := 1; ; n++ {
			dir := filepath.Join(t.TempDir(), "views")
			if !fresh {
				if _, err := Write(dir, v1); err != nil {
					t.Fatal(err)
				}
			}
			before := snapshot(t, dir)
			_, err := write(&faulty{n: n}, dir, v2)
			after := snapshot(t, dir)
			if err == nil {
				if !sameTree(after, complete(t, v2)) {
					t.Errorf("fresh=%v: after success the folder holds %s", fresh, treeNames(after))
				}
				break
			}
			failures++
			if !errors.Is(err, errInjected) {
				t.Fatalf("fresh=%v step %d: unexpected error %v", fresh, n, err)
			}
			if !sameTree(before, after) {
				t.Errorf("fresh=%v: failing step %d changed the folder:\nbefore %s\nafter  %s", fresh, n, treeNames(before), treeNames(after))
			}
			if n > 100 {
				t.Fatal("Write never succeeds")
			}
		}
		// Over v1, v2 writes 3 files and removes 1: the staging folder, 3
		// writes, 3 moves aside, 3 moves in and the sync can each fail
		// (11). Into no folder: the folder, the staging folder, 8 writes,
		// 8 moves in and the sync (19).
		if want := map[bool]int{false: 11, true: 19}[fresh]; failures != want {
			t.Errorf("fresh=%v: %d steps were made to fail, want %d", fresh, failures, want)
		}
	}
}

// Write reports what it did, touches only what changed, and leaves files
// it did not write alone.
func TestWriteReport(t *testing.T) {
	v1, v2 := twoVersions(t)
	dir := t.TempDir()
	if _, err := Write(dir, v1); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "notes.sql"), []byte("-- mine\n"), 0o644); err != nil {
		t.Fatal(err)
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
	if snap["notes.sql"] != "-- mine\n" {
		t.Error("notes.sql was touched")
	}
	delete(snap, "notes.sql")
	if !sameTree(snap, complete(t, v2)) {
		t.Errorf("folder holds %s", treeNames(snap))
	}
}

// A run killed between its renames leaves some files of each version and
// its staging folder: Check says so, and the next run completes the
// folder.
func TestKilledRunIsCompletedByTheNext(t *testing.T) {
	v1, v2 := twoVersions(t)
	dir := t.TempDir()
	if _, err := Write(dir, v1); err != nil {
		t.Fatal(err)
	}
	// The state a kill after the first rename leaves.
	staging := filepath.Join(dir, stagingPrefix+"123")
	if err := os.Mkdir(staging, 0o700); err != nil {
		t.Fatal(err)
	}
	files, _ := v2.Files()
	for _, f := range files {
		if f.Name == "by_region.sql" {
			os.WriteFile(filepath.Join(dir, f.Name), f.Data, 0o644) //nolint:errcheck // checked by Check below
		} else {
			os.WriteFile(filepath.Join(staging, f.Name), f.Data, 0o644) //nolint:errcheck // checked below
		}
	}
	drifts, err := Check(dir, v2)
	if err != nil {
		t.Fatal(err)
	}
	if !hasDrift(drifts, Interrupted, stagingPrefix+"123") || !hasDrift(drifts, HandEdited, "by_region.sql") {
		t.Errorf("drifts %v", drifts)
	}
	if _, err := Write(dir, v2); err != nil {
		t.Fatal(err)
	}
	if snap := snapshot(t, dir); !sameTree(snap, complete(t, v2)) {
		t.Errorf("folder holds %s", treeNames(snap))
	}
}

// When undoing fails too, the staging folder, which holds the previous
// files, is kept and the error names it.
func TestFailedUndoKeepsThePreviousFiles(t *testing.T) {
	v1, v2 := twoVersions(t)
	dir := t.TempDir()
	if _, err := Write(dir, v1); err != nil {
		t.Fatal(err)
	}
	old, _ := os.ReadFile(filepath.Join(dir, "by_region.sql"))
	_, err := write(&brokenUndo{}, dir, v2)
	if err == nil || !strings.Contains(err.Error(), "the previous files are in "+filepath.Join(dir, stagingPrefix)) {
		t.Fatalf("error %v", err)
	}
	kept, _ := filepath.Glob(filepath.Join(dir, stagingPrefix+"*", "by_region.sql.old"))
	if len(kept) != 1 {
		t.Fatalf("the previous by_region.sql is not in the staging folder: %v", kept)
	}
	if b, _ := os.ReadFile(kept[0]); string(b) != string(old) {
		t.Error("the kept copy differs from the previous file")
	}
}

// brokenUndo fails the fourth rename and every rename after it.
type brokenUndo struct {
	osFS
	renames int
}

func (b *brokenUndo) Rename(from, to string) error {
	b.renames++
	if b.renames >= 4 {
		return errInjected
	}
	return b.osFS.Rename(from, to)
}

func hasDrift(ds []Drift, kind DriftKind, file string) bool {
	for _, d := range ds {
		if d.Kind == kind && d.File == file {
			return true
		}
	}
	return false
}
