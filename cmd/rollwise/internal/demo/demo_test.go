package demo

import (
	"crypto/sha256"
	"encoding/csv"
	"encoding/hex"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/grammar"
)

func parse(t *testing.T, name, src string) *grammar.File {
	t.Helper()
	f, diags := grammar.Parse(name, src)
	if len(diags) > 0 {
		t.Fatalf("%s does not parse cleanly:\n%v", name, diags.Error())
	}
	return f
}

func TestModelsParse(t *testing.T) {
	for _, tc := range []struct {
		name                    string
		src                     string
		tables, measures, views int
	}{
		{ModelFile, Model(), 7, 25, 3},
		{EditsFile, EditsModel(), 0, 17, 1},
	} {
		f := parse(t, tc.name, tc.src)
		if len(f.Tables) != tc.tables || len(f.Measures) != tc.measures || len(f.Views) != tc.views {
			t.Errorf("%s: %d tables, %d measures, %d views; want %d, %d, %d", tc.name,
				len(f.Tables), len(f.Measures), len(f.Views), tc.tables, tc.measures, tc.views)
		}
	}
}

// TestModelsFitTogether checks what the planner would: names are unique
// across both files, views name declared measures, and edits only build on
// measures that exist.
func TestModelsFitTogether(t *testing.T) {
	main := parse(t, ModelFile, Model())
	edits := parse(t, EditsFile, EditsModel())
	measures := map[string]bool{}
	for _, f := range []*grammar.File{main, edits} {
		for _, m := range f.Measures {
			if measures[m.Name.Name] {
				t.Errorf("measure %s is declared twice", m.Name.Name)
			}
			measures[m.Name.Name] = true
		}
	}
	for _, f := range []*grammar.File{main, edits} {
		for _, v := range f.Views {
			for _, m := range v.Measures {
				if !measures[m.Name] {
					t.Errorf("view %s names %s, which is not a measure", v.Name.Name, m.Name)
				}
			}
		}
	}
	for _, v := range main.Views {
		for _, m := range v.Measures {
			if !slices.ContainsFunc(main.Measures, func(d *grammar.MeasureDecl) bool { return d.Name.Name == m.Name }) {
				t.Errorf("view %s of %s uses %s from %s; garden.roll must stand alone", v.Name.Name, ModelFile, m.Name, EditsFile)
			}
		}
	}
}

// TestDataMatchesModel checks that each table's `from` file is written and
// that its header lists the table's stored columns in declaration order.
func TestDataMatchesModel(t *testing.T) {
	f := parse(t, ModelFile, Model())
	dir := t.TempDir()
	if err := WriteData(dir, MinSalesLines); err != nil {
		t.Fatal(err)
	}
	var froms []string
	for _, tb := range f.Tables {
		if tb.From == nil {
			t.Errorf("table %s has no from file", tb.Name.Name)
			continue
		}
		if tb.From.Value != tb.Name.Name+".csv" {
			t.Errorf("table %s reads %q; want %q so that --data DIR finds it too", tb.Name.Name, tb.From.Value, tb.Name.Name+".csv")
		}
		froms = append(froms, tb.From.Value)
		var want []string
		for _, c := range tb.Columns {
			if c.Type != nil {
				want = append(want, c.Name.Name)
			}
		}
		rows := readCSV(t, filepath.Join(dir, tb.From.Value))
		if !slices.Equal(rows[0], want) {
			t.Errorf("%s header is %v; want the stored columns of table %s: %v", tb.From.Value, rows[0], tb.Name.Name, want)
		}
	}
	slices.Sort(froms)
	files := DataFiles()
	slices.Sort(files)
	if !slices.Equal(froms, files) {
		t.Errorf("the model reads %v but the demo writes %v", froms, files)
	}
}

func readCSV(t *testing.T, path string) [][]string {
	t.Helper()
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		t.Fatalf("%s: %v", path, err)
	}
	return rows
}

func hashDir(t *testing.T, dir string) map[string]string {
	t.Helper()
	sums := map[string]string{}
	for _, name := range DataFiles() {
		f, err := os.Open(filepath.Join(dir, name))
		if err != nil {
			t.Fatal(err)
		}
		h := sha256.New()
		if _, err := io.Copy(h, f); err != nil {
			t.Fatal(err)
		}
		f.Close()
		sums[name] = hex.EncodeToString(h.Sum(nil))
	}
	return sums
}

