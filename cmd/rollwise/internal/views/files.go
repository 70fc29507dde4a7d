package views

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"strings"

	"github.com/rollwise/rollwise/dialects"
)

// ManifestFile is the name of the manifest in an --out folder.
const ManifestFile = "manifest.json"

// Manifest describes an --out folder: which file holds which view, what
// each view reads, and its columns. Views are in creation order.
type Manifest struct {
	// Generator is always "rollwise views".
	Generator string `json:"generator"`
	Dialect   string `json:"dialect"`
	Schema    string `json:"schema,omitempty"`
	// GroupingColumn names the column of measure views that tells total
	// rows apart (see the views documentation).
	GroupingColumn string         `json:"grouping_column"`
	Views          []ManifestView `json:"views"`
}

// ManifestView is one view of a manifest.
type ManifestView struct {
	Name string `json:"name"`
	// QualifiedName is schema.name, or the name without --schema.
	QualifiedName string `json:"qualified_name"`
	Kind          Kind   `json:"kind"`
	Source        string `json:"source"`
	File          string `json:"file"`
	// SHA256 is the hex digest of the file as written: --check tells a
	// hand edit (the file no longer matches it) from a model change.
	SHA256  string   `json:"sha256"`
	Reads   []string `json:"reads"`
	Columns []Column `json:"columns"`
}

// File is one file of an --out folder.
type File struct {
	Name string
	Data []byte
}

// Script is the DDL of every view, in creation order: what `rollwise views`
// prints, and the files of Files put end to end.
func (s *Set) Script() string {
	var parts []string
	for _, v := range s.Views {
		parts = append(parts, v.Text)
	}
	return strings.Join(parts, "\n")
}

// Manifest describes the set's files.
func (s *Set) Manifest() *Manifest {
	m := &Manifest{Generator: "rollwise views", Dialect: s.Dialect, Schema: s.Schema,
		GroupingColumn: dialects.GroupingColumn, Views: []ManifestView{}}
	for _, v := range s.Views {
		m.Views = append(m.Views, ManifestView{
			Name: v.Name, QualifiedName: strings.Join(v.QualifiedName, "."), Kind: v.Kind,
			Source: v.Source, File: v.File, SHA256: digest([]byte(v.Text)),
			Reads: v.Reads, Columns: v.Columns,
		})
	}
	return m
}

// Files lays the set out as one file per view, in creation order, and the
// manifest last.
func (s *Set) Files() ([]File, error) {
	var out []File
	for _, v := range s.Views {
		out = append(out, File{Name: v.File, Data: []byte(v.Text)})
	}
	b, err := json.MarshalIndent(s.Manifest(), "", "  ")
	if err != nil {
		return nil, err
	}
	return append(out, File{Name: ManifestFile, Data: append(b, '\n')}), nil
}

func digest(b []byte) string {
	h := sha256.Sum256(b)
	return hex.EncodeToString(h[:])
}

// readManifest parses a manifest; a nil manifest and a nil error mean that
// there is none.
func readManifest(b []byte) (*Manifest, error) {
	var m Manifest
	if err := json.Unmarshal(b, &m); err != nil {
		return nil, err
	}
	return &m, nil
}
