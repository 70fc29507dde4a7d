// Package casegen draws random test cases for the differential tests:
// small star and snowflake models (one to three iteration tables,
// dimensions with NULLs, unmatched keys and repeated values), their data
// as CSV, measures over every construct of the language (aggregates,
// arithmetic, narrowing, every cell edit, per-grain with having, nested a
// few levels), and queries (group columns, filters, every totals mode,
// order and limit). A case prints as a .roll file plus CSV files plus the
// command lines of its queries, and writes itself to a folder that runs
// as is: `rollwise run model.roll ...`.
//
// The values stay inside defined behaviour, so that the SQL path and the
// reference evaluator must agree exactly on integers and decimals:
// decimals have at most two places; floats are multiples of 1/4; a
// comparison (case, having), a divisor, an --order measure, a group
// column and a count(distinct) only ever see exact values; a product of
// decimals has at most three decimal factors (DuckDB keeps the scale).
package casegen

import (
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"pgregory.net/rapid"
)

// Case is one generated model, its data and queries over it.
type Case struct {
	// Model is the .roll text; its tables read NAME.csv beside it.
	Model string
	// Data maps each table name to its CSV text.
	Data map[string]string
	// Queries are the queries to run on the model.
	Queries []Query
	// Advanced names the measures that use cell edits or per-grain
	// aggregates.
	Advanced map[string]bool
	// Identities are queries whose measures must agree pairwise (with
	// Options.Identities).
	Identities []Identity
}

// Query is one query, as the command line gives it.
type Query struct {
	Measures []string
	By       []string
	// Where is the whole filter; Filters, when set, are its conjuncts as
	// the command line gives them, one -w each (Where is then their and,
	// each in parentheses, as the command line combines them).
	Where   string
	Filters []string `json:",omitempty"`
	Totals  string
	Order   string
	Limit   int
}

// ModelFile is the name a written case gives its model.
const ModelFile = "model.roll"

// Args are the query's `rollwise run` arguments after the model path.
func (q Query) Args() []string {
	args := []string{"-m", strings.Join(q.Measures, ",")}
	if len(q.By) > 0 {
		args = append(args, "-b", strings.Join(q.By, ","))
	}
	for _, w := range q.Filters {
		args = append(args, "-w", w)
	}
	if q.Where != "" && len(q.Filters) == 0 {
		args = append(args, "-w", q.Where)
	}
	if q.Totals != "" && q.Totals != "none" {
		args = append(args, "--totals", q.Totals)
	}
	if q.Order != "" {
		args = append(args, "--order", q.Order)
	}
	if q.Limit > 0 {
		args = append(args, "--limit", fmt.Sprint(q.Limit))
	}
	return args
}

// Command is the query as a shell command line.
func (q Query) Command(model string) string {
	parts := []string{"rollwise", "run", model}
	for _, a := range q.Args() {
		if strings.ContainsAny(a, " '\"*(),<>=|;") {
			a = "\"" + strings.ReplaceAll(a, "\"", "\\\"") + "\""
		}
		parts = append(parts, a)
	}
	return strings.Join(parts, " ")
}

// UsesAdvanced reports whether the query asks for a measure with cell
// edits or per-grain aggregates.
func (c *Case) UsesAdvanced(q Query) bool {
	for _, m := range q.Measures {
		if c.Advanced[m] {
			return true
		}
	}
	return false
}

// Write writes the model (as model.roll) and one NAME.csv per table into
// dir, which must exist.
func (c *Case) Write(dir string) error {
	if err := os.WriteFile(filepath.Join(dir, ModelFile), []byte(c.Model), 0o644); err != nil {
		return err
	}
	for name, csv := range c.Data {
		if err := os.WriteFile(filepath.Join(dir, name+".csv"), []byte(csv), 0o644); err != nil {
			return err
		}
	}
	return nil
}

// String prints the whole case: the model, each CSV file and the
// queries' command lines.
func (c *Case) String() string {
	var b strings.Builder
	b.WriteString("==> " + ModelFile + " <==\n" + c.Model)
	names := make([]string, 0, len(c.Data))
	for n := range c.Data {
		names = append(names, n)
	}
	sort.Strings(names)
	for _, n := range names {
		b.WriteString("\n==> " + n + ".csv <==\n" + c.Data[n])
	}
	b.WriteString("\n==> queries <==\n")
	for _, q := range c.Queries {
		b.WriteString(q.Command(ModelFile) + "\n")
	}
	return b.String()
}

// GoString keeps rapid's log of the drawn case short; the test prints
// the case in full when it fails.
func (c *Case) GoString() string {
	return fmt.Sprintf("casegen.Case{%d tables, %d queries}", len(c.Data), len(c.Queries))
}

// Options shape the cases drawn.
type Options struct {
	// MaxFactRows bounds the rows of each iteration table.
	MaxFactRows int
	// Queries is the number of queries per case.
	Queries int
	// Advanced allows cell edits and per-grain aggregates in measures.
	Advanced bool
	// Facts bounds the number of iteration tables (1 to 3).
	Facts int
	// Identities adds the measures and query of one Identity to each
	// case (Case.Identities).
	Identities bool
}

// DefaultOptions are the options of the differential tests.
var DefaultOptions = Options{MaxFactRows: 120, Queries: 3, Advanced: true, Facts: 3}

// Generator draws cases with the given options.
func Generator(o Options) *rapid.Generator[*Case] {
	return rapid.Custom(func(t *rapid.T) *Case {
		g := &gen{t: t, o: o}
		return g.drawCase()
	})
}

// gen holds the state of one case being drawn.
type gen struct {
	t        *rapid.T
	o        Options
	tables   []*table
	measures []*measure
	nameSeq  int
	// hot are a few columns that edits, per columns, filters and group
	// columns prefer.
	hot []*column
}

// intn draws an integer in [lo, hi]; shrinking moves it to lo.
func (g *gen) intn(lo, hi int) int {
	if hi <= lo {
		return lo
	}
	return rapid.IntRange(lo, hi).Draw(g.t, "")
}

// chance is true with probability pct percent; shrinking makes it false.
func (g *gen) chance(pct int) bool { return g.intn(0, 99) >= 100-pct }

// pick draws an index below n; shrinking moves it to 0.
func (g *gen) pick(n int) int { return g.intn(0, n-1) }

func (g *gen) drawCase() *Case {
	g.drawSchema()
	g.drawData()
	g.drawMeasures()
	var ids []Identity
	if g.o.Identities {
		if id, ok := g.drawIdentity(); ok {
			ids = append(ids, id)
		}
	}
	c := &Case{Model: g.modelText(), Data: map[string]string{}, Advanced: map[string]bool{}, Identities: ids}
	for _, t := range g.tables {
		c.Data[t.name] = t.csv()
	}
	for _, m := range g.measures {
		if m.advanced {
			c.Advanced[m.name] = true
		}
	}
	n := g.o.Queries
	if n < 1 {
		n = 1
	}
	for i := 0; i < n; i++ {
		if q, ok := g.drawQuery(); ok {
			c.Queries = append(c.Queries, q)
		}
	}
	return c
}