// goldenSales is the sha256 of sales.csv with DefaultSalesLines lines. It
// proves the bytes are the same on every machine; update it only when the
// generator is changed on purpose.
const goldenSales = "bfb48a79f98ac9d1409205037cda0163dffeba5aa9e912f6d24f6578d2e3948a"

func TestWriteDataIsDeterministic(t *testing.T) {
	a, b := t.TempDir(), t.TempDir()
	for _, dir := range []string{a, b} {
		if err := WriteData(dir, DefaultSalesLines); err != nil {
			t.Fatal(err)
		}
	}
	ha, hb := hashDir(t, a), hashDir(t, b)
	for name, sum := range ha {
		if hb[name] != sum {
			t.Errorf("%s differs between two runs", name)
		}
	}
	if got := ha["sales.csv"]; got != goldenSales {
		t.Errorf("sales.csv has sha256 %s; want %s (update goldenSales only if the generator changed on purpose)", got, goldenSales)
	}
	// The other tables do not depend on the number of sales lines.
	c := t.TempDir()
	if err := WriteData(c, 5000); err != nil {
		t.Fatal(err)
	}
	hc := hashDir(t, c)
	for name, sum := range ha {
		if same := hc[name] == sum; same != (name != "sales.csv") {
			t.Errorf("%s: same bytes for 5000 and %d sales lines is %v", name, DefaultSalesLines, same)
		}
	}
}

func TestWriteDataRejectsBadSizes(t *testing.T) {
	for _, n := range []int{-1, 0, MinSalesLines - 1, MaxSalesLines + 1} {
		err := WriteData(t.TempDir(), n)
		if err == nil || !strings.Contains(err.Error(), "sales lines") {
			t.Errorf("WriteData(%d) = %v; want an error about the number of sales lines", n, err)
		}
	}
}

// table is a CSV file read into rows keyed by column name.
type table struct {
	header []string
	rows   [][]string
}

func load(t *testing.T, dir, name string) table {
	rows := readCSV(t, filepath.Join(dir, name))
	return table{header: rows[0], rows: rows[1:]}
}

func (tb table) col(name string) int {
	return slices.Index(tb.header, name)
}

func cents(t *testing.T, s string) int64 {
	t.Helper()
	whole, frac, ok := strings.Cut(s, ".")
	w, err1 := strconv.ParseInt(whole, 10, 64)
	f, err2 := strconv.ParseInt(frac, 10, 64)
	if !ok || len(frac) != 2 || err1 != nil || err2 != nil {
		t.Fatalf("%q is not a number with two decimals", s)
	}
	return w*100 + f
}

