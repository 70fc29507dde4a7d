package demo

import (
	"bufio"
	"cmp"
	"encoding/csv"
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"time"
)

// The generator works in integers only (money in cents, hours in quarter
// hours, choices from integer weights), so that its output is the same on
// every machine: floating-point results may differ between architectures.

// Seeds of the three random streams: one for the plant catalogue, one for
// the sales, one for the repairs, so that changing the number of sales
// lines leaves the other tables as they are.
const (
	seedHi      = 0x6272616d626c6577 // "bramblew"
	seedCatalog = 1
	seedSales   = 2
	seedRepairs = 3
)

// day is one calendar day of the data's period.
type day struct {
	date    string // yyyy-mm-dd
	compact string // yyyymmdd
	month   int    // 0-11
	weekday int    // 0 is Sunday
	year    int
	closed  bool
}

// plant is one row of plants.csv, with what the generator needs to sell it.
type plant struct {
	id        int
	family    string
	name      string
	listCents int64
	costPct   int64
	fam       *family
	pop       int
}

// saleLine is one row of sales.csv.
type saleLine struct {
	receipt string
	day     int
	store   int
	plant   int
	price   int64
	qty     int
	cost    int64
}

// repair is one row of repairs.csv; quarters is -1 when hours are NULL.
type repair struct {
	store    int
	day      int
	kind     string
	fee      int64
	quarters int
}

// dataset is the whole generated data.
type dataset struct {
	days    []day
	plants  []plant
	sales   []saleLine
	repairs []repair
	stock   []stockCount
}

// weighted picks an index with probability proportional to its weight.
type weighted struct {
	cum []int
}

func newWeighted(w []int) weighted {
	cum := make([]int, len(w))
	total := 0
	for i, x := range w {
		total += x
		cum[i] = total
	}
	return weighted{cum: cum}
}

func (w weighted) pick(r *rand.Rand) int {
	x := r.IntN(w.cum[len(w.cum)-1])
	i, _ := slices.BinarySearch(w.cum, x+1)
	return i
}

func calendarDays() []day {
	start := time.Date(2025, time.January, 1, 0, 0, 0, 0, time.UTC)
	days := make([]day, CalendarDays)
	for i := range days {
		t := start.AddDate(0, 0, i)
		md := t.Format("01-02")
		days[i] = day{
			date:    t.Format("2006-01-02"),
			compact: t.Format("20060102"),
			month:   int(t.Month()) - 1,
			weekday: int(t.Weekday()),
			year:    t.Year(),
			closed:  md == "01-01" || md == "12-25" || md == "12-26",
		}
	}
	return days
}

// openedDay is the index of the day a store opened (negative before the
// period).
func openedDay(s store) int {
	start := time.Date(2025, time.January, 1, 0, 0, 0, 0, time.UTC)
	t, err := time.Parse("2006-01-02", s.opened)
	if err != nil {
		return 0
	}
	return int(t.Sub(start).Hours() / 24)
}

func catalog() []plant {
	r := rand.New(rand.NewPCG(seedHi, seedCatalog))
	var plants []plant
	for fi := range families {
		f := &families[fi]
		for _, name := range f.products {
			whole := int64(f.priceLo + r.IntN(f.priceHi-f.priceLo+1))
			ending := []int64{99, 49, 99, 50, 75}[r.IntN(5)]
			plants = append(plants, plant{
				id:        len(plants) + 1,
				family:    f.name,
				name:      name,
				listCents: whole*100 + ending - 100,
				costPct:   int64(35 + r.IntN(26)),
				fam:       f,
				pop:       1 + r.IntN(9),
			})
		}
	}
	for i := range plants {
		if plants[i].listCents < 99 {
			plants[i].listCents = 99
		}
	}
	return plants
}

func generate(salesLines int) (*dataset, error) {
	if salesLines < MinSalesLines || salesLines > MaxSalesLines {
		return nil, fmt.Errorf("the number of sales lines must be between %d and %d, not %d",
			MinSalesLines, MaxSalesLines, salesLines)
	}
	d := &dataset{days: calendarDays(), plants: catalog()}
	d.sales = genSales(d.days, d.plants, salesLines)
	d.repairs = genRepairs(d.days)
	d.stock = genStock(d.days)
	return d, nil
}

// pickStore picks a store open on day di, weighted by floor area.
func pickStore(r *rand.Rand, w weighted, choices []store, opened []int, di int) int {
	for range 20 {
		i := w.pick(r)
		if opened[i] <= di {
			return choices[i].id
		}
	}
	return choices[0].id
}

