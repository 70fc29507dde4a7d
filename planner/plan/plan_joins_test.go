package plan_test

import (
	"slices"
	"strings"
	"testing"

	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
)

const snowflake = `table sales {
  key id
  id         integer
  store_id   integer -> stores.id
  qty        integer
  region_or  = coalesce(stores.region, '?')
}
table stores {
  key id
  id           integer
  region       text
  district_id  integer -> districts.id
  area_or      = coalesce(districts.area, 'none')
}
table districts {
  key id
  id    integer
  area  text
}
measure units       = sum(sales.qty)
measure north_units = units where stores.region = 'North'
measure all_units   = units[drop stores.region]
measure region_avg  = avg(units per stores.region) where districts.area = 'Hills'
`

// planQuery plans a query on the model src.
func planQuery(t *testing.T, src, measures, by, where string) *plan.Plan {
	t.Helper()
	f, d := grammar.Parse("m.roll", src)
	if d.HasErrors() {
		t.Fatal(d)
	}
	req := model.Request{Measures: strings.Split(measures, ","), Where: where}
	if by != "" {
		req.By = strings.Split(by, ",")
	}
	return planOf(t, []*grammar.File{f}, req)
}

// planOf resolves the model files and the request, and plans it.
func planOf(t *testing.T, files []*grammar.File, req model.Request) *plan.Plan {
	t.Helper()
	m, d := model.Load(files)
	if d.HasErrors() {
		t.Fatal(d)
	}
	q, d := m.NewQuery(req)
	if d.HasErrors() {
		t.Fatal(d)
	}
	p, d := plan.NewPlan(q)
	if d.HasErrors() {
		t.Fatal(d)
	}
	return p
}

// innerTargets plans the query and lists, per scan, the tables its inner
// joins lead to, sorted ("scan: t1 t2").
func innerTargets(t *testing.T, measures, by, where string) []string {
	t.Helper()
	p := planQuery(t, snowflake, measures, by, where)
	var out []string
	for _, s := range p.Scans {
		var to []string
		for _, l := range s.Joins {
			if s.Inner[l] {
				to = append(to, l.To.Name)
			}
		}
		slices.Sort(to)
		out = append(out, strings.TrimSpace(s.Name+": "+strings.Join(to, " ")))
	}
	return out
}

// A row filter that cannot hold where a link finds no match makes the
// joins on the way to that table inner joins; one that can hold there
// (is null, coalesce, case) leaves them LEFT JOINs.
func TestInnerJoinsFromRowFilters(t *testing.T) {
	for _, c := range []struct{ where, want string }{
		{"", "sales:"},
		{"stores.region = 'North'", "sales: stores"},
		{"districts.area = 'Hills'", "sales: districts stores"},
		{"stores.region in ('North', 'South') and sales.qty > 1", "sales: stores"},
		{"districts.area between 'A' and 'K'", "sales: districts stores"},
		{"not (stores.region = 'North')", "sales: stores"},
		{"stores.region is not null", "sales: stores"},
		{"stores.region = 'North' or districts.area = 'Hills'", "sales: stores"},
		{"lower(stores.region) = 'north' or stores.id > 2", "sales: stores"},
		{"sales.qty > 1", "sales:"},
		{"sales.store_id = 1", "sales:"},
		{"stores.region is null", "sales:"},
		{"not (stores.region is null)", "sales: stores"}, // stores.region is not null, once the not is pushed inward
		{"stores.region = 'North' or stores.region is null", "sales:"},
		{"stores.region = 'North' or sales.qty > 1", "sales:"},
		{"coalesce(stores.region, 'x') = 'x'", "sales:"},
		{"coalesce(stores.region, districts.area) = 'x'", "sales: stores"},
		{"least(stores.region, 'a') = 'a'", "sales:"},
		{"case when stores.region = 'North' then true else false end", "sales:"},
		// A derived column of stores is NULL where the store is missing,
		// but its coalesce holds where only the district is.
		{"stores.area_or = 'none'", "sales: stores"},
		{"sales.region_or = '?'", "sales:"},
	} {
		got := innerTargets(t, "units", "", c.where)
		if len(got) != 1 || got[0] != c.want {
			t.Errorf("-w %q: inner joins %q, want %q", c.where, got, c.want)
		}
	}
}

