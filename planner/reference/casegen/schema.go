package casegen

import (
	"fmt"
	"strings"
)

// table is a generated table: an iteration (fact) table or a dimension.
type table struct {
	name  string
	fact  bool
	cols  []*column
	links []*link
	// nkey is the number of leading columns that form the key (1 unless
	// composite).
	nkey  int
	nrows int
	// rows hold the CSV fields of the stored columns, in stored order.
	rows [][]string
}

// column is a stored or derived column.
type column struct {
	t    *table
	name string
	typ  string
	// derived is the row expression of a derived column (own columns
	// written bare), or "".
	derived     string
	nonadditive bool
	key         bool
	// vals are the literal values a stored column draws from, in the
	// language's syntax, with raw their CSV spelling; nullPct is the
	// chance of a NULL.
	vals    []string
	raw     []string
	nullPct int
	link    *link
}

// link is a many-to-one link from one column to a table's key, or a
// composite link from several columns (fromCols) to a composite key.
type link struct {
	from     *column
	to       *table
	fromCols []*column
	// required links are declared `required`, and every row's link
	// finds its row (the data is drawn so).
	required bool
	// undeclared: the column holds keys of to, but the model reaches to
	// another way (the first iteration table reaches stores through
	// shelves), so the link is not written.
	undeclared bool
}

func (c *column) ref() string { return quoted(c.t.name) + "." + quoted(c.name) }

// quoted writes a name in backquotes when it is not a plain identifier.
func quoted(name string) string {
	if strings.ContainsAny(name, ".` ") {
		return "`" + name + "`"
	}
	return name
}

// exactType reports whether the column's values compare exactly.
func (c *column) exactType() bool { return c.typ != "float" }

func (c *column) numeric() bool {
	return c.typ == "integer" || c.typ == "decimal" || c.typ == "float"
}

// groupable columns make good group columns, filters and per columns.
func (c *column) groupable() bool { return c.typ != "float" && !c.nonadditive }

func (t *table) col(name string) *column {
	for _, c := range t.cols {
		if c.name == name {
			return c
		}
	}
	return nil
}

func (t *table) stored() []*column {
	var out []*column
	for _, c := range t.cols {
		if c.derived == "" {
			out = append(out, c)
		}
	}
	return out
}

func (t *table) add(c *column) *column {
	c.t = t
	t.cols = append(t.cols, c)
	return c
}

// pool is the values a column draws from: literals in the language's
// syntax and their CSV spelling.
type pool struct{ lits, raw []string }

func textVals(vs ...string) pool {
	lits := make([]string, len(vs))
	for i, v := range vs {
		lits[i] = "'" + strings.ReplaceAll(v, "'", "''") + "'"
	}
	return pool{lits, vs}
}

func plainVals(vs ...string) pool { return pool{vs, vs} }

func dateVals(vs ...string) pool {
	lits := make([]string, len(vs))
	for i, v := range vs {
		lits[i] = "date '" + v + "'"
	}
	return pool{lits, vs}
}

func attr(name, typ string, nullPct int, p pool) *column {
	return &column{name: name, typ: typ, vals: p.lits, raw: p.raw, nullPct: nullPct}
}

