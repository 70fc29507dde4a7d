package tpch

import (
	"errors"
	"fmt"
	"math"
	"os"
	"sync"
	_ "unsafe" // for go:linkname: the generator's scale lives in unexported variables

	"github.com/pingcap/go-tpc/tpch/dbgen"
)

// This file drives github.com/pingcap/go-tpc/tpch/dbgen, a Go port of the
// TPC-H dbgen 2.4.0. The port keeps all its state in package variables:
//
//   - InitDbGen builds a 300 MiB text pool (about 8 s on one core) and keeps
//     it for the life of the process;
//   - calling InitDbGen a second time appends every distribution to itself
//     (readDist never resets them), so the second data set differs from the
//     first: the port can be initialised only once per process;
//   - the random streams (seeds) advance as rows are made, so a second DbGen
//     after one InitDbGen continues the streams instead of starting over;
//   - InitDbGen takes an integer scale factor, and DbGen multiplies each
//     table's base row count by it, so scale factors below 1 (0.01, 0.1) are
//     not reachable through the exported API;
//   - DbGen prints progress lines to standard output.
//
// We therefore initialise once at scale 1, take a copy of the random streams
// as InitDbGen leaves them, and before every run put the streams back and set
// the scale the way the C dbgen does for a fractional scale factor (driver.c:
// scale = 1 and every table's base row count multiplied by the factor,
// rounded down to a multiple of 0.001). The unexported variables are reached
// with go:linkname; checkLayout verifies, before anything is written, that
// they hold what version v1.0.7 holds. Runs are serialised by genMu.

// dbgenTable mirrors the port's unexported tDef struct (driver.go).
type dbgenTable struct {
	name    string
	comment string
	base    int64
	loader  dbgen.Loader
	genSeed func(dbgen.Table, int64)
	child   dbgen.Table
	vTotal  int64
}

// dbgenSeed mirrors the port's Seed struct (rand.go).
type dbgenSeed struct {
	table    dbgen.Table
	value    int64
	usage    int64
	boundary int64
}

//go:linkname dbgenTables github.com/pingcap/go-tpc/tpch/dbgen.tDefs
var dbgenTables []dbgenTable

//go:linkname dbgenSeeds github.com/pingcap/go-tpc/tpch/dbgen.seeds
var dbgenSeeds [48]dbgenSeed

//go:linkname dbgenScale github.com/pingcap/go-tpc/tpch/dbgen.scale
var dbgenScale int64

//go:linkname dbgenCustKeyMax github.com/pingcap/go-tpc/tpch/dbgen.ockeyMax
var dbgenCustKeyMax int64

// dbgenPartKeyMax is dbgen.LPkeyMax, whose type is unexported.
//
//go:linkname dbgenPartKeyMax github.com/pingcap/go-tpc/tpch/dbgen.LPkeyMax
var dbgenPartKeyMax int64

// expectedTables is what InitDbGen(1) leaves in tDefs in go-tpc v1.0.7:
// file name and base row count (rows at scale factor 1) per dbgen.Table.
var expectedTables = []struct {
	name string
	base int64
}{
	dbgen.TPart:      {"part.tbl", 200000},
	dbgen.TPsupp:     {"partsupp.tbl", 200000},
	dbgen.TSupp:      {"supplier.tbl", 10000},
	dbgen.TCust:      {"customer.tbl", 150000},
	dbgen.TOrder:     {"orders.tbl", 1500000},
	dbgen.TLine:      {"lineitem.tbl", 1500000},
	dbgen.TOrderLine: {"orders.tbl", 1500000},
	dbgen.TPartPsupp: {"part.tbl", 200000},
	dbgen.TNation:    {"nation.tbl", 25},
	dbgen.TRegion:    {"region.tbl", 5},
}

var (
	genMu      sync.Mutex
	initOnce   sync.Once
	initErr    error
	savedSeeds [48]dbgenSeed
)

// initGenerator runs InitDbGen(1) once per process and checks that the
// port's variables look as this file expects.
func initGenerator() error {
	initOnce.Do(func() {
		dbgen.InitDbGen(1)
		initErr = checkLayout()
		savedSeeds = dbgenSeeds
	})
	return initErr
}

// errLayout says the go-tpc version differs from the one this file was
// written against.
var errLayout = errors.New("tpch: github.com/pingcap/go-tpc/tpch/dbgen does not hold the state this package expects (written for v1.0.7); check cmd/internal/tpch/dbgen.go against the new version")

