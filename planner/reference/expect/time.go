package expect

// total lists the group columns a total row rolls up.
var total = func(cols ...string) []string { return cols }

// timeModel holds orders over two years and a half, a calendar and a
// stock snapshot. The orders (amount by day and shop):
//
//	1 2024-02-29 a 100   (a leap day)
//	2 2025-01-31 a  10   3 2025-02-28 a 20   4 2025-03-15 b 7   5 2025-03-31 b 30
//	6 2026-01-15 a   1   7 2026-02-28 b  2   8 2026-03-01 a  3
//
// `back N UNIT` takes the rows whose day, moved forward N units, meets
// the cell's time-bound constraints; a month move clamps to the month's
// last day (2024-02-29 plus 1 year is 2025-02-28; 2025-01-31 plus 1 month
// is 2025-02-28).
var timeModel = []string{"testdata/exec/time.roll"}

// timeCases are the hand-worked time edit cases.
var timeCases = []Case{
	{Models: timeModel, Name: "months", Measures: "revenue,rev_ly,rev_lm,rev_same,closing,opening", By: "orders.month", Totals: "grand",
		Rows: []Row{
			// back 0 day is the measure itself (rev_same = revenue everywhere).
			{"orders.month": "2024-02-01", "revenue": "100", "rev_ly": nil, "rev_lm": nil, "rev_same": "100", "closing": "100", "opening": "100", "rolled_up": None},
			{"orders.month": "2025-01-01", "revenue": "10", "rev_ly": nil, "rev_lm": nil, "rev_same": "10", "closing": "10", "opening": "10"},
			// ly: 2024-02-29 moves to 2025-02-28; lm: January's 10.
			{"orders.month": "2025-02-01", "revenue": "20", "rev_ly": "100", "rev_lm": "10", "rev_same": "20", "closing": "20", "opening": "20"},
			// 7 + 30; no March 2024; February's 20; closing on the 31st (30), opening on the 15th (7).
			{"orders.month": "2025-03-01", "revenue": "37", "rev_ly": nil, "rev_lm": "20", "rev_same": "37", "closing": "30", "opening": "7"},
			{"orders.month": "2026-01-01", "revenue": "1", "rev_ly": "10", "rev_lm": nil, "rev_same": "1", "closing": "1", "opening": "1"},
			{"orders.month": "2026-02-01", "revenue": "2", "rev_ly": "20", "rev_lm": "1", "rev_same": "2", "closing": "2", "opening": "2"},
			{"orders.month": "2026-03-01", "revenue": "3", "rev_ly": "37", "rev_lm": "2", "rev_same": "3", "closing": "3", "opening": "3"},
			// The grand total has no time-bound constraint: back moves
			// nothing (173); closing is 2026-03-01's 3, opening the leap day's 100.
			{"orders.month": nil, "revenue": "173", "rev_ly": "173", "rev_lm": "173", "rev_same": "173", "closing": "3", "opening": "100", "rolled_up": total("orders.month")},
		}},
	{Models: timeModel, Name: "days of 2025", Measures: "revenue,rev_lm,rev_ly,growth", By: "orders.day", Where: "orders.year = 2025", Totals: "grand",
		Rows: []Row{
			// 2025-01-31 back 1 month: days moving to the 31st of January: 2024-12-31 only; none.
			{"orders.day": "2025-01-31", "revenue": "10", "rev_lm": nil, "rev_ly": nil, "growth": nil},
			// February 28th back 1 month: January 28..31 move there (clamped): 10.
			// Back 1 year: 2024-02-28 and the leap day move there: 100; growth 20/100 - 1.
			{"orders.day": "2025-02-28", "revenue": "20", "rev_lm": "10", "rev_ly": "100", "growth": -0.8},
			{"orders.day": "2025-03-15", "revenue": "7", "rev_lm": nil, "rev_ly": nil, "growth": nil},
			// March 31st back 1 month: no day moves there (February 28th moves to March 28th).
			{"orders.day": "2025-03-31", "revenue": "30", "rev_lm": nil, "rev_ly": nil, "growth": nil},
			// Total under the year filter: days moving into 2025, December 2024 to November 2025 (67);
			// a year back: 2024's 100. growth 67/100 - 1.
			{"orders.day": nil, "revenue": "67", "rev_lm": "67", "rev_ly": "100", "growth": -0.33, "rolled_up": total("orders.day")},
		}},
	{Models: timeModel, Name: "shops of 2025", Measures: "revenue,rev_ly,ly_shops,closing", By: "orders.shop", Where: "orders.year = 2025", Totals: "grand",
		Rows: []Row{
			// a: 10 + 20; a's 2024: 100; every shop's 2024: 100; closing on 2025-02-28: 20.
			{"orders.shop": "a", "revenue": "30", "rev_ly": "100", "ly_shops": "100", "closing": "20"},
			// b: 7 + 30; b has no 2024 row; closing on 2025-03-31: 30.
			{"orders.shop": "b", "revenue": "37", "rev_ly": nil, "ly_shops": "100", "closing": "30"},
			{"orders.shop": nil, "revenue": "67", "rev_ly": "100", "ly_shops": "100", "closing": "30", "rolled_up": total("orders.shop")},
		}},
	{Models: timeModel, Name: "windows by shop in 2025", Measures: "revenue,ytd,running,last3", By: "orders.shop", Where: "orders.year = 2025", Totals: "grand",
		Rows: []Row{
			// a: E = 2025-02-28. ytd 2025-01-01..E: 30; running: 100 + 10 + 20; last 3 months
			// (2024-11-28, 2025-02-28]: 30. The year filter is time-bound: replaced.
			{"orders.shop": "a", "revenue": "30", "ytd": "30", "running": "130", "last3": "30"},
			// b: E = 2025-03-31: 37 each way (b has nothing before).
			{"orders.shop": "b", "revenue": "37", "ytd": "37", "running": "37", "last3": "37"},
			// E = 2025-03-31: 67; 100 + 67; (2024-12-31, 2025-03-31]: 67.
			{"orders.shop": nil, "revenue": "67", "ytd": "67", "running": "167", "last3": "67", "rolled_up": total("orders.shop")},
		}},
	{Models: timeModel, Name: "windows by month", Measures: "revenue,ytd,running,last3", By: "orders.month", Totals: "grand",
		Rows: []Row{
			{"orders.month": "2024-02-01", "revenue": "100", "ytd": "100", "running": "100", "last3": "100"},
			// E = 2025-01-31; last 3 months: (2024-10-31, 2025-01-31].
			{"orders.month": "2025-01-01", "revenue": "10", "ytd": "10", "running": "110", "last3": "10"},
			{"orders.month": "2025-02-01", "revenue": "20", "ytd": "30", "running": "130", "last3": "30"},
			// E = 2025-03-31; last 3 months (2024-12-31, 2025-03-31]: 10 + 20 + 37.
			{"orders.month": "2025-03-01", "revenue": "37", "ytd": "67", "running": "167", "last3": "67"},
			// E = 2026-01-15; (2025-10-15, 2026-01-15]: 1.
			{"orders.month": "2026-01-01", "revenue": "1", "ytd": "1", "running": "168", "last3": "1"},
			// E = 2026-02-28; (2025-11-28, 2026-02-28]: 1 + 2.
			{"orders.month": "2026-02-01", "revenue": "2", "ytd": "3", "running": "170", "last3": "3"},
			// running at the last month is revenue with no time filter: 173.
			{"orders.month": "2026-03-01", "revenue": "3", "ytd": "6", "running": "173", "last3": "6"},
			{"orders.month": nil, "revenue": "173", "ytd": "6", "running": "173", "last3": "6", "rolled_up": total("orders.month")},
		}},
	// Reports grouped by a month (or the day) of D with no total row: the
	// SQL path computes these windows over the report's cells
	// (planner/plan/plan_timecells.go); the numbers are the same.
	{Models: timeModel, Name: "cells: windows by month and shop", Measures: "revenue,ytd,running,run_shops", By: "orders.month,orders.shop", Totals: "none",
		Rows: []Row{
			{"orders.month": "2024-02-01", "orders.shop": "a", "revenue": "100", "ytd": "100", "running": "100", "run_shops": "100"},
			{"orders.month": "2025-01-01", "orders.shop": "a", "revenue": "10", "ytd": "10", "running": "110", "run_shops": "110"},
			{"orders.month": "2025-02-01", "orders.shop": "a", "revenue": "20", "ytd": "30", "running": "130", "run_shops": "130"},
			// b's first row: ytd and running are b's alone (37); every shop
			// (the drop) up to E = 2025-03-31: 100 + 10 + 20 + 37.
			{"orders.month": "2025-03-01", "orders.shop": "b", "revenue": "37", "ytd": "37", "running": "37", "run_shops": "167"},
			// a up to 2026-01-15: 100 + 10 + 20 + 1.
			{"orders.month": "2026-01-01", "orders.shop": "a", "revenue": "1", "ytd": "1", "running": "131", "run_shops": "168"},
			// b: 7 + 30 + 2.
			{"orders.month": "2026-02-01", "orders.shop": "b", "revenue": "2", "ytd": "2", "running": "39", "run_shops": "170"},
			// a's 2026: 1 + 3; a's all: 134; every shop's all: 173 (the
			// identity: running at the last month is revenue unfiltered).
			{"orders.month": "2026-03-01", "orders.shop": "a", "revenue": "3", "ytd": "4", "running": "134", "run_shops": "173"},
		}},
	{Models: timeModel, Name: "cells: year to date by month of 2025", Measures: "revenue,ytd,running", By: "orders.month", Where: "orders.year = 2025", Totals: "none",
		Rows: []Row{
			// The year filter keeps whole years: ytd reads 2025's cells.
			// running replaces it and reads 2024 too (100 before January).
			{"orders.month": "2025-01-01", "revenue": "10", "ytd": "10", "running": "110"},
			{"orders.month": "2025-02-01", "revenue": "20", "ytd": "30", "running": "130"},
			{"orders.month": "2025-03-01", "revenue": "37", "ytd": "67", "running": "167"},
		}},
	{Models: timeModel, Name: "cells: week to date and running by day", Measures: "revenue,wtd,running", By: "orders.day", Totals: "none",
		Rows: []Row{
			// Each day is alone in its ISO week (Monday first) but the last:
			// Thursday 2024-02-29, Friday 2025-01-31, Friday 2025-02-28,
			// Saturday 2025-03-15, Monday 2025-03-31, Thursday 2026-01-15.
			{"orders.day": "2024-02-29", "revenue": "100", "wtd": "100", "running": "100"},
			{"orders.day": "2025-01-31", "revenue": "10", "wtd": "10", "running": "110"},
			{"orders.day": "2025-02-28", "revenue": "20", "wtd": "20", "running": "130"},
			{"orders.day": "2025-03-15", "revenue": "7", "wtd": "7", "running": "137"},
			{"orders.day": "2025-03-31", "revenue": "30", "wtd": "30", "running": "167"},
			{"orders.day": "2026-01-15", "revenue": "1", "wtd": "1", "running": "168"},
			// Saturday 2026-02-28 and Sunday 2026-03-01 share a week: 2 + 3.
			{"orders.day": "2026-02-28", "revenue": "2", "wtd": "2", "running": "170"},
			{"orders.day": "2026-03-01", "revenue": "3", "wtd": "5", "running": "173"},
		}},
	// `back` by a month of D: the SQL path moves the report's cells
	// (planner/plan/plan_timecells.go); same numbers.
	{Models: timeModel, Name: "cells: a year back by month and shop", Measures: "revenue,rev_ly,ly_shops", By: "orders.month,orders.shop", Totals: "rollup",
		Rows: []Row{
			{"orders.month": "2024-02-01", "orders.shop": "a", "revenue": "100", "rev_ly": nil, "ly_shops": nil},
			{"orders.month": "2024-02-01", "orders.shop": nil, "revenue": "100", "rev_ly": nil, "ly_shops": nil, "rolled_up": total("orders.shop")},
			{"orders.month": "2025-01-01", "orders.shop": "a", "revenue": "10", "rev_ly": nil, "ly_shops": nil},
			{"orders.month": "2025-01-01", "orders.shop": nil, "revenue": "10", "rev_ly": nil, "ly_shops": nil},
			// the leap day moves to 2025-02-28: a's 100
			{"orders.month": "2025-02-01", "orders.shop": "a", "revenue": "20", "rev_ly": "100", "ly_shops": "100"},
			{"orders.month": "2025-02-01", "orders.shop": nil, "revenue": "20", "rev_ly": "100", "ly_shops": "100"},
			{"orders.month": "2025-03-01", "orders.shop": "b", "revenue": "37", "rev_ly": nil, "ly_shops": nil},
			{"orders.month": "2025-03-01", "orders.shop": nil, "revenue": "37", "rev_ly": nil, "ly_shops": nil},
			{"orders.month": "2026-01-01", "orders.shop": "a", "revenue": "1", "rev_ly": "10", "ly_shops": "10"},
			{"orders.month": "2026-01-01", "orders.shop": nil, "revenue": "1", "rev_ly": "10", "ly_shops": "10"},
			// b had nothing in February 2025 (a had 20): every shop's is 20
			{"orders.month": "2026-02-01", "orders.shop": "b", "revenue": "2", "rev_ly": nil, "ly_shops": "20"},
			{"orders.month": "2026-02-01", "orders.shop": nil, "revenue": "2", "rev_ly": "20", "ly_shops": "20"},
			// a had nothing in March 2025 (b had 37)
			{"orders.month": "2026-03-01", "orders.shop": "a", "revenue": "3", "rev_ly": nil, "ly_shops": "37"},
			{"orders.month": "2026-03-01", "orders.shop": nil, "revenue": "3", "rev_ly": "37", "ly_shops": "37"},
			// the grand total has no time-bound constraint: nothing moves
			{"orders.month": nil, "orders.shop": nil, "revenue": "173", "rev_ly": "173", "ly_shops": "173", "rolled_up": total("orders.month", "orders.shop")},
		}},
	{Models: timeModel, Name: "cells: back by month of 2026", Measures: "revenue,rev_ly,rev_lm", By: "orders.month", Where: "orders.year = 2026", Totals: "none",
		Rows: []Row{
			// the year filter moves with the rows: 2025's months come
			// back a year, December 2025 (nothing) a month
			{"orders.month": "2026-01-01", "revenue": "1", "rev_ly": "10", "rev_lm": nil},
			{"orders.month": "2026-02-01", "revenue": "2", "rev_ly": "20", "rev_lm": "1"},
			{"orders.month": "2026-03-01", "revenue": "3", "rev_ly": "37", "rev_lm": "2"},
		}},
	{Models: timeModel, Name: "week to date in 2026", Measures: "revenue,wtd", By: "orders.day", Where: "orders.year = 2026", Totals: "grand",
		Rows: []Row{
			// ISO 8601 weeks start on Monday: 2026-01-15 (a Thursday) from the 12th.
			{"orders.day": "2026-01-15", "revenue": "1", "wtd": "1"},
			// Saturday 2026-02-28, in the week from Monday the 23rd.
			{"orders.day": "2026-02-28", "revenue": "2", "wtd": "2"},
			// Sunday 2026-03-01 ends that week: 2 + 3 (a week from Sunday would give 3).
			{"orders.day": "2026-03-01", "revenue": "3", "wtd": "5"},
			{"orders.day": nil, "revenue": "6", "wtd": "5", "rolled_up": total("orders.day")},
		}},
	{Models: timeModel, Name: "calendar months of 2026", Measures: "revenue,cal_close", By: "days.mon", Where: "days.yr = 2026", Totals: "grand",
		Rows: []Row{
			{"days.mon": "2026-01", "revenue": "1", "cal_close": "1"},
			{"days.mon": "2026-02", "revenue": "2", "cal_close": "2"},
			{"days.mon": "2026-03", "revenue": "3", "cal_close": "3"},
			{"days.mon": nil, "revenue": "6", "cal_close": "3", "rolled_up": total("days.mon")},
		}},
	{Models: timeModel, Name: "calendar months of 2026, a year back", Measures: "revenue,cal_ly", By: "days.mon", Where: "days.yr = 2026", Totals: "grand",
		Rows: []Row{
			// 2025-01-31 moves to the calendar's 2026-01-31 (month 2026-01).
			{"days.mon": "2026-01", "revenue": "1", "cal_ly": "10"},
			{"days.mon": "2026-02", "revenue": "2", "cal_ly": "20"},
			// 2025-03-15 and 2025-03-31 move to 2026-03-15 and 2026-03-31.
			{"days.mon": "2026-03", "revenue": "3", "cal_ly": "37"},
			{"days.mon": nil, "revenue": "6", "cal_ly": "67", "rolled_up": total("days.mon")},
		}},
	{Models: timeModel, Name: "calendar months of 2026, the order's own day moved", Measures: "revenue,rev_ly,rev_lm", By: "days.mon", Where: "days.yr = 2026", Totals: "grand",
		Rows: []Row{
			// A column of the calendar the day links to is read on the
			// calendar's row of the moved day: 2025-01-31 plus a year is
			// the calendar's 2026-01-31 (month 2026-01).
			// A month back: 2026-01-15 moves to 2026-02-15, 2026-02-28 to
			// 2026-03-28, neither a day of the calendar: no month, no row.
			{"days.mon": "2026-01", "revenue": "1", "rev_ly": "10", "rev_lm": nil},
			{"days.mon": "2026-02", "revenue": "2", "rev_ly": "20", "rev_lm": nil},
			{"days.mon": "2026-03", "revenue": "3", "rev_ly": "37", "rev_lm": nil},
			// The year filter moves too: 2025's days land in 2026.
			{"days.mon": nil, "revenue": "6", "rev_ly": "67", "rev_lm": nil, "rolled_up": total("days.mon")},
		}},
	{Models: timeModel, Name: "a window edit over two iteration tables", Measures: "revenue,two_run", By: "days.mon", Where: "days.yr = 2026", Totals: "grand",
		Rows: []Row{
			// E is the latest day among the cell's rows of both tables:
			// January's calendar days end on the 31st (its order is on
			// the 15th). Orders up to then: 100 + 10 + 20 + 7 + 30 + 1;
			// calendar days up to then: 7. The year filter is replaced.
			{"days.mon": "2026-01", "revenue": "1", "two_run": "175"},
			// up to 2026-02-28: 170 and 8 days
			{"days.mon": "2026-02", "revenue": "2", "two_run": "178"},
			// E = 2026-03-31, the calendar's (the order is on the 1st):
			// all 173 and all 11 days (9 if E were the orders' own).
			{"days.mon": "2026-03", "revenue": "3", "two_run": "184"},
			{"days.mon": nil, "revenue": "6", "two_run": "184", "rolled_up": total("days.mon")},
		}},
	{Models: timeModel, Name: "distinct counts under window edits", Measures: "shops_run,shops_ytd", By: "orders.month", Totals: "grand",
		Rows: []Row{
			// the shops seen up to E (running), and since January 1st of
			// E's year (to date): a until b's first order in March 2025.
			{"orders.month": "2024-02-01", "shops_run": 1, "shops_ytd": 1},
			{"orders.month": "2025-01-01", "shops_run": 1, "shops_ytd": 1},
			{"orders.month": "2025-02-01", "shops_run": 1, "shops_ytd": 1},
			{"orders.month": "2025-03-01", "shops_run": 2, "shops_ytd": 2},
			// 2026 starts with a alone; b orders on February 28th.
			{"orders.month": "2026-01-01", "shops_run": 2, "shops_ytd": 1},
			{"orders.month": "2026-02-01", "shops_run": 2, "shops_ytd": 2},
			{"orders.month": "2026-03-01", "shops_run": 2, "shops_ytd": 2},
			// E = 2026-03-01: both shops, both in 2026.
			{"orders.month": nil, "shops_run": 2, "shops_ytd": 2, "rolled_up": total("orders.month")},
		}},
	{Models: timeModel, Name: "last year's year to date", Measures: "revenue,ly_ytd", By: "orders.month", Totals: "grand",
		Rows: []Row{
			// back first: E is the latest day of the rows a year earlier
			// (NULL where there are none), then the year to date of that E.
			{"orders.month": "2024-02-01", "revenue": "100", "ly_ytd": nil},
			{"orders.month": "2025-01-01", "revenue": "10", "ly_ytd": nil},
			// February 2024 (the leap day lands on 2025-02-28): E =
			// 2024-02-29, 2024 up to it: 100.
			{"orders.month": "2025-02-01", "revenue": "20", "ly_ytd": "100"},
			{"orders.month": "2025-03-01", "revenue": "37", "ly_ytd": nil},
			{"orders.month": "2026-01-01", "revenue": "1", "ly_ytd": "10"},
			{"orders.month": "2026-02-01", "revenue": "2", "ly_ytd": "30"},
			{"orders.month": "2026-03-01", "revenue": "3", "ly_ytd": "67"},
			// the grand total has no time-bound constraint: back moves
			// nothing, E = 2026-03-01, 2026 up to it: 6.
			{"orders.month": nil, "revenue": "173", "ly_ytd": "6", "rolled_up": total("orders.month")},
		}},
	// Two time edits, the second in the cell the first made
	// (language.md, "Time": chains).
	{Models: timeModel, Name: "chains: a window, then another time edit", Measures: "revenue,ytd_ly,open3,run_ytd,running", By: "orders.month", Totals: "grand",
		Rows: []Row{
			// ytd_ly: the year to date up to E, then a year back: the rows
			// whose day plus a year lies in [January 1st of E's year, E]:
			// last year's year to date up to the same day. 2024-02: E =
			// 2024-02-29, no 2023 row. open3: the earliest day of the
			// last three months up to E, its revenue. run_ytd: the
			// running total inside the year to date, whose E is the
			// cell's own: running.
			{"orders.month": "2024-02-01", "revenue": "100", "ytd_ly": nil, "open3": "100", "run_ytd": "100", "running": "100"},
			// 2025-01-01..31 a year back: none. (2024-10-31, 2025-01-31]: 2025-01-31.
			{"orders.month": "2025-01-01", "revenue": "10", "ytd_ly": nil, "open3": "10", "run_ytd": "110", "running": "110"},
			// 2025-01-01..02-28: the leap day lands on 2025-02-28: 100. (2024-11-28, 2025-02-28]: January 31st's 10.
			{"orders.month": "2025-02-01", "revenue": "20", "ytd_ly": "100", "open3": "10", "run_ytd": "130", "running": "130"},
			{"orders.month": "2025-03-01", "revenue": "37", "ytd_ly": "100", "open3": "10", "run_ytd": "167", "running": "167"},
			// 2026-01-01..15: 2025-01-31 lands on 2026-01-31, later: none.
			{"orders.month": "2026-01-01", "revenue": "1", "ytd_ly": nil, "open3": "1", "run_ytd": "168", "running": "168"},
			// 2026-01-01..02-28: 2025-01-31 and 2025-02-28 land in it: 10 + 20.
			{"orders.month": "2026-02-01", "revenue": "2", "ytd_ly": "30", "open3": "1", "run_ytd": "170", "running": "170"},
			// 2026-01-01..03-01: March 2025's days land after March 1st: 30
			// (ly_ytd, back first, gives 67: its E is 2025-03-31).
			{"orders.month": "2026-03-01", "revenue": "3", "ytd_ly": "30", "open3": "1", "run_ytd": "173", "running": "173"},
			// E = 2026-03-01, as in its last month.
			{"orders.month": nil, "revenue": "173", "ytd_ly": "30", "open3": "1", "run_ytd": "173", "running": "173", "rolled_up": total("orders.month")},
		}},
	{Models: timeModel, Name: "chains: a calendar moved, then a window", Measures: "revenue,cal_ly_ytd", By: "days.mon", Where: "days.yr = 2026", Totals: "grand",
		Rows: []Row{
			// back moves the calendar's month and year (read on the
			// calendar's row of the day a year later); to date year
			// replaces them. 2026-01: 2025-01-31 lands on the calendar's
			// 2026-01-31: E = 2025-01-31, 2025 up to it: 10.
			{"days.mon": "2026-01", "revenue": "1", "cal_ly_ytd": "10"},
			// 2025-02-28 lands on 2026-02-28 (the leap day on 2025-02-28,
			// out of 2026): E = 2025-02-28: 10 + 20.
			{"days.mon": "2026-02", "revenue": "2", "cal_ly_ytd": "30"},
			// 2025-03-15 and 2025-03-31 land on 2026's: E = 2025-03-31: 67.
			{"days.mon": "2026-03", "revenue": "3", "cal_ly_ytd": "67"},
			{"days.mon": nil, "revenue": "6", "cal_ly_ytd": "67", "rolled_up": total("days.mon")},
		}},
	{Models: timeModel, Name: "calendar's derived months of 2026, a year back", Measures: "revenue,cal_ly", By: "days.cal_month", Where: "days.cal_year = 2026", Totals: "grand",
		Rows: []Row{
			// Derived calendar columns computed from the key alone move by their formula.
			{"days.cal_month": "2026-01-01", "revenue": "1", "cal_ly": "10"},
			{"days.cal_month": "2026-02-01", "revenue": "2", "cal_ly": "20"},
			{"days.cal_month": "2026-03-01", "revenue": "3", "cal_ly": "37"},
			{"days.cal_month": nil, "revenue": "6", "cal_ly": "67", "rolled_up": total("days.cal_month")},
		}},
	{Models: timeModel, Name: "closing stock", Measures: "balance,shop_bal", By: "stock.shop", Totals: "grand",
		Rows: []Row{
			// a's last snapshot 2026-01-31: 6; b's 2025-03-31: 4.
			{"stock.shop": "a", "balance": "6", "shop_bal": "6"},
			{"stock.shop": "b", "balance": "4", "shop_bal": "4"},
			// The latest day overall is 2026-01-31 (only a: 6); each shop's own last balance: 6 + 4.
			{"stock.shop": nil, "balance": "6", "shop_bal": "10", "rolled_up": total("stock.shop")},
		}},
}