// Narrowings and pins filter one aggregate, not the scan's rows; an edit
// that drops the filter reads rows the filter rejects; a per-grain
// sub-context's rows are filtered by its narrowing.
func TestInnerJoinsOnlyForTheScansRows(t *testing.T) {
	for _, c := range []struct {
		measures, by, where string
		want                []string
	}{
		{"units,north_units", "", "", []string{"sales:"}},
		{"units,all_units", "stores.region", "stores.region = 'North'", []string{"sales: stores", "all_units_sales:"}},
		{"region_avg", "", "", []string{"sales:", "region_avg_per_sales: districts stores"}},
	} {
		got := innerTargets(t, c.measures, c.by, c.where)
		if !slices.Equal(got, c.want) {
			t.Errorf("-m %s -b %q -w %q: inner joins %q, want %q", c.measures, c.by, c.where, got, c.want)
		}
	}
}

const required = `table lines {
  key id
  id        integer
  order_id  integer -> orders.id required
  part_id   integer
  supp_id   integer
  link (part_id, supp_id) -> offers (part_id, supp_id) required
  qty       integer
}
table orders {
  key id
  id       integer
  cust_id  integer -> customers.id
}
table customers {
  key id
  id         integer
  name       text
  nation_id  integer -> nations.id required
}
table offers {
  key part_id, supp_id
  part_id  integer -> parts.id required
  supp_id  integer -> suppliers.id
  cost     decimal
}
table parts {
  key id
  id    integer
  kind  text
}
table suppliers {
  key id
  id    integer
  name  text
}
table nations {
  key id
  id    integer
  name  text
}
measure qty = sum(lines.qty)
`

// planJoins plans a query on the model src and prints each scan's joins,
// "JOIN a.x -> b.y" or "LEFT a.x -> b.y", in the order they are rendered.
func planJoins(t *testing.T, src, measures, by, where string) []string {
	t.Helper()
	p := planQuery(t, src, measures, by, where)
	var out []string
	for _, s := range p.Scans {
		for _, l := range s.Joins {
			kind := "LEFT "
			if s.Inner[l] {
				kind = "JOIN "
			}
			out = append(out, kind+l.String())
		}
	}
	return out
}

// A required link is an inner join where its own table is always there;
// a table read only for the columns a required composite link matches is
// left out, and the next table joined on the first table's column.
func TestRequiredLinks(t *testing.T) {
	for _, c := range []struct {
		by, where string
		want      []string
	}{
		{"parts.kind", "", []string{"JOIN lines.part_id -> parts.id"}},
		// offers -> suppliers is not required.
		{"suppliers.name", "", []string{"LEFT lines.supp_id -> suppliers.id"}},
		{"parts.kind,suppliers.name", "suppliers.name <> 'x'",
			[]string{"JOIN lines.part_id -> parts.id", "JOIN lines.supp_id -> suppliers.id"}},
		// offers is read: no shortcut.
		{"parts.kind,offers.cost", "", []string{
			"JOIN lines.part_id, lines.supp_id -> offers.part_id, offers.supp_id", "JOIN offers.part_id -> parts.id"}},
		// customers is reached through a link that is not required, so
		// its required link to nations cannot drop rows either.
		{"nations.name", "", []string{"JOIN lines.order_id -> orders.id", "LEFT orders.cust_id -> customers.id",
			"LEFT customers.nation_id -> nations.id"}},
		{"nations.name", "customers.name = 'x'", []string{"JOIN lines.order_id -> orders.id", "JOIN orders.cust_id -> customers.id",
			"JOIN customers.nation_id -> nations.id"}},
	} {
		got := planJoins(t, required, "qty", c.by, c.where)
		if !slices.Equal(got, c.want) {
			t.Errorf("-b %s -w %q: joins\n%q\nwant\n%q", c.by, c.where, got, c.want)
		}
	}
}

// Without the promise the composite link is kept: a line with no offer
// reads NULL for the part.
func TestNoShortcutWithoutRequired(t *testing.T) {
	src := strings.Replace(required, "(part_id, supp_id) required", "(part_id, supp_id)", 1)
	got := planJoins(t, src, "qty", "parts.kind", "")
	want := []string{"LEFT lines.part_id, lines.supp_id -> offers.part_id, offers.supp_id", "LEFT offers.part_id -> parts.id"}
	if !slices.Equal(got, want) {
		t.Errorf("joins %q, want %q", got, want)
	}
}
