package durable

import (
	"os"
	"path/filepath"
	"testing"
)

// TestReplace: the new text is in place, the permissions are the old
// file's, a symbolic link still points at the (replaced) file, and no
// temporary file is left in the folder.
func TestReplace(t *testing.T) {
	dir := t.TempDir()
	name := filepath.Join(dir, "m.roll")
	if err := os.WriteFile(name, []byte("old"), 0o600); err != nil {
		t.Fatal(err)
	}
	link := filepath.Join(dir, "link.roll")
	if err := os.Symlink(name, link); err != nil {
		t.Skip("no symbolic links here:", err)
	}
	if err := Replace(link, []byte("new")); err != nil {
		t.Fatal(err)
	}
	if b, _ := os.ReadFile(name); string(b) != "new" {
		t.Errorf("the file holds %q", b)
	}
	if fi, err := os.Lstat(link); err != nil || fi.Mode()&os.ModeSymlink == 0 {
		t.Errorf("the link was replaced by a file: %v %v", fi, err)
	}
	if fi, _ := os.Stat(name); fi.Mode().Perm() != 0o600 {
		t.Errorf("permissions %v, want 0600", fi.Mode().Perm())
	}
	if entries, _ := os.ReadDir(dir); len(entries) != 2 {
		t.Errorf("the folder holds %d entries, want the file and the link: %v", len(entries), entries)
	}
	if err := Replace(filepath.Join(dir, "missing.roll"), []byte("x")); err == nil {
		t.Error("replacing a file that does not exist succeeded")
	}
}
