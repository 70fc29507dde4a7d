package dialects

import (
	"fmt"
	"slices"
	"strconv"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
)

// DateMover is a dialect that can move a date or timestamp forward by a
// whole number of days or months, a month move clamping to the target
// month's last day (2026-01-31 plus 1 month is 2026-02-28), as a time
// edit's `back` needs (language.md, "Time").
type DateMover interface {
	MoveDate(arg string, n int, unit string, t model.Type) string
}

// moveDate spells the planner's date_move(D, N).
func (r *renderer) moveDate(e *model.Func, arg string, t model.Type) (string, error) {
	lit, _ := e.Args[1].(*model.Lit)
	n := 0
	if lit != nil {
		n, _ = strconv.Atoi(lit.Text)
	}
	return r.moveBy(arg, n, e.Unit, t, "back N "+e.Unit)
}

// moveBy moves a date by n units: days and weeks as days, quarters and
// years as months. what names the construct for a dialect that cannot.
func (r *renderer) moveBy(arg string, n int, unit string, t model.Type, what string) (string, error) {
	d := r.d
	if a, wrapped := d.(*Approximate); wrapped {
		d = a.Dialect
	}
	m, ok := d.(DateMover)
	if !ok {
		return "", &UnsupportedError{Dialect: r.d.Name(), Construct: "a time edit that moves dates (" + what + ")",
			Hint: "run it on DuckDB, PostgreSQL, MariaDB/MySQL or SQLite"}
	}
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

// rangeScan renders a window edit's scan (plan.TimeRange): the E of
// every cell of ctx, then the aggregates of the rows that match each
// cell's kept keys and whose date lies in the cell's range.
func (r *renderer) rangeScan(ctx *plan.Context, rel *plan.Rel) error {
	s := rel.Scan
	tr := s.Range
	rowsName, col, err := r.scanRows(rel)
	if err != nil {
		return err
	}
	key := r.q(r.keyRel[ctx])
	ends := r.cteName(rel.Name + "_ends")
	cols := []string{key + "." + r.q(GroupingColumn)}
	for _, k := range ctx.Keys {
		cols = append(cols, key+"."+r.q(k.Name))
	}
	from := key
	e := key + "." + r.q(tr.E.Column)
	if name := r.cte[tr.E.Rel]; name != r.keyRel[ctx] {
		from += "\n  LEFT JOIN " + r.q(name) + " ON " + r.joinOn(ctx, key, tr.E.Rel)
		e = r.q(name) + "." + r.q(tr.E.Column)
	}
	cols = append(cols, e+" AS "+r.q(rel.Name+"_end"))
	r.addCTE(ends, "  SELECT "+strings.Join(cols, ", ")+"\n  FROM "+from)

	a, x := r.q("a"), r.q("x")
	at := x + "." + r.q(col(tr.D.Name))
	end := a + "." + r.q(rel.Name+"_end")
	conds := []string{at + " <= " + end}
	switch tr.Kind {
	case model.EditToDate:
		conds = append(conds, at+" >= "+r.d.DateTrunc(tr.Unit, end, tr.E.T))
	case model.EditLast:
		lo, err := r.moveBy(end, -tr.N, tr.Unit, tr.E.T, fmt.Sprintf("last %d %s", tr.N, tr.Unit))
		if err != nil {
			return err
		}
		conds = append(conds, at+" > "+lo)
	}
	n := len(ctx.Keys)
	for j, i := range tr.Match {
		k := ctx.Keys[i]
		eq := r.d.NullSafeEqual(x+"."+r.q(col(s.Keys[j].Name)), a+"."+r.q(k.Name))
		rolled := false
		for _, set := range ctx.Sets {
			rolled = rolled || set&(1<<(n-1-i)) != 0
		}
		if rolled {
			eq = "(" + r.d.BitAnd(a+"."+r.q(GroupingColumn), strconv.Itoa(1<<(n-1-i))) + " <> 0 OR " + eq + ")"
		}
		conds = append(conds, eq)
	}
	for _, l := range s.Leaves {
		if l.Func == "median" && windowMedians(r.d) {
			return r.rangeMedians(ctx, rel, ends, rowsName, col, conds)
		}
	}
	group := []string{a + "." + r.q(GroupingColumn)}
	for _, k := range ctx.Keys {
		group = append(group, a+"."+r.q(k.Name))
	}
	sel := append([]string{}, group...)
	for _, l := range s.Leaves {
		agg, err := r.leafAgg(l, x+".", col)
		if err != nil {
			return err
		}
		sel = append(sel, agg)
	}
	r.cte[rel] = r.cteName(rel.Name + "_cells")
	r.addCTE(r.cte[rel], "  SELECT "+strings.Join(sel, ", ")+"\n  FROM "+r.q(ends)+" AS "+a+
		"\n  JOIN "+r.q(rowsName)+" AS "+x+" ON "+strings.Join(conds, "\n    AND ")+
		"\n  GROUP BY "+strings.Join(group, ", "))
	return nil
}

// rangeMedians finishes a range scan whose leaves include a median the
// dialect computes with windows (render_median.go): the cells' rows (each
// cell of ends joined to the rows in its date range, on conds) go to a CTE
// of their own, numbered within each cell, and the cells CTE aggregates
// them by cell.
func (r *renderer) rangeMedians(ctx *plan.Context, rel *plan.Rel, ends, rowsName string, col func(string) string, conds []string) error {
	s := rel.Scan
	a, x := r.q("a"), r.q("x")
	cols := []string{GroupingColumn}
	sel := []string{a + "." + r.q(GroupingColumn) + " AS " + r.q(GroupingColumn)}
	part := []string{r.q(GroupingColumn)}
	for _, k := range ctx.Keys {
		cols = append(cols, k.Name)
		sel = append(sel, a+"."+r.q(k.Name)+" AS "+r.q(k.Name))
		part = append(part, r.q(k.Name))
	}
	group := append([]string{}, part...)
	var vals []rankedValue
	var meds []*plan.Leaf
	for _, l := range s.Leaves {
		for _, in := range []*plan.Input{l.Arg, l.Filter} {
			if in != nil && !slices.Contains(cols, col(in.Name)) {
				cols = append(cols, col(in.Name))
				sel = append(sel, x+"."+r.q(col(in.Name))+" AS "+r.q(col(in.Name)))
			}
		}
		if l.Func == "median" {
			vals = append(vals, r.leafRanked(l, col))
			meds = append(meds, l)
		}
	}
	joined := r.cteName(rel.Name + "_range_rows")
	r.addCTE(joined, "  SELECT "+strings.Join(sel, ", ")+"\n  FROM "+r.q(ends)+" AS "+a+
		"\n  JOIN "+r.q(rowsName)+" AS "+x+" ON "+strings.Join(conds, "\n    AND "))
	ranked, median, err := r.ranks(rel.Name, r.q(joined), cols, vals, [][]string{part})
	if err != nil {
		return err
	}
	out := append([]string{}, group...)
	for _, l := range s.Leaves {
		i := slices.Index(meds, l)
		if i < 0 {
			agg, err := r.leafAgg(l, "", col)
			if err != nil {
				return err
			}
			out = append(out, agg)
			continue
		}
		m, err := median(i, 0)
		if err != nil {
			return err
		}
		out = append(out, m+" AS "+r.q(l.Name))
	}
	r.cte[rel] = r.cteName(rel.Name + "_cells")
	r.addCTE(r.cte[rel], "  SELECT "+strings.Join(out, ", ")+"\n  FROM "+r.q(ranked)+"\n  GROUP BY "+strings.Join(group, ", "))
	return nil
}

// intervalMove adds an interval, as DuckDB and PostgreSQL spell it; their
// month arithmetic clamps to the month's last day (PostgreSQL documents
// it in "Date/Time Functions and Operators", section 9.9). A date plus an
// interval is a timestamp there: cast back.
func intervalMove(arg string, n int, unit string, t model.Type) string {
	x := "(" + arg + " + INTERVAL '" + strconv.Itoa(n) + " " + unit + "')"
	if t == model.TypeDate {
		return "CAST(" + x + " AS DATE)"
	}
	return x
}

// MoveDate adds an interval (see intervalMove).
func (duckdb) MoveDate(arg string, n int, unit string, t model.Type) string {
	return intervalMove(arg, n, unit, t)
}

// MoveDate adds an interval (see intervalMove).
func (postgres) MoveDate(arg string, n int, unit string, t model.Type) string {
	return intervalMove(arg, n, unit, t)
}

// MoveDate is DATE_ADD, whose month arithmetic clamps to the month's last
// day (MySQL and MariaDB manuals, DATE_ADD: "the day is adjusted to the
// maximum days in the new month").
func (mysql) MoveDate(arg string, n int, unit string, _ model.Type) string {
	return "DATE_ADD(" + arg + ", INTERVAL " + strconv.Itoa(n) + " " + map[string]string{"day": "DAY", "month": "MONTH"}[unit] + ")"
}

// MoveDate uses the date function modifiers (sqlite.org/lang_datefunc.html).
// Their month arithmetic rolls over (January 31 plus 1 month is March 3),
// so a month move goes to the target month's first day and adds the
// original day less one, at most the target month's last day less one.
// A timestamp keeps its time of day (to the millisecond).
func (sqlite) MoveDate(arg string, n int, unit string, t model.Type) string {
	var day string
	if unit == "day" {
		day = "date(" + arg + ", '" + strconv.Itoa(n) + " days')"
	} else {
		last := "CAST(strftime('%d', date(" + arg + ", 'start of month', '" + strconv.Itoa(n+1) + " months', '-1 day')) AS INTEGER)"
		day = "date(" + arg + ", 'start of month', '" + strconv.Itoa(n) + " months', '+' || (MIN(CAST(strftime('%d', " + arg + ") AS INTEGER), " + last + ") - 1) || ' days')"
	}
	if t == model.TypeTimestamp {
		return "strftime('%Y-%m-%d %H:%M:%f', " + day + " || ' ' || strftime('%H:%M:%f', " + arg + "))"
	}
	return day
}

// MoveDate is DATEADD, which clamps a month move to the target month's
// last day (learn.microsoft.com, DATEADD: "the last day of the return
// month is returned").
func (sqlserver) MoveDate(arg string, n int, unit string, _ model.Type) string {
	return "DATEADD(" + unit + ", " + strconv.Itoa(n) + ", " + arg + ")"
}

// MoveDate is DATEADD, which clamps a month move (docs.snowflake.com,
// DATEADD: adding a month to January 31 gives the last day of February).
func (snowflake) MoveDate(arg string, n int, unit string, _ model.Type) string {
	return "DATEADD(" + unit + ", " + strconv.Itoa(n) + ", " + arg + ")"
}

// MoveDate is DATE_ADD (DATETIME_ADD for timestamps, which are DATETIME
// here); both clamp a month move to the month's last day (cloud.google.com,
// "Date functions", DATE_ADD).
func (bigquery) MoveDate(arg string, n int, unit string, t model.Type) string {
	fn := "DATE_ADD"
	if t == model.TypeTimestamp {
		fn = "DATETIME_ADD"
	}
	return fn + "(" + arg + ", INTERVAL " + strconv.Itoa(n) + " " + strings.ToUpper(unit) + ")"
}

// MoveDate is date_add, whose month arithmetic clamps to the month's last
// day (trino.io, "Date and time functions", date_add).
func (trino) MoveDate(arg string, n int, unit string, _ model.Type) string {
	return "date_add('" + unit + "', " + strconv.Itoa(n) + ", " + arg + ")"
}

// MoveDate is add_months or date_add for dates, timestampadd for
// timestamps; since Spark 3.0 add_months clamps to the month's last day
// without moving a month's last day to the next month's last day (Spark
// SQL migration guide, 2.4 to 3.0).
func (spark) MoveDate(arg string, n int, unit string, t model.Type) string {
	switch {
	case t == model.TypeTimestamp:
		return "timestampadd(" + strings.ToUpper(unit) + ", " + strconv.Itoa(n) + ", " + arg + ")"
	case unit == "month":
		return "add_months(" + arg + ", " + strconv.Itoa(n) + ")"
	}
	return "date_add(" + arg + ", " + strconv.Itoa(n) + ")"
}