func checkLayout() error {
	if len(dbgenTables) != len(expectedTables) {
		return fmt.Errorf("%w: %d table definitions, want %d", errLayout, len(dbgenTables), len(expectedTables))
	}
	for i, want := range expectedTables {
		got := dbgenTables[i]
		if got.name != want.name || got.base != want.base {
			return fmt.Errorf("%w: table %d is %q with %d rows, want %q with %d", errLayout, i, got.name, got.base, want.name, want.base)
		}
	}
	if dbgenScale != 1 || dbgenCustKeyMax != 150000 || dbgenPartKeyMax != 200000 {
		return fmt.Errorf("%w: scale %d, customer key max %d, part key max %d after InitDbGen(1)", errLayout, dbgenScale, dbgenCustKeyMax, dbgenPartKeyMax)
	}
	// Two streams that nothing touches before rows are made (rand.go initSeeds).
	if dbgenSeeds[0] != (dbgenSeed{dbgen.TPart, 1, 0, 1}) || dbgenSeeds[47] != (dbgenSeed{dbgen.TSupp, 715851524, 0, 1}) {
		return fmt.Errorf("%w: unexpected random stream seeds", errLayout)
	}
	return nil
}

// scaleParams is how one scale factor maps onto the generator.
type scaleParams struct {
	scale int64            // dbgen's integer scale
	base  map[int]int64    // base row count per scaled dbgen.Table
	rows  map[string]int64 // rows each table will have (lineitem: -1, it is random)
}

// planScale validates sf and computes the generator settings. Scale factors
// of 1 and more must be whole numbers; below 1 they must be multiples of
// 0.001, as in the C dbgen.
func planScale(sf float64) (scaleParams, error) {
	p := scaleParams{base: map[int]int64{}, rows: map[string]int64{}}
	switch {
	case math.IsNaN(sf) || math.IsInf(sf, 0) || sf <= 0:
		return p, fmt.Errorf("tpch: scale factor must be a positive number, not %v", sf)
	case sf >= 1:
		if sf != math.Trunc(sf) || sf > 100000 {
			return p, fmt.Errorf("tpch: scale factors of 1 and more must be whole numbers up to 100000, not %v", sf)
		}
		p.scale = int64(sf)
		for t := dbgen.TPart; t <= dbgen.TPartPsupp; t++ {
			p.base[int(t)] = expectedTables[t].base
		}
	default:
		milli := math.Round(sf * 1000)
		if milli < 1 || math.Abs(milli-sf*1000) > 1e-6 {
			return p, fmt.Errorf("tpch: scale factors below 1 must be multiples of 0.001, not %v", sf)
		}
		p.scale = 1
		for t := dbgen.TPart; t <= dbgen.TPartPsupp; t++ {
			b := int64(milli) * expectedTables[t].base / 1000
			p.base[int(t)] = max(b, 1)
		}
	}
	p.rows["part"] = p.base[int(dbgen.TPart)] * p.scale
	p.rows["partsupp"] = 4 * p.rows["part"]
	p.rows["supplier"] = p.base[int(dbgen.TSupp)] * p.scale
	p.rows["customer"] = p.base[int(dbgen.TCust)] * p.scale
	p.rows["orders"] = p.base[int(dbgen.TOrder)] * p.scale
	p.rows["lineitem"] = -1
	p.rows["nation"] = 25
	p.rows["region"] = 5
	return p, nil
}

// apply puts the random streams back to their state after InitDbGen and
// sets the scale. Callers hold genMu.
func (p scaleParams) apply() {
	dbgenSeeds = savedSeeds
	dbgenScale = p.scale
	for t, b := range p.base {
		dbgenTables[t].base = b
	}
	dbgenCustKeyMax = dbgenTables[dbgen.TCust].base * p.scale
	dbgenPartKeyMax = dbgenTables[dbgen.TPart].base * p.scale
}

// runDbGen calls dbgen.DbGen with standard output sent to the null device,
// because the port prints a line before and after every table. Callers
// hold genMu.
func runDbGen(loaders map[dbgen.Table]dbgen.Loader, tables []dbgen.Table) error {
	null, err := os.OpenFile(os.DevNull, os.O_WRONLY, 0)
	if err != nil {
		return err
	}
	saved := os.Stdout
	os.Stdout = null
	defer func() {
		os.Stdout = saved
		null.Close()
	}()
	return dbgen.DbGen(loaders, tables)
}