// drawSchema draws the tables: optional dimensions stores (snowflaked to
// districts or not) and items, then one to three iteration tables, each
// linking to some dimensions or, for a later one, to an earlier
// iteration table.
func (g *gen) drawSchema() {
	var dims []*table
	if !g.chance(20) {
		stores := &table{name: "stores"}
		stores.add(&column{name: "id", typ: "integer", key: true})
		stores.add(attr("region", "text", 20, textVals("North", "South", "East", "O'Hare")))
		if g.chance(60) {
			stores.add(attr("size", "integer", 20, plainVals("1", "2", "3")))
		}
		if g.chance(25) {
			// A derived column on a dimension: an unmatched link makes it
			// NULL, like the dimension's stored columns.
			stores.add(&column{name: "zone", typ: "text", derived: "coalesce(region, 'none')"})
		}
		dims = append(dims, stores)
		if g.chance(50) {
			districts := &table{name: "districts"}
			districts.add(&column{name: "id", typ: "integer", key: true})
			districts.add(attr("area", "text", 15, textVals("Hills", "Coast", "Lake, Upper")))
			districts.add(attr("tier", "integer", 0, plainVals("1", "2")))
			dc := stores.add(attr("district_id", "integer", 15, pool{}))
			dc.link = &link{from: dc, to: districts, required: g.chance(30)}
			stores.links = append(stores.links, dc.link)
			dims = append(dims, districts)
		}
		if g.chance(30) {
			// Look-alike names: stores.`region.label` and
			// `stores.region`.label are two columns that print alike
			// without their backquotes (keys once collided on that).
			look := &table{name: "stores.region"}
			look.add(&column{name: "id", typ: "integer", key: true})
			look.add(attr("label", "text", 10, textVals("A", "B")))
			stores.add(attr("region.label", "text", 10, textVals("A", "B")))
			lc := stores.add(attr("region_id", "integer", 15, pool{}))
			lc.link = &link{from: lc, to: look}
			stores.links = append(stores.links, lc.link)
			dims = append(dims, look)
		}
	}
	var shelves *table
	if len(dims) > 0 && dims[0].name == "stores" && g.chance(45) {
		// A composite key: one row per store and aisle (1 and 2).
		shelves = &table{name: "shelves", nkey: 2}
		shelves.add(&column{name: "store_id", typ: "integer", key: true})
		shelves.add(&column{name: "aisle", typ: "integer", key: true})
		shelves.add(attr("label", "text", 15, textVals("top", "bottom", "end")))
		if g.chance(60) {
			// Shelves reach stores, and the first iteration table reaches
			// stores only through shelves (one path to a table), as
			// TPC-H's lineitem reaches part through partsupp. Every store
			// has its shelves, so the link always finds its row.
			sc := shelves.cols[0]
			sc.link = &link{from: sc, to: dims[0], required: g.chance(50)}
			shelves.links = append(shelves.links, sc.link)
		}
		dims = append(dims, shelves)
	}
	if g.chance(60) {
		items := &table{name: "items"}
		items.add(&column{name: "code", typ: "text", key: true})
		items.add(attr("family", "text", 15, textVals("Roses", "Ferns", "Tools")))
		items.add(attr("weight", "decimal", 15, plainVals("0.50", "1.25", "2.00", "3.10")))
		if g.chance(40) {
			items.add(attr("heavy", "boolean", 10, plainVals("true", "false")))
		}
		dims = append(dims, items)
	}
	if g.chance(30) {
		// A calendar (issue 12): a table keyed by a date that the facts
		// reach through a link. Time edits move its key (D reached through
		// a link), and constraints on its columns are time-bound: its
		// month and year are computed from the key alone, its season is
		// stored. Its days fall around month ends and on a leap day; a
		// fact's day it lacks (calendarMissing) finds no row.
		days := &table{name: "days"}
		key := days.add(&column{name: "day", typ: "date", key: true})
		p := dateVals(calendarDays...)
		key.vals, key.raw = p.lits, p.raw
		days.add(&column{name: "month", typ: "date", derived: "date_trunc(month, day)"})
		days.add(&column{name: "yr", typ: "integer", derived: "extract(year from day)"})
		days.add(&column{name: "qtr", typ: "date", derived: "date_trunc(quarter, day)"})
		days.add(attr("season", "text", 10, textVals("wet", "dry")))
		dims = append(dims, days)
	}
	maxFacts := g.o.Facts
	if maxFacts < 1 || maxFacts > 3 {
		maxFacts = 3
	}
	nf := g.intn(1, maxFacts)
	names := []string{"sales", "returns", "visits"}
	var facts []*table
	for i := 0; i < nf; i++ {
		f := &table{name: names[i], fact: true}
		f.add(&column{name: "id", typ: "integer", key: true})
		if i > 0 && g.chance(30) {
			// A chain of iteration tables: this one reaches the first one
			// and, through it, its dimensions.
			fk := f.add(attr("sale_id", "integer", 10, pool{}))
			fk.link = &link{from: fk, to: facts[0]}
			f.links = append(f.links, fk.link)
		} else {
			for _, d := range dims {
				if d.name == "districts" || d.name == "shelves" || d.name == "stores.region" {
					continue
				}
				if i == 0 || g.chance(70) {
					key := d.cols[0]
					fk := f.add(attr(strings.TrimSuffix(d.name, "s")+"_"+key.name, key.typ, 10, pool{}))
					fk.link = &link{from: fk, to: d, required: g.chance(30)}
					if i == 0 && shelves != nil && reaches(shelves, d) {
						fk.link.undeclared = true
						continue
					}
					f.links = append(f.links, fk.link)
				}
			}
		}
		if sc := f.col("store_id"); sc != nil && i == 0 {
			for _, d := range dims {
				if d.name == "shelves" {
					l := &link{to: d, required: g.chance(60)}
					aisle := attr("aisle", "integer", 10, plainVals("1", "2", "3"))
					if l.required {
						// Every sale finds its shelf: a store's aisle 1 or 2.
						aisle = attr("aisle", "integer", 0, plainVals("1", "2"))
						sc.link.required = true
					}
					l.fromCols = []*column{sc, f.add(aisle)}
					f.links = append(f.links, l)
				}
			}
		}
		g.factColumns(f)
		facts = append(facts, f)
	}
	g.tables = append(facts, dims...)
}