func genSales(days []day, plants []plant, n int) []saleLine {
	r := rand.New(rand.NewPCG(seedHi, seedSales))
	dayW := make([]int, len(days))
	for i, dy := range days {
		if !dy.closed {
			growth := 100
			if dy.year == 2026 {
				growth = 108
			}
			dayW[i] = monthWeight[dy.month] * weekdayWeight[dy.weekday] * growth
		}
	}
	pickDay := newWeighted(dayW)
	storeW := make([]int, len(stores))
	opened := make([]int, len(stores))
	for i, s := range stores {
		storeW[i] = s.floorM2 / 100
		opened[i] = openedDay(s)
	}
	pickStoreW := newWeighted(storeW)
	var pickPlant [12]weighted
	for m := range pickPlant {
		w := make([]int, len(plants))
		for i, p := range plants {
			w[i] = p.pop * p.fam.season[m]
		}
		pickPlant[m] = newWeighted(w)
	}
	qtyPick := make(map[*family]weighted, len(families))
	for fi := range families {
		qtyPick[&families[fi]] = newWeighted(families[fi].qty)
	}
	pickCount := newWeighted([]int{28, 24, 18, 13, 10, 7})

	type receipt struct {
		day, store   int
		first, count int
	}
	type draft struct {
		plant int // index into plants
		qty   int
		price int64
		cost  int64
	}
	drafts := make([]draft, 0, n)
	var receipts []receipt
	for len(drafts) < n {
		di := pickDay.pick(r)
		rc := receipt{day: di, store: pickStore(r, pickStoreW, stores, opened, di), first: len(drafts)}
		rc.count = min(1+pickCount.pick(r), n-len(drafts))
		var used []int
		for range rc.count {
			pi := pickPlant[days[di].month].pick(r)
			for try := 0; try < 3 && slices.Contains(used, pi); try++ {
				pi = pickPlant[days[di].month].pick(r)
			}
			used = append(used, pi)
			p := plants[pi]
			list, cost := p.listCents, p.listCents*p.costPct/100
			if days[di].year == 2026 {
				list = (list*105 + 50) / 100
				cost = cost * 104 / 100
			}
			price := list
			if r.IntN(100) < 15 {
				pct := []int64{10, 20, 25, 30}[r.IntN(4)]
				price = (list*(100-pct) + 50) / 100
			}
			drafts = append(drafts, draft{plant: pi, qty: 1 + qtyPick[p.fam].pick(r), price: price, cost: cost})
		}
		receipts = append(receipts, rc)
	}
	slices.SortStableFunc(receipts, func(a, b receipt) int {
		return cmp.Or(cmp.Compare(a.day, b.day), cmp.Compare(a.store, b.store))
	})

	lines := make([]saleLine, 0, n)
	seq, lastDay, lastStore := 0, -1, -1
	for _, rc := range receipts {
		if rc.day != lastDay || rc.store != lastStore {
			seq, lastDay, lastStore = 0, rc.day, rc.store
		}
		seq++
		id := fmt.Sprintf("R%02d-%s-%03d", rc.store, days[rc.day].compact, seq)
		for _, dr := range drafts[rc.first : rc.first+rc.count] {
			lines = append(lines, saleLine{
				receipt: id, day: rc.day, store: rc.store, plant: plants[dr.plant].id,
				price: dr.price, qty: dr.qty, cost: dr.cost,
			})
		}
	}
	// Deliberate: some lines carry plant codes that no plant has, spread
	// evenly over the period.
	unmatched := Facts().UnmatchedPlantIDs
	for k := range UnmatchedSalesLines {
		lines[k*(n/UnmatchedSalesLines)+n/(2*UnmatchedSalesLines)].plant = unmatched[k%len(unmatched)]
	}
	return lines
}

func genRepairs(days []day) []repair {
	r := rand.New(rand.NewPCG(seedHi, seedRepairs))
	dayW := make([]int, len(days))
	for i, dy := range days {
		if !dy.closed {
			dayW[i] = repairMonthWeight[dy.month] * repairWeekdayWeight[dy.weekday]
		}
	}
	pickDay := newWeighted(dayW)
	var shops []store
	for _, s := range stores {
		if s.workshop {
			shops = append(shops, s)
		}
	}
	shopW := make([]int, len(shops))
	opened := make([]int, len(shops))
	for i, s := range shops {
		shopW[i] = s.floorM2 / 100
		opened[i] = openedDay(s)
	}
	pickShop := newWeighted(shopW)
	kindW := make([]int, len(repairKinds))
	for i, k := range repairKinds {
		kindW[i] = k.weight
	}
	pickKind := newWeighted(kindW)

	jobs := make([]repair, Repairs)
	for i := range jobs {
		di := pickDay.pick(r)
		k := repairKinds[pickKind.pick(r)]
		q := k.quartersLo + r.IntN(k.qHi-k.quartersLo+1)
		parts := int64(k.partsLo+r.IntN(k.partsHi-k.partsLo+1))*100 + int64(r.IntN(100))
		if k.partsHi == 0 {
			parts = 0
		}
		jobs[i] = repair{
			store: pickStore(r, pickShop, shops, opened, di), day: di, kind: k.name,
			fee: int64(q)*repairRateCents + parts, quarters: q,
		}
	}
	slices.SortStableFunc(jobs, func(a, b repair) int {
		return cmp.Or(cmp.Compare(a.day, b.day), cmp.Compare(a.store, b.store))
	})
	// Deliberate: some jobs have no hours recorded.
	step := Repairs / RepairsWithoutHours
	for k := range RepairsWithoutHours {
		jobs[k*step+step/3].quarters = -1
	}
	return jobs
}

