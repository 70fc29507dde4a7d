package planner

import (
	"fmt"
	"math/bits"
	"slices"
	"sort"
	"strings"

	"github.com/rollwise/rollwise/grammar"
)

// Plan is the logical plan of one query, free of any SQL dialect: one scan
// per iteration table, aggregated over the query's grouping sets, then the
// measures' arithmetic over the aggregates.
type Plan struct {
	Query *Query
	// Sets are the grouping sets, each a mask of the rolled-up groups: bit
	// 1<<(n-1-i) stands for group i, as SQL's GROUPING(g1, ..., gn) counts.
	Sets    []uint64
	Scans   []*Scan
	Outputs []*Output
	// OrderBy is the output the detail rows are sorted by, or nil.
	OrderBy *Output
	// Cautions are things the reader of the numbers should know.
	Cautions []string
}

// Scan reads one iteration table (joined along links to what it needs),
// keeps the rows that pass the filters, and computes its leaves per cell.
type Scan struct {
	// Name is a readable base name for the scan's parts ("sales").
	Name   string
	Table  *Table
	Joins  []*Link
	Where  []Expr
	Inputs []*Input
	Leaves []*Leaf
}

// Input is a row-level value a scan computes for its aggregates.
type Input struct {
	Name string
	Expr Expr
}

// Leaf is one aggregate computed by a scan in every cell.
type Leaf struct {
	Name     string
	Func     string
	Distinct bool
	// Arg is nil for count(*); Filter is nil when every row counts.
	Arg    *Input
	Filter *Input
	T      Type
}

// LeafRef is a measure-level expression node that reads a leaf's value in
// the current cell. ZeroIfMissing is set for counts read across scans,
// where a cell that the scan lacks counts 0.
type LeafRef struct {
	Pos           grammar.Pos
	Leaf          *Leaf
	Scan          *Scan
	ZeroIfMissing bool
}

// Type is the leaf's type.
func (e *LeafRef) Type() Type { return e.Leaf.T }

// Position is where the aggregate was written.
func (e *LeafRef) Position() grammar.Pos { return e.Pos }

// Output is one measure column of the result.
type Output struct {
	Name    string
	Measure *Measure
	Expr    Expr
}

// GroupingSets lists the grouping sets of a totals mode over n groups, the
// detail set first.
func GroupingSets(mode TotalsMode, n int) []uint64 {
	full := uint64(1)<<n - 1
	switch {
	case n == 0 || mode == TotalsNone:
		return []uint64{0}
	case mode == TotalsGrand:
		return []uint64{0, full}
	case mode == TotalsRollup:
		var out []uint64
		for j := 0; j <= n; j++ {
			out = append(out, uint64(1)<<j-1)
		}
		return out
	}
	var out []uint64
	for s := uint64(0); s <= full; s++ {
		out = append(out, s)
	}
	sort.SliceStable(out, func(i, j int) bool { return bits.OnesCount64(out[i]) < bits.OnesCount64(out[j]) })
	return out
}

// RolledUp names the groups a grouping mask rolls up.
func (q *Query) RolledUp(mask uint64) []string {
	out := []string{}
	n := len(q.Groups)
	for i := range q.Groups {
		if mask&(1<<(n-1-i)) != 0 {
			out = append(out, q.GroupNames[i])
		}
	}
	return out
}

type planner struct {
	q      *Query
	p      *Plan
	diags  grammar.Diagnostics
	leaves map[string]*LeafRef
	inputs map[*Scan]map[string]*Input
	// owner is the innermost measure whose expression is being compiled.
	owner *Measure
	// narrowedBy names the measure whose narrowing is in force, if any:
	// leaves under it are named after it.
	narrowedBy string
	// taken holds the names in use: leaves and the query's measures.
	taken map[string]bool
}

// NewPlan plans a query. Cell edits and per-grain measures are not planned
// yet: they are reported as errors rather than answered wrongly.
func NewPlan(q *Query) (*Plan, grammar.Diagnostics) {
	pl := &planner{q: q, p: &Plan{Query: q}, leaves: map[string]*LeafRef{},
		inputs: map[*Scan]map[string]*Input{}, taken: map[string]bool{}}
	pl.p.Sets = GroupingSets(q.Totals, len(q.Groups))
	for _, m := range q.Measures {
		pl.owner = m
		e := pl.compile(m.Expr, nil)
		if e != nil {
			out := &Output{Name: m.Name, Measure: m, Expr: e}
			pl.p.Outputs = append(pl.p.Outputs, out)
			if q.OrderBy == m {
				pl.p.OrderBy = out
			}
		}
	}
	if pl.diags.HasErrors() {
		return nil, pl.diags
	}
	for _, s := range pl.p.Scans {
		pl.checkReach(s)
		pl.joins(s)
	}
	if len(pl.p.Scans) > 1 {
		for _, o := range pl.p.Outputs {
			Walk(o.Expr, func(e Expr) bool {
				if lr, ok := e.(*LeafRef); ok && lr.Leaf.Func == "count" {
					lr.ZeroIfMissing = true
				}
				return true
			})
		}
	}
	pl.cautions()
	if pl.diags.HasErrors() {
		return nil, pl.diags
	}
	return pl.p, pl.diags
}