// TestFacts reads the written files back and checks the declared facts,
// the irregularities and the totals of Summarize against them.
func TestFacts(t *testing.T) {
	dir := t.TempDir()
	if err := WriteData(dir, DefaultSalesLines); err != nil {
		t.Fatal(err)
	}
	facts := Facts()
	sum, err := Summarize(DefaultSalesLines)
	if err != nil {
		t.Fatal(err)
	}
	sales, plants := load(t, dir, "sales.csv"), load(t, dir, "plants.csv")
	stores, districts := load(t, dir, "stores.csv"), load(t, dir, "districts.csv")
	repairs, calendar := load(t, dir, "repairs.csv"), load(t, dir, "calendar.csv")
	for _, c := range []struct {
		name      string
		got, want int
	}{
		{"sales", len(sales.rows), DefaultSalesLines}, {"plants", len(plants.rows), Plants},
		{"stores", len(stores.rows), Stores}, {"districts", len(districts.rows), Districts},
		{"repairs", len(repairs.rows), Repairs}, {"calendar", len(calendar.rows), CalendarDays},
		{"summary sales", sum.SalesLines, DefaultSalesLines}, {"summary repairs", sum.Repairs, Repairs},
	} {
		if c.got != c.want {
			t.Errorf("%s: %d rows; want %d", c.name, c.got, c.want)
		}
	}
	if calendar.rows[0][0] != FirstDay || calendar.rows[len(calendar.rows)-1][0] != LastDay {
		t.Errorf("calendar runs from %s to %s", calendar.rows[0][0], calendar.rows[len(calendar.rows)-1][0])
	}

	plantIDs := map[string]bool{}
	var noFamily []int
	for _, r := range plants.rows {
		plantIDs[r[0]] = true
		if r[plants.col("family")] == "" {
			id, _ := strconv.Atoi(r[0])
			noFamily = append(noFamily, id)
		}
	}
	if !slices.Equal(noFamily, facts.NoFamilyPlantIDs) {
		t.Errorf("plants without a family: %v; want %v", noFamily, facts.NoFamilyPlantIDs)
	}
	var noRegion []int
	for _, r := range districts.rows {
		if r[districts.col("region")] == "" {
			id, _ := strconv.Atoi(r[0])
			noRegion = append(noRegion, id)
		}
	}
	if !slices.Equal(noRegion, []int{facts.NoRegionDistrictID}) {
		t.Errorf("districts without a region: %v; want [%d]", noRegion, facts.NoRegionDistrictID)
	}
	var inNoRegion []int
	for _, r := range stores.rows {
		if r[stores.col("district_id")] == strconv.Itoa(facts.NoRegionDistrictID) {
			id, _ := strconv.Atoi(r[0])
			inNoRegion = append(inNoRegion, id)
		}
	}
	if !slices.Equal(inNoRegion, facts.NoRegionStoreIDs) {
		t.Errorf("stores in district %d: %v; want %v", facts.NoRegionDistrictID, inNoRegion, facts.NoRegionStoreIDs)
	}

	var (
		unmatched, noFamilyLines, lateEarly int
		revenue, cost                       int64
		receipts                            = map[string]int{}
		salesStores                         = map[int]bool{}
		lastReceipt                         string
	)
	closed := func(date string) bool { return slices.Contains(facts.ClosedDays, date[5:]) }
	for i, r := range sales.rows {
		if r[0] != strconv.Itoa(i+1) {
			t.Fatalf("line %d has line_id %s", i+1, r[0])
		}
		rid, day, plant := r[sales.col("receipt_id")], r[sales.col("sold_on")], r[sales.col("plant_id")]
		store, _ := strconv.Atoi(r[sales.col("store_id")])
		price, unitCost := cents(t, r[sales.col("unit_price")]), cents(t, r[sales.col("unit_cost")])
		qty, err := strconv.Atoi(r[sales.col("qty")])
		if err != nil || qty < 1 || qty > 10 {
			t.Fatalf("line %s: qty %q", r[0], r[sales.col("qty")])
		}
		if unitCost <= 0 || unitCost >= price {
			t.Errorf("line %s: unit_cost %d is not below unit_price %d", r[0], unitCost, price)
		}
		if day < FirstDay || day > LastDay || closed(day) {
			t.Errorf("line %s: sold on %s", r[0], day)
		}
		if !plantIDs[plant] {
			unmatched++
			id, _ := strconv.Atoi(plant)
			if !slices.Contains(facts.UnmatchedPlantIDs, id) {
				t.Errorf("line %s: unexpected unmatched plant %s", r[0], plant)
			}
		} else if id, _ := strconv.Atoi(plant); slices.Contains(facts.NoFamilyPlantIDs, id) {
			noFamilyLines++
		}
		if store == facts.LateStoreID && day < facts.LateStoreOpened {
			lateEarly++
		}
		if rid != lastReceipt {
			if receipts[rid] > 0 {
				t.Errorf("receipt %s is not contiguous", rid)
			}
			lastReceipt = rid
		}
		receipts[rid]++
		salesStores[store] = true
		revenue += price * int64(qty)
		cost += unitCost * int64(qty)
	}
	if unmatched != facts.UnmatchedSalesLines || sum.UnmatchedSalesLines != unmatched {
		t.Errorf("unmatched sales lines: %d in the file, %d in Summarize; want %d", unmatched, sum.UnmatchedSalesLines, facts.UnmatchedSalesLines)
	}
	if noFamilyLines == 0 || noFamilyLines != sum.NoFamilySalesLines {
		t.Errorf("lines on plants without a family: %d in the file, %d in Summarize", noFamilyLines, sum.NoFamilySalesLines)
	}
	if lateEarly != 0 {
		t.Errorf("store %d has %d sales before it opened", facts.LateStoreID, lateEarly)
	}
	if len(salesStores) != Stores {
		t.Errorf("%d stores have sales; want all %d", len(salesStores), Stores)
	}
	for rid, n := range receipts {
		if n < 1 || n > 6 {
			t.Errorf("receipt %s has %d lines", rid, n)
		}
	}
	if len(receipts) != sum.Receipts || revenue != sum.RevenueCents || cost != sum.CostCents {
		t.Errorf("file: %d receipts, revenue %d, cost %d; Summarize: %d, %d, %d",
			len(receipts), revenue, cost, sum.Receipts, sum.RevenueCents, sum.CostCents)
	}

	var noHours int
	var fees int64
	repairStores := map[int]bool{}
	for _, r := range repairs.rows {
		store, _ := strconv.Atoi(r[repairs.col("store_id")])
		repairStores[store] = true
		fees += cents(t, r[repairs.col("fee")])
		if r[repairs.col("hours")] == "" {
			noHours++
		}
		if day := r[repairs.col("done_on")]; closed(day) {
			t.Errorf("repair %s done on closed day %s", r[0], day)
		}
	}
	if noHours != facts.RepairsWithoutHours || sum.RepairsWithoutHours != noHours {
		t.Errorf("repairs without hours: %d in the file, %d in Summarize; want %d", noHours, sum.RepairsWithoutHours, facts.RepairsWithoutHours)
	}
	if fees != sum.RepairFeeCents {
		t.Errorf("repair fees: %d in the file, %d in Summarize", fees, sum.RepairFeeCents)
	}
	for _, id := range facts.StoresWithoutWorkshop {
		if repairStores[id] {
			t.Errorf("store %d has no workshop but has repairs", id)
		}
	}
	if len(repairStores)+len(facts.StoresWithoutWorkshop) != Stores {
		t.Errorf("%d stores have repairs; want %d", len(repairStores), Stores-len(facts.StoresWithoutWorkshop))
	}
}