// hundredths renders a non-negative number of hundredths with two decimals.
func hundredths(c int64) string {
	frac := c % 100
	s := strconv.FormatInt(c/100, 10) + "."
	if frac < 10 {
		s += "0"
	}
	return s + strconv.FormatInt(frac, 10)
}

// tableWriter writes one CSV file of the data.
type tableWriter struct {
	file   string
	header []string
	rows   func(d *dataset, emit func(...string) error) error
}

var tableWriters = []tableWriter{
	{"sales.csv", []string{"line_id", "receipt_id", "sold_on", "store_id", "plant_id", "unit_price", "qty", "unit_cost"},
		func(d *dataset, emit func(...string) error) error {
			for i, l := range d.sales {
				if err := emit(strconv.Itoa(i+1), l.receipt, d.days[l.day].date, strconv.Itoa(l.store),
					strconv.Itoa(l.plant), hundredths(l.price), strconv.Itoa(l.qty), hundredths(l.cost)); err != nil {
					return err
				}
			}
			return nil
		}},
	{"repairs.csv", []string{"repair_id", "store_id", "done_on", "kind", "fee", "hours"},
		func(d *dataset, emit func(...string) error) error {
			for i, j := range d.repairs {
				hours := ""
				if j.quarters >= 0 {
					hours = hundredths(int64(j.quarters) * 25)
				}
				if err := emit(strconv.Itoa(i+1), strconv.Itoa(j.store), d.days[j.day].date, j.kind,
					hundredths(j.fee), hours); err != nil {
					return err
				}
			}
			return nil
		}},
	{"plants.csv", []string{"plant_id", "family", "name", "list_price"},
		func(d *dataset, emit func(...string) error) error {
			for _, p := range d.plants {
				if err := emit(strconv.Itoa(p.id), p.family, p.name, hundredths(p.listCents)); err != nil {
					return err
				}
			}
			return nil
		}},
	{"stores.csv", []string{"store_id", "city", "district_id", "opened_on", "floor_m2", "workshop"},
		func(_ *dataset, emit func(...string) error) error {
			for _, s := range stores {
				if err := emit(strconv.Itoa(s.id), s.city, strconv.Itoa(s.district), s.opened,
					strconv.Itoa(s.floorM2), strconv.FormatBool(s.workshop)); err != nil {
					return err
				}
			}
			return nil
		}},
	{"districts.csv", []string{"district_id", "name", "region"},
		func(_ *dataset, emit func(...string) error) error {
			for _, x := range districts {
				if err := emit(strconv.Itoa(x.id), x.name, x.region); err != nil {
					return err
				}
			}
			return nil
		}},
	{"calendar.csv", []string{"day_on", "weekday", "season"},
		func(d *dataset, emit func(...string) error) error {
			for _, dy := range d.days {
				if err := emit(dy.date, weekdayNames[dy.weekday], seasonOfMonth[dy.month]); err != nil {
					return err
				}
			}
			return nil
		}},
	stockWriter,
}

// bufferedFile is a file being written through a buffer.
type bufferedFile struct {
	*bufio.Writer
}

// writeFile creates path (failing if it exists when exclusive, replacing
// it otherwise), lets fill write into it, and closes it.
func writeFile(path string, exclusive bool, fill func(*bufferedFile) error) error {
	flag := os.O_WRONLY | os.O_CREATE | os.O_TRUNC
	if exclusive {
		flag = os.O_WRONLY | os.O_CREATE | os.O_EXCL
	}
	f, err := os.OpenFile(path, flag, 0o644)
	if err != nil {
		if os.IsExist(err) {
			return fmt.Errorf("%s already exists; the demo never overwrites files: choose another folder or remove it", path)
		}
		return fmt.Errorf("cannot create %s: %w", path, err)
	}
	bw := &bufferedFile{bufio.NewWriterSize(f, 64<<10)}
	err = fill(bw)
	if err == nil {
		err = bw.Flush()
	}
	if cerr := f.Close(); err == nil {
		err = cerr
	}
	if err != nil {
		return fmt.Errorf("cannot write %s: %w", path, err)
	}
	return nil
}

func writeData(dir string, salesLines int, exclusive bool) error {
	d, err := generate(salesLines)
	if err != nil {
		return err
	}
	for _, t := range tableWriters {
		err := writeFile(filepath.Join(dir, t.file), exclusive, func(w *bufferedFile) error {
			cw := csv.NewWriter(w)
			if err := cw.Write(t.header); err != nil {
				return err
			}
			if err := t.rows(d, func(fields ...string) error { return cw.Write(fields) }); err != nil {
				return err
			}
			cw.Flush()
			return cw.Error()
		})
		if err != nil {
			return err
		}
	}
	return nil
}