// factColumns adds an iteration table's measure columns, attributes and
// derived columns.
func (g *gen) factColumns(f *table) {
	qty := f.add(attr("qty", "integer", 10, plainVals("0", "1", "2", "3", "4", "5", "7", "9")))
	var price, amount *column
	if g.chance(70) {
		price = f.add(attr("price", "decimal", 10, plainVals("0.50", "1.20", "2.50", "3.00", "9.99", "10.00", "20.00")))
		price.nonadditive = true
	}
	if g.chance(70) {
		amount = f.add(attr("amount", "decimal", 10, plainVals("-5.00", "0.00", "1.10", "2.25", "7.50", "12.00", "40.40")))
	}
	if g.chance(50) {
		f.add(attr("score", "float", 10, plainVals("-2.5", "0.25", "0.5", "1", "3.75", "8")))
	}
	if g.chance(70) {
		f.add(attr("tag", "text", 15, textVals("a", "b", "c", "x y", "A", "a ")))
	}
	day := (*column)(nil)
	if g.chance(60) {
		day = f.add(attr("day", "date", 10, dateVals("2024-02-29", "2025-12-31", "2026-01-05", "2026-01-31", "2026-02-01", "2026-02-14", "2026-03-30")))
	}
	if g.chance(30) {
		f.add(attr("paid", "boolean", 10, plainVals("true", "false")))
	}
	var seen *column
	if g.chance(25) {
		seen = f.add(attr("seen_at", "timestamp", 10, pool{
			lits: []string{"timestamp '2026-01-05 10:30:00'", "timestamp '2026-01-05 23:59:59'", "timestamp '2026-02-01 00:00:00'", "timestamp '2026-03-30 08:15:00'"},
			raw:  []string{"2026-01-05 10:30:00", "2026-01-05 23:59:59", "2026-02-01 00:00:00", "2026-03-30 08:15:00"}}))
	}
	if price != nil && g.chance(60) {
		f.add(&column{name: "line", typ: "decimal", derived: "price * qty"})
	}
	if g.chance(40) {
		// 'Big' and 'big ' differ from 'big' only by case and a trailing
		// space: text is compared byte by byte, literals included.
		f.add(&column{name: "band", typ: "text", derived: "case when qty >= 5 then 'big' when qty = 0 then 'Big' when qty = 1 then 'big ' when qty is null then 'none' else 'small' end"})
	}
	if day != nil && g.chance(40) {
		f.add(&column{name: "month", typ: "date", derived: "date_trunc(month, day)"})
	}
	if day != nil && g.chance(20) {
		f.add(&column{name: "mon", typ: "integer", derived: "extract(month from day)"})
	}
	if day != nil && g.chance(20) {
		f.add(&column{name: "qtr", typ: "date", derived: "date_trunc(quarter, day)"})
	}
	if day != nil && g.chance(15) {
		f.add(&column{name: "yr", typ: "integer", derived: "extract(year from day)"})
	}
	if seen != nil && g.chance(50) {
		f.add(&column{name: "seen_day", typ: "timestamp", derived: "date_trunc(day, seen_at)"})
	}
	for _, l := range f.links {
		if l.to.name == "stores" && l.fromCols == nil && g.chance(30) {
			// A derived column reading a dimension along a link: an
			// unmatched store reads NULL, which coalesce replaces.
			f.add(&column{name: "region_or", typ: "text", derived: "coalesce(stores.region, '?')"})
		}
	}
	_ = qty
	_ = amount
}

