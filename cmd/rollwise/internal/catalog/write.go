package catalog

import (
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/durable"
)

// ManifestFile names the catalog's manifest: the list of the files
// rollwise docs wrote, by which a later run knows the folder is its own.
const ManifestFile = "catalog.json"

// generator is the manifest's mark.
const generator = "rollwise docs"

type manifestData struct {
	Generator string   `json:"generator"`
	Files     []string `json:"files"`
}

func manifest(files []File) (File, error) {
	m := manifestData{Generator: generator, Files: []string{}}
	for _, f := range files {
		m.Files = append(m.Files, f.Name)
	}
	b, err := json.MarshalIndent(m, "", "  ")
	if err != nil {
		return File{}, err
	}
	return File{Name: ManifestFile, Data: append(b, '\n')}, nil
}

// ErrForeign is returned (wrapped) by Write when the folder holds files
// that rollwise docs did not write: they are never replaced.
var ErrForeign = errors.New("holds files that rollwise docs did not write")

// stagingMark is in the name of the folders Write stages a catalog in,
// beside the target: .NAME.rollwise-docs-XXXX.
const stagingMark = ".rollwise-docs-"

// Write puts the files in folder dir: they are written in full to a new
// folder beside dir and flushed, then the folder is renamed into place (a
// catalog dir held before is renamed aside first and removed after). So
// dir holds either the old catalog or the new one, never part of one;
// between the two renames it does not exist for an instant. A dir that
// holds anything not listed in its manifest (or any file, without one) is
// refused with ErrForeign and left alone. Staging folders that a killed
// run left beside dir are removed.
func Write(dir string, files []File) error {
	abs, err := filepath.Abs(dir)
	if err != nil {
		return err
	}
	parent, name := filepath.Split(abs)
	if name == "" {
		return fmt.Errorf("--out %s: the catalog needs a folder of its own, not the root", dir)
	}
	exists, err := checkOurs(abs)
	if err != nil {
		return fmt.Errorf("%s: %w", dir, err)
	}
	if err := os.MkdirAll(parent, 0o755); err != nil {
		return err
	}
	leftovers, _ := filepath.Glob(filepath.Join(parent, "."+name+stagingMark+"*"))
	for _, l := range leftovers {
		os.RemoveAll(l) //nolint:errcheck // best effort: a leftover never shows as dir
	}
	stage, err := os.MkdirTemp(parent, "."+name+stagingMark+"*")
	if err != nil {
		return err
	}
	if err := os.Chmod(stage, 0o755); err != nil {
		os.RemoveAll(stage) //nolint:errcheck // best effort, the next run removes it too
		return err
	}
	if err := fill(stage, files); err != nil {
		os.RemoveAll(stage) //nolint:errcheck // best effort, the next run removes it too
		return fmt.Errorf("%w (%s is as it was)", err, dir)
	}
	if !exists {
		if err := os.Rename(stage, abs); err != nil {
			os.RemoveAll(stage) //nolint:errcheck // best effort, the next run removes it too
			return err
		}
		return durable.SyncDir(parent)
	}
	aside := stage + "-old"
	if err := os.Rename(abs, aside); err != nil {
		os.RemoveAll(stage) //nolint:errcheck // best effort, the next run removes it too
		return err
	}
	if err := os.Rename(stage, abs); err != nil {
		if undo := os.Rename(aside, abs); undo != nil {
			return fmt.Errorf("%w; then moving the previous catalog back failed (%v): it is %s", err, undo, aside)
		}
		os.RemoveAll(stage) //nolint:errcheck // best effort, the next run removes it too
		return err
	}
	if err := durable.SyncDir(parent); err != nil {
		return err
	}
	return os.RemoveAll(aside)
}

// checkOurs reports whether dir exists, and refuses a dir that is not a
// folder or holds anything its manifest does not list.
func checkOurs(dir string) (bool, error) {
	info, err := os.Lstat(dir)
	switch {
	case errors.Is(err, fs.ErrNotExist):
		return false, nil
	case err != nil:
		return false, err
	case !info.IsDir():
		return false, errors.New("is not a folder: give --out a new or empty folder, or one rollwise docs wrote")
	}
	entries, err := os.ReadDir(dir)
	if err != nil {
		return false, err
	}
	listed := map[string]bool{}
	if b, err := os.ReadFile(filepath.Join(dir, ManifestFile)); err == nil {
		var m manifestData
		if json.Unmarshal(b, &m) == nil && m.Generator == generator {
			listed[ManifestFile] = true
			for _, f := range m.Files {
				listed[f] = true
			}
		}
	}
	var foreign []string
	for _, e := range entries {
		if !listed[e.Name()] || !e.Type().IsRegular() {
			foreign = append(foreign, e.Name())
		}
	}
	if len(foreign) > 0 {
		sort.Strings(foreign)
		more := ""
		if len(foreign) > 5 {
			more = fmt.Sprintf(" and %d more", len(foreign)-5)
			foreign = foreign[:5]
		}
		return false, fmt.Errorf("%w (%s%s); give --out a new or empty folder, or one rollwise docs wrote", ErrForeign, strings.Join(foreign, ", "), more)
	}
	return true, nil
}

// fill writes the files to folder stage and flushes them.
func fill(stage string, files []File) error {
	for _, f := range files {
		if err := durable.WriteNew(filepath.Join(stage, f.Name), f.Data); err != nil {
			return fmt.Errorf("writing %s: %w", f.Name, err)
		}
	}
	return durable.SyncDir(stage)
}
