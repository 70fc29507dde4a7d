package tpch

import (
	"context"
	"database/sql"
	"math/big"
	"sort"
	"strings"
	"testing"
	"time"
)

// This file answers the TPC-H queries of testdata/tpch/queries in plain Go
// over rows read back from the Parquet files, so that the SQL text (and the
// loading of the files) is checked against an independent computation.
// Money is kept in exact units: cents, or cents times hundredths after a
// multiplication by (1 - discount), as big.Rat where it is divided.

type refLine struct {
	order, part, supp       int64
	qty, price, disc, tax   int64 // cents (qty too: 17 is 1700)
	rflag, lstatus          string
	ship, commit, receipt   time.Time
	instruct, mode          string
	discPrice, discPriceTax int64 // price*(100-disc) in 1e-4; times (100+tax) in 1e-6
}

type refOrder struct {
	cust     int64
	date     time.Time
	priority string
	shipPrio int64
}

type refCust struct {
	name, address, phone, segment, comment string
	nation                                 int64
	acctbal                                int64
}

type refPart struct {
	brand, typ, container string
	size                  int64
}

type refNation struct {
	name   string
	region int64
}

type refData struct {
	lines   []refLine
	orders  map[int64]refOrder
	cust    map[int64]refCust
	part    map[int64]refPart
	supp    map[int64]int64 // supplier key -> nation key
	nation  map[int64]refNation
	region  map[int64]string
	partsup map[[2]int64]bool
}

// loadRef reads every table back through db (which has the views of
// CreateViews). Decimals are read as whole cents.
func loadRef(ctx context.Context, t *testing.T, db *sql.DB) *refData {
	t.Helper()
	d := &refData{orders: map[int64]refOrder{}, cust: map[int64]refCust{}, part: map[int64]refPart{},
		supp: map[int64]int64{}, nation: map[int64]refNation{}, region: map[int64]string{}, partsup: map[[2]int64]bool{}}
	each := func(q string, scan func(*sql.Rows) error) {
		rows, err := db.QueryContext(ctx, q)
		if err != nil {
			t.Fatalf("%s: %v", q, err)
		}
		defer rows.Close()
		for rows.Next() {
			if err := scan(rows); err != nil {
				t.Fatalf("%s: %v", q, err)
			}
		}
		if err := rows.Err(); err != nil {
			t.Fatalf("%s: %v", q, err)
		}
	}
	cents := func(col string) string { return "CAST(" + col + " * 100 AS BIGINT)" }
	each("SELECT l_orderkey, l_partkey, l_suppkey, "+cents("l_quantity")+", "+cents("l_extendedprice")+", "+
		cents("l_discount")+", "+cents("l_tax")+", l_returnflag, l_linestatus, l_shipdate, l_commitdate, "+
		"l_receiptdate, l_shipinstruct, l_shipmode FROM lineitem", func(r *sql.Rows) error {
		var l refLine
		err := r.Scan(&l.order, &l.part, &l.supp, &l.qty, &l.price, &l.disc, &l.tax, &l.rflag, &l.lstatus,
			&l.ship, &l.commit, &l.receipt, &l.instruct, &l.mode)
		l.discPrice = l.price * (100 - l.disc)
		l.discPriceTax = l.discPrice * (100 + l.tax)
		d.lines = append(d.lines, l)
		return err
	})
	each("SELECT o_orderkey, o_custkey, o_orderdate, o_orderpriority, o_shippriority FROM orders", func(r *sql.Rows) error {
		var k int64
		var o refOrder
		err := r.Scan(&k, &o.cust, &o.date, &o.priority, &o.shipPrio)
		d.orders[k] = o
		return err
	})
	each("SELECT c_custkey, c_name, c_address, c_nationkey, c_phone, "+cents("c_acctbal")+", c_mktsegment, c_comment FROM customer",
		func(r *sql.Rows) error {
			var k int64
			var c refCust
			err := r.Scan(&k, &c.name, &c.address, &c.nation, &c.phone, &c.acctbal, &c.segment, &c.comment)
			d.cust[k] = c
			return err
		})
	each("SELECT p_partkey, p_brand, p_type, p_container, p_size FROM part", func(r *sql.Rows) error {
		var k int64
		var p refPart
		err := r.Scan(&k, &p.brand, &p.typ, &p.container, &p.size)
		d.part[k] = p
		return err
	})
	each("SELECT ps_partkey, ps_suppkey FROM partsupp", func(r *sql.Rows) error {
		var k [2]int64
		err := r.Scan(&k[0], &k[1])
		d.partsup[k] = true
		return err
	})
	each("SELECT s_suppkey, s_nationkey FROM supplier", func(r *sql.Rows) error {
		var k, n int64
		err := r.Scan(&k, &n)
		d.supp[k] = n
		return err
	})
	each("SELECT n_nationkey, n_name, n_regionkey FROM nation", func(r *sql.Rows) error {
		var k int64
		var n refNation
		err := r.Scan(&k, &n.name, &n.region)
		d.nation[k] = n
		return err
	})
	each("SELECT r_regionkey, r_name FROM region", func(r *sql.Rows) error {
		var k int64
		var n string
		err := r.Scan(&k, &n)
		d.region[k] = n
		return err
	})
	return d
}

