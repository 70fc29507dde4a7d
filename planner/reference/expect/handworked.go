package expect

import (
	"slices"
	"strconv"
	"strings"
)

// Case is a query with its rows worked out by hand. One table of them
// (Cases) is read both by the SQL path's tests (cmd/rollwise: `rollwise
// run` on DuckDB, and on the live engines) and by the reference
// evaluator's (planner/reference), so that each hand-worked row checks
// both ways of computing it.
type Case struct {
	Name string
	// Models are the model files, as paths from the repository's root.
	Models []string
	// The query, as `rollwise run` takes it: comma-separated measures and
	// group columns, one filter, totals (none when empty), order and limit
	// (none when zero).
	Measures, By, Where, Totals, Order string
	Limit                              int
	// NotInSQL, when set, is the error the SQL path gives for the query
	// (a construct not planned into SQL yet): only the reference evaluator
	// computes the rows, and the SQL path must refuse so.
	NotInSQL string
	Rows     []Row
}

// Args is the case as arguments of `rollwise run`, with the model files
// under root (the repository's root as the test sees it).
func (c Case) Args(root string) []string {
	args := []string{"run"}
	for _, m := range c.Models {
		args = append(args, root+"/"+m)
	}
	args = append(args, "-m", c.Measures)
	for _, f := range [][2]string{{"-b", c.By}, {"-w", c.Where}, {"--totals", c.Totals}, {"--order", c.Order}} {
		if f[1] != "" {
			args = append(args, f[0], f[1])
		}
	}
	if c.Limit > 0 {
		args = append(args, "--limit", strconv.Itoa(c.Limit))
	}
	return args
}

// List splits a comma-separated field of the case (nil when empty).
func List(s string) []string {
	if s == "" {
		return nil
	}
	return strings.Split(s, ",")
}

// Cases are every hand-worked case: the shop's (shop.go), its cell edits
// and per-grain measures (edits.go), and its time edits (time.go).
var Cases = slices.Concat(shopCases, editCases, timeCases)