func TestWriteFiles(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "demo")
	if err := WriteFiles(dir); err != nil {
		t.Fatal(err)
	}
	for name, want := range map[string]string{ModelFile: Model(), EditsFile: EditsModel()} {
		got, err := os.ReadFile(filepath.Join(dir, name))
		if err != nil || string(got) != want {
			t.Errorf("%s: not the embedded model (err %v)", name, err)
		}
	}
	if rows := readCSV(t, filepath.Join(dir, "sales.csv")); len(rows) != DefaultSalesLines+1 {
		t.Errorf("sales.csv has %d rows; want %d and a header", len(rows)-1, DefaultSalesLines)
	}
	err := WriteFiles(dir)
	if err == nil || !strings.Contains(err.Error(), filepath.Join(dir, ModelFile)) {
		t.Errorf("second WriteFiles = %v; want an error naming %s", err, ModelFile)
	}
}

func TestWriteFilesRefusesToOverwrite(t *testing.T) {
	dir := t.TempDir()
	mine := filepath.Join(dir, "stores.csv")
	if err := os.WriteFile(mine, []byte("mine\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	err := WriteFiles(dir)
	if err == nil || !strings.Contains(err.Error(), mine) || !strings.Contains(err.Error(), "already exists") {
		t.Fatalf("WriteFiles = %v; want an error naming %s", err, mine)
	}
	entries, _ := os.ReadDir(dir)
	if len(entries) != 1 {
		t.Errorf("WriteFiles wrote files before refusing: %d entries", len(entries))
	}
	if got, _ := os.ReadFile(mine); string(got) != "mine\n" {
		t.Errorf("stores.csv was changed: %q", got)
	}
}

func BenchmarkWriteData(b *testing.B) {
	dir := b.TempDir()
	for b.Loop() {
		if err := WriteData(dir, DefaultSalesLines); err != nil {
			b.Fatal(err)
		}
	}
}