// compile turns a measure expression into arithmetic over leaves; filter
// holds the narrowing predicates in force.
func (pl *planner) compile(e Expr, filter []Expr) Expr {
	switch e := e.(type) {
	case *MeasureRef:
		outer := pl.owner
		pl.owner = e.Measure
		x := pl.compile(e.Measure.Expr, filter)
		pl.owner = outer
		return x
	case *NarrowExpr:
		outer := pl.narrowedBy
		pl.narrowedBy = pl.owner.Name
		x := pl.compile(e.X, append(slices.Clip(filter), e.Pred))
		pl.narrowedBy = outer
		return x
	case *Agg:
		return pl.leaf(e, filter)
	case *EditExpr:
		pl.diags.Errorf(e.Pos, "not-supported", "cell edits [...] are not supported by the planner yet (measure %s)", pl.owner.Name).
			Suggestion = "leave this measure out of the query for now"
		return nil
	case *PerAgg:
		pl.diags.Errorf(e.Pos, "not-supported", "per-grain aggregates (... per ...) are not supported by the planner yet (measure %s)", pl.owner.Name).
			Suggestion = "leave this measure out of the query for now"
		return nil
	case *BinOp:
		l, r := pl.compile(e.L, filter), pl.compile(e.R, filter)
		if l == nil || r == nil {
			return nil
		}
		return &BinOp{Pos: e.Pos, Op: e.Op, L: l, R: r, T: e.T}
	case *UnOp:
		x := pl.compile(e.X, filter)
		if x == nil {
			return nil
		}
		return &UnOp{Pos: e.Pos, Op: e.Op, X: x}
	case *Func:
		f := *e
		f.Args = nil
		for _, a := range e.Args {
			x := pl.compile(a, filter)
			if x == nil {
				return nil
			}
			f.Args = append(f.Args, x)
		}
		return &f
	case *CaseExpr:
		c := &CaseExpr{Pos: e.Pos, T: e.T}
		for _, w := range e.Whens {
			cond, then := pl.compile(w.Cond, filter), pl.compile(w.Then, filter)
			if cond == nil || then == nil {
				return nil
			}
			c.Whens = append(c.Whens, WhenArm{Cond: cond, Then: then})
		}
		if e.Else != nil {
			if c.Else = pl.compile(e.Else, filter); c.Else == nil {
				return nil
			}
		}
		return c
	case *IsNullExpr:
		x := pl.compile(e.X, filter)
		if x == nil {
			return nil
		}
		return &IsNullExpr{Pos: e.Pos, X: x, Not: e.Not}
	case *InExpr:
		in := &InExpr{Pos: e.Pos, Not: e.Not, List: e.List}
		if in.X = pl.compile(e.X, filter); in.X == nil {
			return nil
		}
		return in
	case *Lit:
		return e
	}
	pl.diags.Errorf(e.Position(), "internal", "cannot plan %T in measure %s", e, pl.owner.Name)
	return nil
}

// leaf finds or adds the scan leaf computing agg under filter.
func (pl *planner) leaf(a *Agg, filter []Expr) Expr {
	var ftexts []string
	for _, f := range filter {
		ftexts = append(ftexts, Text(f))
	}
	sort.Strings(ftexts)
	key := a.Table.Name + "|" + Text(a) + "|" + strings.Join(ftexts, " and ")
	if lr, ok := pl.leaves[key]; ok {
		return &LeafRef{Pos: a.Pos, Leaf: lr.Leaf, Scan: lr.Scan}
	}
	s := pl.scan(a.Table)
	base := pl.owner.Name
	if len(filter) > 0 && pl.narrowedBy != "" {
		base = pl.narrowedBy
	}
	l := &Leaf{Name: pl.name(base), Func: a.Func, Distinct: a.Distinct, T: a.T}
	if a.Arg != nil {
		l.Arg = pl.input(s, l.Name+"_arg", a.Arg)
	}
	if len(filter) > 0 {
		pred := filter[0]
		for _, f := range filter[1:] {
			pred = &BinOp{Pos: f.Position(), Op: "and", L: pred, R: f, T: TypeBoolean}
		}
		l.Filter = pl.input(s, l.Name+"_if", pred)
	}
	s.Leaves = append(s.Leaves, l)
	lr := &LeafRef{Pos: a.Pos, Leaf: l, Scan: s}
	pl.leaves[key] = lr
	return lr
}

