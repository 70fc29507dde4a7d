package main

import "testing"

// Inner joins from row filters, on links that find no match. The rows of
// testdata/joins:
//
//	sale store qty  store region district  district area
//	1    1     2    1     North  1         1        Hills
//	2    2     3    2     (null) 2         2        Coast
//	3    3     4    3     South  9 (no such district)
//	4    9     5    (no such store)
//	5    (null) 6   (no store)
//
// sales.region_or = coalesce(stores.region, '?'); stores.area_or =
// coalesce(districts.area, 'none'), NULL where the store is missing.
// A filter on a table's column rejects the rows whose link to it finds
// nothing, so the SQL joins it with an inner join; the results are those
// of LEFT JOINs.

const joinsModel = "../../testdata/joins/joins.roll"

// A filter on the district's area rejects sales 3 (no district), 4 and 5
// (no store): inner joins to stores and districts drop only those.
func TestInnerJoinFilterOnLinkedColumn(t *testing.T) {
	t.Parallel()
	got := runJSON(t, "run", joinsModel, "-m", "units", "-b", "stores.region", "-w", "districts.area in ('Hills', 'Coast')", "--totals", "grand")
	expectRows(t, got, []row{
		{"stores.region": "North", "units": 2, "rolled_up": none},                  // sale 1
		{"stores.region": nil, "units": 3, "rolled_up": none},                      // sale 2: store 2 has no region
		{"stores.region": nil, "units": 5, "rolled_up": []string{"stores.region"}}, // 2+3
	})
}

// `or ... is null` keeps the rows whose store is missing: LEFT JOIN.
func TestLeftJoinFilterWithIsNull(t *testing.T) {
	t.Parallel()
	got := runJSON(t, "run", joinsModel, "-m", "units", "-b", "stores.region", "-w", "stores.region = 'North' or stores.region is null", "--totals", "grand")
	expectRows(t, got, []row{
		{"stores.region": "North", "units": 2, "rolled_up": none},                   // sale 1
		{"stores.region": nil, "units": 14, "rolled_up": none},                      // sales 2, 4, 5: 3+5+6
		{"stores.region": nil, "units": 16, "rolled_up": []string{"stores.region"}}, // 2+14
	})
}

// A derived column with coalesce over a further link: stores.area_or
// holds for store 3, whose district is missing (the join to districts
// stays a LEFT JOIN), and is NULL where the store is missing (the join
// to stores is inner). sales.region_or holds where the store is missing.
func TestDerivedCoalesceOverFurtherLink(t *testing.T) {
	t.Parallel()
	got := runJSON(t, "run", joinsModel, "-m", "units", "-b", "stores.region", "-w", "stores.area_or = 'none'")
	expectRows(t, got, []row{
		{"stores.region": "South", "units": 4}, // sale 3 only
	})
	got = runJSON(t, "run", joinsModel, "-m", "units", "-b", "sales.store_id", "-w", "sales.region_or = '?'")
	expectRows(t, got, []row{
		{"sales.store_id": 2, "units": 3}, // store 2 has no region
		{"sales.store_id": 9, "units": 5}, // no such store
		{"sales.store_id": nil, "units": 6},
	})
}

// A narrowing filters its own aggregate, not the rows of the others; an
// edit that drops the filter reads every row, unmatched links included.
func TestInnerJoinNotFromNarrowingOrDroppedFilter(t *testing.T) {
	t.Parallel()
	got := runJSON(t, "run", joinsModel, "-m", "units,north_units")
	expectRows(t, got, []row{
		{"units": 20, "north_units": 2}, // 2+3+4+5+6; sale 1
	})
	got = runJSON(t, "run", joinsModel, "-m", "units,all_units", "-b", "stores.region", "-w", "stores.region = 'North'")
	expectRows(t, got, []row{
		{"stores.region": "North", "units": 2, "all_units": 20}, // the drop removes the filter: all five sales
	})
}
