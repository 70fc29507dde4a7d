package dialects

import (
	"strconv"

	"github.com/rollwise/rollwise/planner"
)

// DateMover is a dialect that can move a date or timestamp forward by a
// whole number of days or months, a month move clamping to the target
// month's last day (2026-01-31 plus 1 month is 2026-02-28), as a time
// edit's `back` needs (language.md, "Time").
type DateMover interface {
	MoveDate(arg string, n int, unit string, t planner.Type) string
}

// moveDate spells the planner's date_move(D, N) for unit: days and weeks
// as days, quarters and years as months.
func (r *renderer) moveDate(e *planner.Func, arg string, t planner.Type) (string, error) {
	m, ok := r.d.(DateMover)
	if !ok {
		return "", &UnsupportedError{Dialect: r.d.Name(), Construct: "a time edit that moves dates (back N " + e.Unit + ")",
			Hint: "run it on DuckDB, PostgreSQL, MariaDB/MySQL or SQLite"}
	}
	lit, _ := e.Args[1].(*planner.Lit)
	n := 0
	if lit != nil {
		n, _ = strconv.Atoi(lit.Text)
	}
	unit := e.Unit
	switch unit {
	case "week":
		n, unit = 7*n, "day"
	case "quarter":
		n, unit = 3*n, "month"
	case "year":
		n, unit = 12*n, "month"
	}
	return m.MoveDate(arg, n, unit, t), nil
}

// intervalMove adds an interval, as DuckDB and PostgreSQL spell it; their
// month arithmetic clamps to the month's last day (PostgreSQL documents
// it in "Date/Time Functions and Operators", section 9.9). A date plus an
// interval is a timestamp there: cast back.
func intervalMove(arg string, n int, unit string, t planner.Type) string {
	x := "(" + arg + " + INTERVAL '" + strconv.Itoa(n) + " " + unit + "')"
	if t == planner.TypeDate {
		return "CAST(" + x + " AS DATE)"
	}
	return x
}

// MoveDate adds an interval (see intervalMove).
func (duckdb) MoveDate(arg string, n int, unit string, t planner.Type) string {
	return intervalMove(arg, n, unit, t)
}

// MoveDate adds an interval (see intervalMove).
func (postgres) MoveDate(arg string, n int, unit string, t planner.Type) string {
	return intervalMove(arg, n, unit, t)
}

// MoveDate is DATE_ADD, whose month arithmetic clamps to the month's last
// day (MySQL and MariaDB manuals, DATE_ADD: "the day is adjusted to the
// maximum days in the new month").
func (mysql) MoveDate(arg string, n int, unit string, _ planner.Type) string {
	return "DATE_ADD(" + arg + ", INTERVAL " + strconv.Itoa(n) + " " + map[string]string{"day": "DAY", "month": "MONTH"}[unit] + ")"
}

// MoveDate uses the date function modifiers (sqlite.org/lang_datefunc.html).
// Their month arithmetic rolls over (January 31 plus 1 month is March 3),
// so a month move goes to the target month's first day and adds the
// original day less one, at most the target month's last day less one.
// A timestamp keeps its time of day (to the millisecond).
func (sqlite) MoveDate(arg string, n int, unit string, t planner.Type) string {
	var day string
	if unit == "day" {
		day = "date(" + arg + ", '" + strconv.Itoa(n) + " days')"
	} else {
		last := "CAST(strftime('%d', date(" + arg + ", 'start of month', '" + strconv.Itoa(n+1) + " months', '-1 day')) AS INTEGER)"
		day = "date(" + arg + ", 'start of month', '" + strconv.Itoa(n) + " months', '+' || (MIN(CAST(strftime('%d', " + arg + ") AS INTEGER), " + last + ") - 1) || ' days')"
	}
	if t == planner.TypeTimestamp {
		return "strftime('%Y-%m-%d %H:%M:%f', " + day + " || ' ' || strftime('%H:%M:%f', " + arg + "))"
	}
	return day
}
