package main

import (
	"context"
	"fmt"
	"slices"
	"strings"
	"time"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/engine"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
)

// uniqueness is a promise that the values of some columns of a table are
// on one row each: a declared key, or a semiadditive column's key and
// date.
type uniqueness struct {
	table *model.Table
	cols  []*model.Column
	pos   grammar.Pos
	// what names the promise in a finding, up to "is" or "are".
	what string
}

// uniquenesses lists the promises of m that data can break, in
// declaration order: each table's key, and for each semiadditive column
// the table's link columns plus its date (the date's own column when it
// is on the table; a link to the date's table is among the link columns
// otherwise). A semiadditive column is summed across everything but its
// date: two rows of one item on one day would add the balance twice.
func uniquenesses(m *model.Model) []uniqueness {
	var out []uniqueness
	for _, t := range m.Tables {
		if len(t.Key) > 0 {
			out = append(out, uniqueness{table: t, cols: t.Key, pos: t.Pos, what: "the key (" + columnNames(t.Key) + ") is"})
		}
		for _, c := range t.Columns {
			if c.Additivity != model.SemiAdditive || c.SemiDate == nil {
				continue
			}
			var cols []*model.Column
			for _, l := range t.Links {
				for _, fc := range l.FromCols {
					if !slices.Contains(cols, fc) {
						cols = append(cols, fc)
					}
				}
			}
			if c.SemiDate.Table == t && !slices.Contains(cols, c.SemiDate) {
				cols = append(cols, c.SemiDate)
			}
			if len(cols) == 0 || sameColumns(cols, t.Key) {
				continue
			}
			out = append(out, uniqueness{table: t, cols: cols, pos: c.Pos,
				what: fmt.Sprintf("%s is semiadditive(%s), but its key and date (%s) are", c.Name, c.SemiDate, columnNames(cols))})
		}
	}
	return out
}

func columnNames(cols []*model.Column) string {
	var names []string
	for _, c := range cols {
		names = append(names, c.Name)
	}
	return strings.Join(names, ", ")
}

func sameColumns(a, b []*model.Column) bool {
	if len(a) != len(b) {
		return false
	}
	for _, c := range a {
		if !slices.Contains(b, c) {
			return false
		}
	}
	return true
}

// checkUnique reports, as an error at its declaration, each promise of
// uniqueness the data breaks: the table, the columns, how many values
// repeat on how many rows, and the most repeated value.
func checkUnique(ctx context.Context, eng engine.Engine, d *dialects.Dialect, m *model.Model) (grammar.Diagnostics, error) {
	var diags grammar.Diagnostics
	for _, u := range uniquenesses(m) {
		count, example, err := dialects.RepeatedRows(u.table, u.cols, d)
		if err != nil {
			return nil, failure.New(failure.Internal, err)
		}
		res, err := eng.Query(ctx, count, nil)
		if err != nil {
			return nil, failure.Newf(failure.Input, "counting the repeated values of %s (%s): %w", u.table.Name, columnNames(u.cols), err)
		}
		if len(res.Rows) != 1 || len(res.Rows[0]) != 2 {
			return nil, failure.Newf(failure.Internal, "internal error: counting repeated values gave %v", res.Rows)
		}
		values := fmt.Sprint(res.Rows[0][0])
		if values == "0" {
			continue
		}
		ex, err := eng.Query(ctx, example, nil)
		if err != nil || len(ex.Rows) != 1 {
			return nil, failure.Newf(failure.Input, "finding a repeated value of %s (%s): %v", u.table.Name, columnNames(u.cols), err)
		}
		var vals []string
		for i, c := range u.cols {
			v := ex.Rows[0][i]
			if tm, ok := v.(time.Time); ok && tm.Equal(tm.Truncate(24*time.Hour)) {
				v = tm.Format(time.DateOnly)
			}
			vals = append(vals, fmt.Sprintf("%s = %v", c.Name, v))
		}
		repeat := values + " values repeat"
		if values == "1" {
			repeat = "1 value repeats"
		}
		x := diags.Errorf(u.pos, "repeated-key", "table %s: %s not unique on the data: %s, on %v rows; for example %s is on %v rows",
			u.table.Name, u.what, repeat, res.Rows[0][1], strings.Join(vals, ", "), ex.Rows[0][len(u.cols)])
		x.Suggestion = "fix the data, or declare the columns that are unique: while values repeat, a link to this table or a sum over it counts rows more than once"
	}
	return diags, nil
}
