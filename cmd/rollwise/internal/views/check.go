package views

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"unicode/utf8"
)

// DriftKind names a way an --out folder differs from what the model
// generates.
type DriftKind string

// The kinds of drift.
const (
	// Changed: the file is as rollwise wrote it, but the model now
	// generates something else (a measure or a view block changed).
	Changed DriftKind = "changed"
	// Missing: the model has the view, the folder has no file for it.
	Missing DriftKind = "missing"
	// Extra: the folder has a .sql file the model does not generate (a
	// view since removed from the model, or a file added by hand).
	Extra DriftKind = "extra"
	// HandEdited: the file no longer matches the digest the manifest
	// recorded when rollwise wrote it.
	HandEdited DriftKind = "hand-edited"
	// ManifestDiffers: the views match but the manifest does not (an
	// edit, or another dialect or schema).
	ManifestDiffers DriftKind = "manifest"
)

// Drift is one difference between a folder and the generated views.
type Drift struct {
	Kind DriftKind
	// View is the view's name where one is known.
	View   string
	File   string
	Detail string
}

func (d Drift) String() string {
	s := fmt.Sprintf("%-11s %s", d.Kind, d.File)
	if d.View != "" && d.View+".sql" != d.File {
		s += " (view " + d.View + ")"
	}
	if d.Detail != "" {
		s += ": " + d.Detail
	}
	return s
}

// Check compares folder dir with the files Write would put there and
// lists the differences: none means dir is up to date. A folder that does
// not exist differs by every file.
func Check(dir string, s *Set) ([]Drift, error) {
	files, err := s.Files()
	if err != nil {
		return nil, err
	}
	entries, err := os.ReadDir(dir)
	if err != nil && !errors.Is(err, fs.ErrNotExist) {
		return nil, err
	}
	var drifts []Drift
	recorded := map[string]ManifestView{}
	var oldManifest []byte
	switch b, err := os.ReadFile(filepath.Join(dir, ManifestFile)); {
	case errors.Is(err, fs.ErrNotExist):
	case err != nil:
		return nil, err
	default:
		oldManifest = b
		if m, err := readManifest(b); err != nil {
			drifts = append(drifts, Drift{Kind: ManifestDiffers, File: ManifestFile, Detail: "not a manifest rollwise can read: " + err.Error()})
		} else {
			for _, v := range m.Views {
				recorded[v.File] = v
			}
		}
	}
	generated := map[string]bool{}
	viewOf := map[string]string{}
	for _, v := range s.Views {
		viewOf[v.File] = v.Name
	}
	for _, f := range files {
		generated[f.Name] = true
		if f.Name == ManifestFile {
			continue
		}
		d := Drift{View: viewOf[f.Name], File: f.Name}
		b, err := os.ReadFile(filepath.Join(dir, f.Name))
		switch {
		case errors.Is(err, fs.ErrNotExist):
			d.Kind, d.Detail = Missing, "the model has this view; the folder has no file for it"
		case err != nil:
			return nil, err
		case recorded[f.Name].SHA256 != "" && digest(b) != recorded[f.Name].SHA256:
			d.Kind, d.Detail = HandEdited, "the file was changed after rollwise wrote it ("+firstDifference(string(b), string(f.Data))+")"
		case string(b) != string(f.Data):
			d.Kind, d.Detail = Changed, "the model now generates different DDL ("+firstDifference(string(b), string(f.Data))+")"
		default:
			continue
		}
		drifts = append(drifts, d)
	}
	var extra []Drift
	for _, e := range entries {
		name := e.Name()
		switch {
		case e.IsDir() || generated[name] || !strings.HasSuffix(name, ".sql"):
		case recorded[name].Name != "":
			extra = append(extra, Drift{Kind: Extra, View: recorded[name].Name, File: name,
				Detail: "the model no longer has this view"})
		default:
			extra = append(extra, Drift{Kind: Extra, File: name, Detail: "rollwise did not write this file"})
		}
	}
	sort.Slice(extra, func(i, j int) bool { return extra[i].File < extra[j].File })
	drifts = append(drifts, extra...)
	explained := false
	for _, d := range drifts {
		explained = explained || d.Kind == Changed || d.Kind == Missing || d.Kind == Extra || d.Kind == ManifestDiffers
	}
	want := files[len(files)-1].Data
	switch {
	case oldManifest == nil:
		drifts = append(drifts, Drift{Kind: Missing, File: ManifestFile, Detail: "the folder has no manifest"})
	case string(oldManifest) != string(want) && !explained:
		drifts = append(drifts, Drift{Kind: ManifestDiffers, File: ManifestFile,
			Detail: "it differs from the generated one (" + firstDifference(string(oldManifest), string(want)) + ")"})
	}
	return drifts, nil
}

// firstDifference says where two texts first differ: the line, and the
// two versions of it from a little before the first differing character.
func firstDifference(have, want string) string {
	h, w := strings.Split(have, "\n"), strings.Split(want, "\n")
	for i := 0; i < max(len(h), len(w)); i++ {
		var a, b string
		if i < len(h) {
			a = h[i]
		}
		if i < len(w) {
			b = w[i]
		}
		if a != b {
			k := 0
			for k < len(a) && k < len(b) && a[k] == b[k] {
				k++
			}
			return fmt.Sprintf("first at line %d: has `%s`, model gives `%s`", i+1, excerpt(a, k), excerpt(b, k))
		}
	}
	return "same lines"
}

// excerpt cuts s to about 50 bytes around byte k.
func excerpt(s string, k int) string {
	start, end := max(0, k-20), min(len(s), k+30)
	for start > 0 && !utf8.RuneStart(s[start]) {
		start--
	}
	for end < len(s) && !utf8.RuneStart(s[end]) {
		end++
	}
	out := s[start:end]
	if start > 0 {
		out = "..." + out
	}
	if end < len(s) {
		out += "..."
	}
	return out
}