func day(y int, m time.Month, d int) time.Time { return time.Date(y, m, d, 0, 0, 0, 0, time.UTC) }

func in(t, lo, hi time.Time) bool { return !t.Before(lo) && t.Before(hi) } // [lo, hi)

// scaled is n / 10^exp as an exact rational.
func scaled(n int64, exp int) *big.Rat {
	den := new(big.Int).Exp(big.NewInt(10), big.NewInt(int64(exp)), nil)
	return new(big.Rat).SetFrac(big.NewInt(n), den)
}

func ratio(num, den *big.Rat) *big.Rat {
	if den.Sign() == 0 {
		return nil
	}
	return new(big.Rat).Quo(num, den)
}

// refRow is one expected result row: values are string, int64, time.Time,
// *big.Rat (exact) or float (approximate: compared with a relative
// tolerance, as DuckDB computes averages and divisions in DOUBLE).
type refRow []any

type approx float64

// near is a value printed to a given precision: it matches within abs.
type near struct{ v, abs float64 }

// refAnswers computes the expected result of each query by its id.
func refAnswers(d *refData) map[string][]refRow {
	return map[string][]refRow{
		"q1": refQ1(d), "q3": refQ3(d), "q5": refQ5(d), "q6": refQ6(d), "q8": refQ8(d),
		"q10": refQ10(d), "q12": refQ12(d), "q14": refQ14(d), "q19": refQ19(d),
	}
}

func refQ1(d *refData) []refRow {
	type acc struct{ qty, price, discPrice, charge, disc, n int64 }
	groups := map[[2]string]*acc{}
	cut := day(1998, 9, 2)
	for _, l := range d.lines {
		if l.ship.After(cut) {
			continue
		}
		k := [2]string{l.rflag, l.lstatus}
		a := groups[k]
		if a == nil {
			a = &acc{}
			groups[k] = a
		}
		a.qty += l.qty
		a.price += l.price
		a.discPrice += l.discPrice
		a.charge += l.discPriceTax
		a.disc += l.disc
		a.n++
	}
	var keys [][2]string
	for k := range groups {
		keys = append(keys, k)
	}
	sort.Slice(keys, func(i, j int) bool { return keys[i][0]+keys[i][1] < keys[j][0]+keys[j][1] })
	var out []refRow
	for _, k := range keys {
		a := groups[k]
		n := float64(a.n)
		out = append(out, refRow{k[0], k[1], scaled(a.qty, 2), scaled(a.price, 2), scaled(a.discPrice, 4),
			scaled(a.charge, 6), approx(float64(a.qty) / 100 / n), approx(float64(a.price) / 100 / n),
			approx(float64(a.disc) / 100 / n), a.n})
	}
	return out
}

func refQ3(d *refData) []refRow {
	cut := day(1995, 3, 15)
	rev := map[int64]int64{}
	for _, l := range d.lines {
		o := d.orders[l.order]
		if d.cust[o.cust].segment == "BUILDING" && o.date.Before(cut) && l.ship.After(cut) {
			rev[l.order] += l.discPrice
		}
	}
	keys := make([]int64, 0, len(rev))
	for k := range rev {
		keys = append(keys, k)
	}
	sort.Slice(keys, func(i, j int) bool {
		a, b := keys[i], keys[j]
		if rev[a] != rev[b] {
			return rev[a] > rev[b]
		}
		return d.orders[a].date.Before(d.orders[b].date)
	})
	var out []refRow
	for _, k := range keys[:min(10, len(keys))] {
		out = append(out, refRow{k, scaled(rev[k], 4), d.orders[k].date, d.orders[k].shipPrio})
	}
	return out
}

func refQ5(d *refData) []refRow {
	rev := map[string]int64{}
	for _, l := range d.lines {
		o := d.orders[l.order]
		cn, sn := d.cust[o.cust].nation, d.supp[l.supp]
		n := d.nation[sn]
		if cn == sn && d.region[n.region] == "ASIA" && in(o.date, day(1994, 1, 1), day(1995, 1, 1)) {
			rev[n.name] += l.discPrice
		}
	}
	var names []string
	for n := range rev {
		names = append(names, n)
	}
	sort.Slice(names, func(i, j int) bool { return rev[names[i]] > rev[names[j]] })
	var out []refRow
	for _, n := range names {
		out = append(out, refRow{n, scaled(rev[n], 4)})
	}
	return out
}

