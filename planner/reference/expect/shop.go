package expect

import "math"

// shopModel is the shop of testdata/exec. Its rows (line = price * qty):
//
//	id store region area  item  price qty cost  line  cost*qty
//	1  1     North  Hills rose   2.50  4  1.00 10.00  4.00
//	2  1     North  Hills fern  10.00  1  6.00 10.00  6.00
//	3  2     North  Coast rose   2.50  2  1.00  5.00  2.00
//	4  3     South  Coast tulip  1.20 10  0.50 12.00  5.00
//	5  3     South  Coast rose   3.00  1  1.00  3.00  1.00
//	6  9     (no store: an unmatched link)  fern 10.00 2 6.00 20.00 12.00
//
//	repairs: store 1 (North) 30.00; store 3 (South) 45.50 and 10.00;
//	store 4 (South, no sales) 20.00.
var shopModel = []string{"testdata/exec/shop.roll"}

// shopCases are the hand-worked cases on the shop's measures.
var shopCases = []Case{
	// The total of a ratio is the ratio of the totals: not the sum (1.52) nor
	// the average (0.5067) of the rows' ratios.
	{Name: "ratio total is re-evaluated", Models: shopModel, Measures: "revenue,cost,margin_rate", By: "stores.region", Totals: "grand",
		Rows: []Row{
			{"stores.region": "North", "revenue": "25.00", "cost": "12.00", "margin_rate": 0.52, "rolled_up": None},                 // 10+10+5; 4+6+2; 13/25
			{"stores.region": "South", "revenue": "15.00", "cost": "6.00", "margin_rate": 0.6, "rolled_up": None},                   // 12+3; 5+1; 9/15
			{"stores.region": nil, "revenue": "20.00", "cost": "12.00", "margin_rate": 0.4, "rolled_up": None},                      // unmatched link: 20; 12; 8/20
			{"stores.region": nil, "revenue": "60.00", "cost": "30.00", "margin_rate": 0.5, "rolled_up": []string{"stores.region"}}, // 30/60
		}},
	// A count distinct total is not the sum of the rows' counts (2+2+1 = 5).
	{Name: "distinct count total", Models: shopModel, Measures: "items,lines", By: "stores.region", Totals: "grand",
		Rows: []Row{
			{"stores.region": "North", "items": 2, "lines": 3},                                     // rose, fern
			{"stores.region": "South", "items": 2, "lines": 2},                                     // tulip, rose
			{"stores.region": nil, "items": 1, "lines": 1},                                         // fern
			{"stores.region": nil, "items": 3, "lines": 6, "rolled_up": []string{"stores.region"}}, // rose, fern, tulip
		}},
	// sum(a*b) is computed row by row and differs from sum(a)*sum(b).
	{Name: "sum of a product is row by row", Models: shopModel, Measures: "qty_sq,qty_product", By: "stores.region", Totals: "grand",
		Rows: []Row{
			{"stores.region": "North", "qty_sq": 21, "qty_product": 49},   // 16+1+4; 7*7
			{"stores.region": "South", "qty_sq": 101, "qty_product": 121}, // 100+1; 11*11
			{"stores.region": nil, "qty_sq": 4, "qty_product": 4},         // 2*2
			{"stores.region": nil, "qty_sq": 126, "qty_product": 400},     // 21+101+4; 20*20
		}},
	// Measures over two iteration tables meet on the group keys: no join
	// multiplies a row (a naive sales-repairs join would double South's
	// revenue to 30 and its fees to 111).
	{Name: "two iteration tables, no fan-out", Models: shopModel, Measures: "revenue,fees,jobs,takings,per_job", By: "stores.region", Totals: "grand",
		Rows: []Row{
			{"stores.region": "North", "revenue": "25.00", "fees": "30.00", "jobs": 1, "takings": "55.00", "per_job": 30.0},
			{"stores.region": "South", "revenue": "15.00", "fees": "75.50", "jobs": 3, "takings": "90.50", "per_job": 75.5 / 3}, // 45.5+10+20
			{"stores.region": nil, "revenue": "20.00", "fees": nil, "jobs": 0, "takings": "20.00", "per_job": nil},              // no repairs: count 0, sum null
			{"stores.region": nil, "revenue": "60.00", "fees": "105.50", "jobs": 4, "takings": "165.50", "per_job": 105.5 / 4},
		}},
	// Rollup over a snowflake (sales -> stores -> districts): each subtotal is
	// re-evaluated over its own cell, and comes after its group.
	{Name: "rollup over a snowflake", Models: shopModel, Measures: "revenue,units", By: "districts.area,sales.item", Totals: "rollup",
		Rows: []Row{
			{"districts.area": "Coast", "sales.item": "rose", "revenue": "8.00", "units": 3, "rolled_up": None}, // 5+3; 2+1
			{"districts.area": "Coast", "sales.item": "tulip", "revenue": "12.00", "units": 10},
			{"districts.area": "Coast", "sales.item": nil, "revenue": "20.00", "units": 13, "rolled_up": total("sales.item")},
			{"districts.area": "Hills", "sales.item": "fern", "revenue": "10.00", "units": 1},
			{"districts.area": "Hills", "sales.item": "rose", "revenue": "10.00", "units": 4},
			{"districts.area": "Hills", "sales.item": nil, "revenue": "20.00", "units": 5, "rolled_up": total("sales.item")},
			{"districts.area": nil, "sales.item": "fern", "revenue": "20.00", "units": 2, "rolled_up": None}, // the unmatched line
			{"districts.area": nil, "sales.item": nil, "revenue": "20.00", "units": 2, "rolled_up": total("sales.item")},
			{"districts.area": nil, "sales.item": nil, "revenue": "60.00", "units": 20, "rolled_up": total("districts.area", "sales.item")},
		}},
	// --totals all: every subset of the groups, each re-evaluated.
	{Name: "totals all", Models: shopModel, Measures: "units", By: "stores.region,sales.item", Totals: "all",
		Rows: []Row{
			{"stores.region": "North", "sales.item": "fern", "units": 1},
			{"stores.region": "North", "sales.item": "rose", "units": 6}, // 4+2
			{"stores.region": "North", "sales.item": nil, "units": 7, "rolled_up": total("sales.item")},
			{"stores.region": "South", "sales.item": "rose", "units": 1},
			{"stores.region": "South", "sales.item": "tulip", "units": 10},
			{"stores.region": "South", "sales.item": nil, "units": 11},
			{"stores.region": nil, "sales.item": "fern", "units": 2, "rolled_up": None},
			{"stores.region": nil, "sales.item": nil, "units": 2, "rolled_up": total("sales.item")},
			{"stores.region": nil, "sales.item": "fern", "units": 3, "rolled_up": total("stores.region")}, // 1+2
			{"stores.region": nil, "sales.item": "rose", "units": 7, "rolled_up": total("stores.region")}, // 4+2+1
			{"stores.region": nil, "sales.item": "tulip", "units": 10, "rolled_up": total("stores.region")},
			{"stores.region": nil, "sales.item": nil, "units": 20, "rolled_up": total("stores.region", "sales.item")},
		}},
	// A --where filter applies to every cell, totals included; a narrowing
	// applies inside its measure only.
	{Name: "filter and narrowing", Models: shopModel, Measures: "revenue,roses,rose_share", By: "stores.region", Where: "stores.region = 'North'", Totals: "grand",
		Rows: []Row{
			{"stores.region": "North", "revenue": "25.00", "roses": "15.00", "rose_share": 0.6}, // roses 10+5
			{"stores.region": nil, "revenue": "25.00", "roses": "15.00", "rose_share": 0.6, "rolled_up": total("stores.region")},
		}},
	{Name: "filter on a row column", Models: shopModel, Measures: "revenue", By: "sales.item", Where: "sales.qty >= 2",
		Rows: []Row{
			{"sales.item": "fern", "revenue": "20.00"},  // line 6 only
			{"sales.item": "rose", "revenue": "15.00"},  // 10+5
			{"sales.item": "tulip", "revenue": "12.00"}, // line 4
		}},
	// Statistics: avg, the continuous median, the sample stddev and variance.
	{Name: "statistics", Models: shopModel, Measures: "avg_price,mid_line,line_sd,line_var,cheapest",
		Rows: []Row{{
			"avg_price": 29.2 / 6,        // (2.5+10+2.5+1.2+3+10)/6
			"mid_line":  10.0,            // lines 3,5,10,10,12,20: (10+10)/2
			"line_var":  35.6,            // mean 10; squares 0+0+25+4+49+100 = 178; 178/(6-1)
			"line_sd":   math.Sqrt(35.6), // sample standard deviation
			"cheapest":  "1.20",
			"rolled_up": None,
		}}},
	// --order and --limit sort and cut the detail rows; the total row stays,
	// computed over every row, not just the ones shown.
	{Name: "order and limit", Models: shopModel, Measures: "revenue", By: "sales.item", Order: "revenue desc", Limit: 2, Totals: "grand",
		Rows: []Row{
			{"sales.item": "fern", "revenue": "30.00"}, // 10+20
			{"sales.item": "rose", "revenue": "18.00"}, // 10+5+3
			{"sales.item": nil, "revenue": "60.00", "rolled_up": total("sales.item")},
		}},
	// Without total rows --limit keeps the first N rows of the order: ties on
	// the measure are broken by the group values, NULLs last, in the measure
	// and in the groups alike. Lines per store: 1: 2, 2: 1, 3: 2, 9: 1.
	{Name: "limit: ties", Models: shopModel, Measures: "lines", By: "sales.store_id", Order: "lines desc", Limit: 3,
		Rows: []Row{
			{"sales.store_id": 1, "lines": 2}, // tie with store 3, which comes after
			{"sales.store_id": 3, "lines": 2},
			{"sales.store_id": 2, "lines": 1}, // tie with store 9, cut
		}},
	{Name: "limit: ties, with the total", Models: shopModel, Measures: "lines", By: "sales.store_id", Order: "lines desc", Limit: 3, Totals: "grand",
		Rows: []Row{
			{"sales.store_id": 1, "lines": 2},
			{"sales.store_id": 3, "lines": 2},
			{"sales.store_id": 2, "lines": 1},
			{"sales.store_id": nil, "lines": 6, "rolled_up": total("sales.store_id")}, // over every row
		}},
	// South has the most fees, North 30, the unmatched line's row none.
	{Name: "limit: NULLs last ascending", Models: shopModel, Measures: "revenue,fees", By: "stores.region", Order: "fees", Limit: 2,
		Rows: []Row{
			{"stores.region": "North", "fees": "30.00"},
			{"stores.region": "South", "fees": "75.50"},
		}},
	{Name: "limit: NULLs last descending", Models: shopModel, Measures: "revenue,fees", By: "stores.region", Order: "fees desc", Limit: 1,
		Rows: []Row{{"stores.region": "South", "fees": "75.50"}}},
	// Without --order, by the group values: the NULL region comes last.
	{Name: "limit: by the group values", Models: shopModel, Measures: "revenue", By: "stores.region", Limit: 2,
		Rows: []Row{
			{"stores.region": "North", "revenue": "25.00"},
			{"stores.region": "South", "revenue": "15.00"},
		}},
	{Name: "limit: a NULL group in the order", Models: shopModel, Measures: "revenue", By: "stores.region", Order: "revenue", Limit: 2,
		Rows: []Row{
			{"stores.region": "South", "revenue": "15.00"},
			{"stores.region": nil, "revenue": "20.00"},
		}},
	// A filter that keeps no row leaves the grand total cell: sum of nothing is
	// null, count of nothing is 0.
	{Name: "empty cell", Models: shopModel, Measures: "revenue,lines", By: "stores.region", Where: "stores.region = 'East'", Totals: "grand",
		Rows: []Row{
			{"stores.region": nil, "revenue": nil, "lines": 0, "rolled_up": total("stores.region")},
		}},
}
