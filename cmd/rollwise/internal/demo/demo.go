// Package demo holds the demo scenario of `rollwise demo`: a model of
// Bramblewick Garden Centres, a made-up chain of twelve garden centres, and
// a seeded generator for its data (CSV files, the same bytes on every run
// and every machine).
//
// The data has a few deliberate irregularities (a link that finds no row,
// NULL dimension values, a store that opens mid-period...) so that demo
// results show how the language treats them; Facts lists them.
package demo

import (
	_ "embed"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
)

//go:embed garden.roll
var gardenModel string

//go:embed garden_edits.roll
var gardenEdits string

// The names of the model files that WriteFiles writes.
const (
	// ModelFile holds the tables, the core measures and two views.
	ModelFile = "garden.roll"
	// EditsFile holds the measures that use cell edits, per-grain
	// aggregates or narrowing; it is meant to be loaded with ModelFile.
	EditsFile = "garden_edits.roll"
)

// Model returns the text of garden.roll: the tables, the core measures
// (plain aggregates and arithmetic on measures) and two views.
func Model() string { return gardenModel }

// EditsModel returns the text of garden_edits.roll: measures built on
// those of Model with cell edits, per-grain aggregates and narrowing, and a
// view that uses them. It declares no tables; load it together with Model.
func EditsModel() string { return gardenEdits }

// Sizes of the generated data.
const (
	// DefaultSalesLines is the number of sales lines `rollwise demo`
	// generates.
	DefaultSalesLines = 40000
	// MinSalesLines and MaxSalesLines bound the salesLines argument of
	// WriteData and Summarize.
	MinSalesLines = 100
	MaxSalesLines = 5000000
	// Repairs is the number of repair jobs, whatever the number of sales
	// lines.
	Repairs = 3000
	// Plants, Stores and Districts are the row counts of those tables.
	Plants    = 60
	Stores    = 12
	Districts = 5
	// CalendarDays is the number of calendar rows: every day of 2025 and
	// 2026.
	CalendarDays = 730
	// FirstDay and LastDay bound the calendar and all sales and repairs.
	FirstDay = "2025-01-01"
	LastDay  = "2026-12-31"
	// UnmatchedSalesLines is the number of sales lines whose plant_id
	// matches no plant (for any number of sales lines).
	UnmatchedSalesLines = 20
	// RepairsWithoutHours is the number of repair jobs with hours NULL.
	RepairsWithoutHours = 15
)

// Irregularities lists the deliberate oddities of the demo data, so that
// tests can assert on how results treat them.
type Irregularities struct {
	// UnmatchedSalesLines sales lines carry a plant_id from
	// UnmatchedPlantIDs, which no plant has: through the link their
	// plants columns are NULL.
	UnmatchedSalesLines int
	UnmatchedPlantIDs   []int
	// NoFamilyPlantIDs are plants whose family is empty (NULL).
	NoFamilyPlantIDs []int
	// NoRegionDistrictID is a district with an empty (NULL) region;
	// NoRegionStoreIDs are its stores.
	NoRegionDistrictID int
	NoRegionStoreIDs   []int
	// LateStoreID opened on LateStoreOpened, inside the data's period; it
	// has no sales before that day.
	LateStoreID     int
	LateStoreOpened string
	// StoresWithoutWorkshop have sales but no repairs.
	StoresWithoutWorkshop []int
	// RepairsWithoutHours repair jobs have hours NULL (but a fee).
	RepairsWithoutHours int
	// ClosedDays (month-day) have no sales and no repairs in either year,
	// though the calendar has them.
	ClosedDays []string
}

// Facts returns the deliberate irregularities of the demo data. They hold
// for every number of sales lines WriteData accepts.
func Facts() Irregularities {
	return Irregularities{
		UnmatchedSalesLines:   UnmatchedSalesLines,
		UnmatchedPlantIDs:     []int{901, 902, 903, 904},
		NoFamilyPlantIDs:      []int{59, 60},
		NoRegionDistrictID:    5,
		NoRegionStoreIDs:      []int{12},
		LateStoreID:           12,
		LateStoreOpened:       "2025-09-13",
		StoresWithoutWorkshop: []int{3, 6, 12},
		RepairsWithoutHours:   RepairsWithoutHours,
		ClosedDays:            []string{"01-01", "12-25", "12-26"},
	}
}

// DataFiles returns the names of the CSV files WriteData writes, one per
// table of the model and named as the model's `from` files.
func DataFiles() []string {
	names := make([]string, len(tableWriters))
	for i, t := range tableWriters {
		names[i] = t.file
	}
	return names
}

// WriteFiles writes the demo into dir, creating dir if needed: the two
// model files and the data with DefaultSalesLines sales lines. It never
// overwrites: if any of the files already exists, it writes nothing and
// returns an error that names the file.
func WriteFiles(dir string) error {
	names := append([]string{ModelFile, EditsFile}, DataFiles()...)
	for _, name := range names {
		p := filepath.Join(dir, name)
		if _, err := os.Lstat(p); err == nil {
			return fmt.Errorf("%s already exists; the demo never overwrites files: choose another folder or remove it", p)
		} else if !errors.Is(err, fs.ErrNotExist) {
			return fmt.Errorf("cannot check %s: %w", p, err)
		}
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return fmt.Errorf("cannot create the folder %s: %w", dir, err)
	}
	for _, f := range []struct{ name, text string }{{ModelFile, gardenModel}, {EditsFile, gardenEdits}} {
		if err := writeFile(filepath.Join(dir, f.name), true, func(w *bufferedFile) error {
			_, err := w.WriteString(f.text)
			return err
		}); err != nil {
			return err
		}
	}
	return writeData(dir, DefaultSalesLines, true)
}

// WriteData writes the demo data into dir (which must exist): one CSV file
// per table with a header row, generated from a fixed seed, with
// salesLines sales lines (MinSalesLines to MaxSalesLines). Files of the
// same names are replaced. The other tables do not depend on salesLines.
func WriteData(dir string, salesLines int) error {
	return writeData(dir, salesLines, false)
}