// drawData draws each table's rows: keys numbered from 1, link columns
// mostly matching, sometimes unmatched or NULL, attributes from their
// value lists with some NULLs.
func (g *gen) drawData() {
	for i := len(g.tables) - 1; i >= 0; i-- {
		t := g.tables[i]
		if t.fact {
			t.nrows = g.intn(0, g.o.MaxFactRows)
		} else {
			t.nrows = g.intn(1, 6)
		}
	}
	for _, t := range g.tables {
		if t.name == "shelves" {
			t.nrows = 0
			for st := 1; st <= t.nrowsOf(g, "stores"); st++ {
				for a := 1; a <= 2; a++ {
					label := ""
					if g.intn(0, 99) >= t.cols[2].nullPct {
						label = t.cols[2].raw[g.pick(len(t.cols[2].raw))]
					}
					t.rows = append(t.rows, []string{fmt.Sprint(st), fmt.Sprint(a), label})
					t.nrows++
				}
			}
			continue
		}
		stored := t.stored()
		for r := 0; r < t.nrows; r++ {
			row := make([]string, len(stored))
			for j, c := range stored {
				row[j] = g.field(c, r)
			}
			t.rows = append(t.rows, row)
		}
	}
}

// nrowsOf is the number of rows of the table called name (0 if none).
func (t *table) nrowsOf(g *gen, name string) int {
	for _, x := range g.tables {
		if x.name == name {
			return x.nrows
		}
	}
	return 0
}

// calendarDays are the calendar's days, in row order (a calendar has at
// most six rows: dims draw 1 to 6); calendarMissing is a day it never has.
var calendarDays = []string{"2025-12-31", "2026-01-31", "2024-02-29", "2026-02-28", "2025-02-28", "2026-03-31"}

const calendarMissing = "2026-03-30"

// keyValue is the key of row r of a table, as CSV text.
func keyValue(c *column, r int) string {
	switch c.typ {
	case "text":
		return fmt.Sprintf("k%d", r+1)
	case "date":
		return calendarDays[r%len(calendarDays)]
	}
	return fmt.Sprint(r + 1)
}

// unmatchedKey is a link value that finds no row of its table.
func unmatchedKey(c *column) string {
	switch c.typ {
	case "text":
		return "zz"
	case "date":
		return calendarMissing
	}
	return "99"
}