func refQ6(d *refData) []refRow {
	var sum int64
	for _, l := range d.lines {
		if in(l.ship, day(1994, 1, 1), day(1995, 1, 1)) && l.disc >= 5 && l.disc <= 7 && l.qty < 2400 {
			sum += l.price * l.disc
		}
	}
	return []refRow{{scaled(sum, 4)}}
}

func refQ8(d *refData) []refRow {
	type acc struct{ brazil, all int64 }
	years := map[int64]*acc{}
	for _, l := range d.lines {
		o := d.orders[l.order]
		cn := d.nation[d.cust[o.cust].nation]
		if d.part[l.part].typ != "ECONOMY ANODIZED STEEL" || d.region[cn.region] != "AMERICA" ||
			o.date.Before(day(1995, 1, 1)) || o.date.After(day(1996, 12, 31)) {
			continue
		}
		y := int64(o.date.Year())
		a := years[y]
		if a == nil {
			a = &acc{}
			years[y] = a
		}
		a.all += l.discPrice
		if d.nation[d.supp[l.supp]].name == "BRAZIL" {
			a.brazil += l.discPrice
		}
	}
	var ys []int64
	for y := range years {
		ys = append(ys, y)
	}
	sort.Slice(ys, func(i, j int) bool { return ys[i] < ys[j] })
	var out []refRow
	for _, y := range ys {
		share, _ := ratio(scaled(years[y].brazil, 4), scaled(years[y].all, 4)).Float64()
		out = append(out, refRow{y, approx(share)})
	}
	return out
}

func refQ10(d *refData) []refRow {
	rev := map[int64]int64{}
	for _, l := range d.lines {
		o := d.orders[l.order]
		if l.rflag == "R" && in(o.date, day(1993, 10, 1), day(1994, 1, 1)) {
			rev[o.cust] += l.discPrice
		}
	}
	keys := make([]int64, 0, len(rev))
	for k := range rev {
		keys = append(keys, k)
	}
	sort.Slice(keys, func(i, j int) bool { return rev[keys[i]] > rev[keys[j]] })
	var out []refRow
	for _, k := range keys[:min(20, len(keys))] {
		c := d.cust[k]
		out = append(out, refRow{k, c.name, scaled(rev[k], 4), scaled(c.acctbal, 2), d.nation[c.nation].name,
			c.address, c.phone, c.comment})
	}
	return out
}

func refQ12(d *refData) []refRow {
	type acc struct{ high, low int64 }
	modes := map[string]*acc{}
	for _, l := range d.lines {
		if (l.mode != "MAIL" && l.mode != "SHIP") || !l.commit.Before(l.receipt) || !l.ship.Before(l.commit) ||
			!in(l.receipt, day(1994, 1, 1), day(1995, 1, 1)) {
			continue
		}
		a := modes[l.mode]
		if a == nil {
			a = &acc{}
			modes[l.mode] = a
		}
		if p := d.orders[l.order].priority; p == "1-URGENT" || p == "2-HIGH" {
			a.high++
		} else {
			a.low++
		}
	}
	var out []refRow
	for _, m := range []string{"MAIL", "SHIP"} {
		if a := modes[m]; a != nil {
			out = append(out, refRow{m, a.high, a.low})
		}
	}
	return out
}

func refQ14(d *refData) []refRow {
	var promo, all int64
	for _, l := range d.lines {
		if !in(l.ship, day(1995, 9, 1), day(1995, 10, 1)) {
			continue
		}
		all += l.discPrice
		if strings.HasPrefix(d.part[l.part].typ, "PROMO") {
			promo += l.discPrice
		}
	}
	pct, _ := new(big.Rat).Mul(big.NewRat(100, 1), ratio(scaled(promo, 4), scaled(all, 4))).Float64()
	return []refRow{{approx(pct)}}
}

func refQ19(d *refData) []refRow {
	type branch struct {
		brand      string
		containers []string
		qty        int64 // lower bound in cents; the upper bound is 10 more
		maxSize    int64
	}
	branches := []branch{
		{"Brand#12", []string{"SM CASE", "SM BOX", "SM PACK", "SM PKG"}, 100, 5},
		{"Brand#23", []string{"MED BAG", "MED BOX", "MED PKG", "MED PACK"}, 1000, 10},
		{"Brand#34", []string{"LG CASE", "LG BOX", "LG PACK", "LG PKG"}, 2000, 15},
	}
	var sum int64
	for _, l := range d.lines {
		if (l.mode != "AIR" && l.mode != "AIR REG") || l.instruct != "DELIVER IN PERSON" {
			continue
		}
		p := d.part[l.part]
		for _, b := range branches {
			if p.brand == b.brand && contains(b.containers, p.container) && l.qty >= b.qty && l.qty <= b.qty+1000 &&
				p.size >= 1 && p.size <= b.maxSize {
				sum += l.discPrice
				break
			}
		}
	}
	return []refRow{{scaled(sum, 4)}}
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}