// name gives a leaf a unique, readable name based on its measure's name,
// never the name of another measure of the query.
func (pl *planner) name(base string) string {
	for i := 1; ; i++ {
		cand := base
		if i > 1 {
			cand = fmt.Sprintf("%s_%d", base, i)
		}
		if pl.taken[cand] {
			continue
		}
		clash := false
		for _, m := range pl.q.Measures {
			clash = clash || (m.Name == cand && m.Name != base)
		}
		if !clash {
			pl.taken[cand] = true
			return cand
		}
	}
}

// input finds or adds a row-level value of the scan.
func (pl *planner) input(s *Scan, name string, e Expr) *Input {
	key := Text(e)
	if in, ok := pl.inputs[s][key]; ok {
		return in
	}
	in := &Input{Name: name, Expr: e}
	pl.inputs[s][key] = in
	s.Inputs = append(s.Inputs, in)
	return in
}

func (pl *planner) scan(t *Table) *Scan {
	for _, s := range pl.p.Scans {
		if s.Table == t {
			return s
		}
	}
	s := &Scan{Name: t.Name, Table: t, Where: pl.q.Filters}
	pl.inputs[s] = map[string]*Input{}
	pl.p.Scans = append(pl.p.Scans, s)
	return s
}

// measuresOf names the measures that read a scan.
func (pl *planner) measuresOf(s *Scan) string {
	var names []string
	for _, o := range pl.p.Outputs {
		Walk(o.Expr, func(e Expr) bool {
			if lr, ok := e.(*LeafRef); ok && lr.Scan == s && !slices.Contains(names, o.Name) {
				names = append(names, o.Name)
			}
			return true
		})
	}
	return strings.Join(names, ", ")
}

// checkReach reports groups and filters the scan's table cannot reach.
func (pl *planner) checkReach(s *Scan) {
	reach := Reach(s.Table)
	for i, g := range pl.q.Groups {
		if _, ok := reach[g.Table]; !ok {
			d := pl.diags.Errorf(pl.q.GroupPos[i], "unreachable", "cannot group by %s: measure %s iterates over %s, and no link leads from %s to %s",
				pl.q.GroupNames[i], pl.measuresOf(s), s.Table.Name, s.Table.Name, g.Table.Name)
			d.Suggestion = fmt.Sprintf("group by a column %s can reach, or add a link from %s towards %s", s.Table.Name, s.Table.Name, g.Table.Name)
		}
	}
	for _, f := range s.Where {
		for _, c := range Columns(f) {
			if _, ok := reach[c.Table]; !ok {
				pl.diags.Errorf(f.Position(), "unreachable", "cannot filter on %s: measure %s iterates over %s, and no link leads from %s to %s",
					c, pl.measuresOf(s), s.Table.Name, s.Table.Name, c.Table.Name)
				break
			}
		}
	}
	for _, in := range s.Inputs {
		for _, c := range Columns(in.Expr) {
			if _, ok := reach[c.Table]; !ok {
				pl.diags.Errorf(in.Expr.Position(), "unreachable", "measure %s narrows %s by %s, which %s cannot reach along links",
					pl.measuresOf(s), s.Table.Name, c, s.Table.Name)
				break
			}
		}
	}
}

// joins lists the links the scan follows, nearest first.
func (pl *planner) joins(s *Scan) {
	reach := Reach(s.Table)
	need := map[*Table]bool{}
	for _, g := range pl.q.Groups {
		need[g.Table] = true
	}
	var exprs []Expr
	exprs = append(exprs, s.Where...)
	for _, in := range s.Inputs {
		exprs = append(exprs, in.Expr)
	}
	for _, g := range pl.q.Groups {
		if g.Derived != nil {
			exprs = append(exprs, g.Derived)
		}
	}
	for _, e := range exprs {
		for _, c := range Columns(e) {
			need[c.Table] = true
		}
	}
	var links []*Link
	for t := range need {
		for _, l := range reach[t] {
			if !slices.Contains(links, l) {
				links = append(links, l)
			}
		}
	}
	depth := func(l *Link) int { return len(reach[l.To]) }
	sort.Slice(links, func(i, j int) bool {
		if depth(links[i]) != depth(links[j]) {
			return depth(links[i]) < depth(links[j])
		}
		return links[i].To.Name < links[j].To.Name
	})
	s.Joins = links
}

// cautions notes results that could mislead.
func (pl *planner) cautions() {
	for _, s := range pl.p.Scans {
		for _, l := range s.Leaves {
			if l.Arg != nil && l.Arg.Expr.Type() == TypeFloat && (l.Func == "sum" || l.Func == "avg") {
				pl.p.Cautions = append(pl.p.Cautions, fmt.Sprintf(
					"%s adds float values: the last digits can change with the order the engine reads rows in; declare the column decimal for exact sums",
					l.Name))
			}
		}
	}
}