func (g *gen) field(c *column, r int) string {
	switch {
	case c.key:
		return keyValue(c, r)
	case c.link != nil && c.link.required:
		return keyValue(c.link.to.cols[0], g.pick(c.link.to.nrows))
	case c.link != nil:
		to := c.link.to
		switch k := g.intn(0, 19); {
		case k < c.nullPct/5:
			return ""
		case k == 19 || to.nrows == 0:
			return unmatchedKey(c)
		default:
			return keyValue(to.cols[0], g.pick(to.nrows))
		}
	}
	if g.intn(0, 99) < c.nullPct {
		return ""
	}
	return c.raw[g.pick(len(c.raw))]
}

// csv renders a table's stored columns as CSV.
func (t *table) csv() string {
	var b strings.Builder
	stored := t.stored()
	for i, c := range stored {
		if i > 0 {
			b.WriteByte(',')
		}
		b.WriteString(c.name)
	}
	b.WriteByte('\n')
	for _, row := range t.rows {
		for i, f := range row {
			if i > 0 {
				b.WriteByte(',')
			}
			if strings.ContainsAny(f, ",\"\n") {
				f = "\"" + strings.ReplaceAll(f, "\"", "\"\"") + "\""
			}
			b.WriteString(f)
		}
		b.WriteByte('\n')
	}
	return b.String()
}

// reach lists the tables reachable from t along links, t first.
func reach(t *table) []*table {
	out := []*table{t}
	for i := 0; i < len(out); i++ {
		for _, l := range out[i].links {
			out = append(out, l.to)
		}
	}
	return out
}

func reaches(from, to *table) bool {
	for _, t := range reach(from) {
		if t == to {
			return true
		}
	}
	return false
}

// common lists the columns reachable from every table of ts, filtered.
func (g *gen) common(ts []*table, keep func(*column) bool) []*column {
	var out []*column
	for _, t := range g.tables {
		all := len(ts) > 0
		for _, from := range ts {
			all = all && reaches(from, t)
		}
		if !all {
			continue
		}
		for _, c := range t.cols {
			if keep == nil || keep(c) {
				out = append(out, c)
			}
		}
	}
	return out
}

// roots are the tables no link points at.
func (g *gen) roots() []*table {
	pointed := map[*table]bool{}
	for _, t := range g.tables {
		for _, l := range t.links {
			pointed[l.to] = true
		}
	}
	var out []*table
	for _, t := range g.tables {
		if !pointed[t] {
			out = append(out, t)
		}
	}
	return out
}

// modelText prints the tables and measures as a .roll file.
func (g *gen) modelText() string {
	var b strings.Builder
	b.WriteString("-- generated by casegen\n")
	for _, t := range g.tables {
		keys := []string{quoted(t.cols[0].name)}
		if t.nkey == 2 {
			keys = append(keys, quoted(t.cols[1].name))
		}
		fmt.Fprintf(&b, "\ntable %s from \"%s.csv\" {\n  key %s\n", quoted(t.name), t.name, strings.Join(keys, ", "))
		for _, c := range t.cols {
			if c.derived != "" {
				fmt.Fprintf(&b, "  %s = %s\n", c.name, c.derived)
				continue
			}
			fmt.Fprintf(&b, "  %s %s", quoted(c.name), c.typ)
			if c.link != nil && !c.link.undeclared {
				fmt.Fprintf(&b, " -> %s", c.link.to.cols[0].ref())
				if c.link.required {
					b.WriteString(" required")
				}
			}
			if c.nonadditive {
				b.WriteString(" nonadditive")
			}
			b.WriteByte('\n')
		}
		for _, l := range t.links {
			if l.fromCols != nil {
				fmt.Fprintf(&b, "  link (%s, %s) -> %s (%s, %s)", l.fromCols[0].name, l.fromCols[1].name,
					l.to.name, l.to.cols[0].name, l.to.cols[1].name)
				if l.required {
					b.WriteString(" required")
				}
				b.WriteByte('\n')
			}
		}
		b.WriteString("}\n")
	}
	b.WriteByte('\n')
	for _, m := range g.measures {
		fmt.Fprintf(&b, "measure %s = %s\n", m.name, m.text)
	}
	return b.String()
}
