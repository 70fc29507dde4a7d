package views

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func expectDrifts(t *testing.T, dir string, s *Set, want ...string) {
	t.Helper()
	drifts, err := Check(dir, s)
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, d := range drifts {
		got = append(got, string(d.Kind)+" "+d.File)
	}
	if strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("drifts:\n%s\nwant:\n%s\n(in full: %v)", strings.Join(got, "\n"), strings.Join(want, "\n"), drifts)
	}
}

func TestCheckUpToDate(t *testing.T) {
	v1, _ := twoVersions(t)
	dir := t.TempDir()
	if _, err := Write(dir, v1); err != nil {
		t.Fatal(err)
	}
	expectDrifts(t, dir, v1)
}

// A changed measure changes the views that use it, and only those; a view
// block taken out of the model leaves an extra file; a new one is missing.
func TestCheckFindsModelChanges(t *testing.T) {
	v1, v2 := twoVersions(t)
	dir := t.TempDir()
	if _, err := Write(dir, v1); err != nil {
		t.Fatal(err)
	}
	expectDrifts(t, dir, v2,
		"changed by_region.sql",
		"missing by_store.sql",
		"extra by_item.sql")
	drifts, _ := Check(dir, v2)
	if !strings.Contains(drifts[0].String(), "cost") || !strings.Contains(drifts[2].String(), "no longer has this view") {
		t.Errorf("the details do not say what changed: %v", drifts)
	}
}

// Edits in the folder: a hand edit, a deleted file, a file added by hand,
// an edited manifest, no manifest at all, no folder at all.
func TestCheckFindsEditsInTheFolder(t *testing.T) {
	v1, _ := twoVersions(t)
	dir := t.TempDir()
	if _, err := Write(dir, v1); err != nil {
		t.Fatal(err)
	}
	edit := func(name, old, new string) {
		t.Helper()
		p := filepath.Join(dir, name)
		b, err := os.ReadFile(p)
		if err != nil || !strings.Contains(string(b), old) {
			t.Fatalf("%s: cannot edit (%v)", name, err)
		}
		if err := os.WriteFile(p, []byte(strings.Replace(string(b), old, new, 1)), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	edit("by_item.sql", "avg(", "max(")
	expectDrifts(t, dir, v1, "hand-edited by_item.sql")

	if err := os.Remove(filepath.Join(dir, "by_region.sql")); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "mine.sql"), []byte("select 1;\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	expectDrifts(t, dir, v1, "missing by_region.sql", "hand-edited by_item.sql", "extra mine.sql")

	// Put the views back: only the manifest differs then.
	if _, err := Write(dir, v1); err != nil {
		t.Fatal(err)
	}
	os.Remove(filepath.Join(dir, "mine.sql")) //nolint:errcheck // checked by expectDrifts
	edit(ManifestFile, `"dialect": "duckdb"`, `"dialect": "postgres"`)
	expectDrifts(t, dir, v1, "manifest manifest.json")

	os.Remove(filepath.Join(dir, ManifestFile)) //nolint:errcheck // checked by expectDrifts
	expectDrifts(t, dir, v1, "missing manifest.json")

	var want []string
	for _, v := range v1.Views {
		want = append(want, "missing "+v.File)
	}
	expectDrifts(t, filepath.Join(dir, "nowhere"), v1, append(want, "missing manifest.json")...)
}
