package dialects

import (
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
)

// Layers. A measure built on measures compiles to a graph: each measure's
// value in a cell is one plan.Computed node, whatever the number of
// expressions that use it. Written out as text, a node used twice would be
// written twice, and a chain of such measures doubles the SQL at every
// step. So a node used by more than one expression is computed once, as a
// named column of a CTE, and read by name: the first layer selects the
// context's rows (the same FROM clause as before) with the values of the
// relations the later layers read and the nodes that need nothing else;
// each further layer is a SELECT over the one before it, adding the
// nodes whose inputs are all there. A node used once is written inline
// where it is used, so a query without shared measures gets the same SQL
// as without layers. The aggregates are unchanged: layers read the cells
// the scans computed, one row per cell, and never the tables.

// layering is the state of one context's layers while they are rendered:
// the column each shared node and each relation value is read as.
type layering struct {
	nodes  map[*plan.Computed]string
	values map[string]string
}

// layers renders the result expressions of ctx (the query's outputs, or a
// sub-context's values), named names, computing every node used more than
// once in layers. When there are layers, ctx's FROM clause becomes the
// last layer, whose columns are the context's keys, grouping column and
// layered values.
func (r *renderer) layers(ctx *plan.Context, exprs []model.Expr, names []string) ([]string, error) {
	uses := map[*plan.Computed]int{}
	var order []*plan.Computed
	var count func(e model.Expr)
	count = func(e model.Expr) {
		model.Walk(e, func(x model.Expr) bool {
			if c, ok := x.(*plan.Computed); ok {
				if uses[c]++; uses[c] == 1 {
					count(c.X)
					order = append(order, c)
				}
			}
			return true
		})
	}
	for _, e := range exprs {
		count(e)
	}
	var shared []*plan.Computed
	for _, c := range order {
		if uses[c] > 1 {
			shared = append(shared, c)
		}
	}
	if len(shared) == 0 {
		return r.values(exprs)
	}
	lay := &layering{nodes: map[*plan.Computed]string{}, values: map[string]string{}}
	taken := map[string]bool{GroupingColumn: true}
	for _, k := range ctx.Keys {
		taken[k.Name] = true
	}
	for _, n := range names {
		taken[n] = true
	}
	unique := func(base string) string {
		for i := 1; ; i++ {
			cand := base
			if i > 1 {
				cand = fmt.Sprintf("%s_%d", base, i)
			}
			if !taken[cand] {
				taken[cand] = true
				return cand
			}
		}
	}
	// An output that is a shared node gives it its own name.
	for i, e := range exprs {
		if c, ok := e.(*plan.Computed); ok && uses[c] > 1 && lay.nodes[c] == "" {
			lay.nodes[c] = names[i]
		}
	}
	for _, c := range shared {
		if lay.nodes[c] == "" {
			lay.nodes[c] = unique(c.Measure.Name)
		}
	}

	// A node's level is one more than the highest level among the shared
	// nodes it reads; the first layer computes level 1.
	level := map[*plan.Computed]int{}
	var levelOf func(e model.Expr) int
	levelOf = func(e model.Expr) int {
		top := 0
		model.Walk(e, func(x model.Expr) bool {
			c, ok := x.(*plan.Computed)
			if !ok {
				return true
			}
			if _, named := lay.nodes[c]; !named {
				top = max(top, levelOf(c.X))
				return false
			}
			if _, done := level[c]; !done {
				level[c] = levelOf(c.X) + 1
			}
			top = max(top, level[c])
			return false
		})
		return top
	}
	depth := 0
	for _, e := range exprs {
		depth = max(depth, levelOf(e))
	}
	byLevel := make([][]*plan.Computed, depth+1)
	for _, c := range shared {
		byLevel[level[c]] = append(byLevel[level[c]], c)
	}

	// The relation values read above the first layer, in first-use order.
	var carried []*plan.ValueRef
	seen := map[*plan.Computed]bool{}
	var reads func(e model.Expr)
	reads = func(e model.Expr) {
		model.Walk(e, func(x model.Expr) bool {
			switch x := x.(type) {
			case *plan.ValueRef:
				k := valueKey(x)
				if _, ok := lay.values[k]; !ok {
					lay.values[k] = unique(x.Column)
					carried = append(carried, x)
				}
			case *plan.Computed:
				if _, named := lay.nodes[x]; !named && !seen[x] {
					seen[x] = true
					reads(x.X)
				}
				return false
			}
			return true
		})
	}
	for _, e := range exprs {
		reads(e)
	}
	for _, c := range shared {
		if level[c] > 1 {
			reads(c.X)
		}
	}

	// The first layer: the context's rows, with the carried values and
	// the first level's nodes, rendered as before (no layer columns yet).
	var cols []string
	for _, k := range ctx.Keys {
		cols = append(cols, r.keyCol(ctx, k.Name))
	}
	cols = append(cols, r.keyCol(ctx, GroupingColumn))
	for _, v := range carried {
		s, err := r.expr(v)
		if err != nil {
			return nil, err
		}
		cols = append(cols, s+" AS "+r.q(lay.values[valueKey(v)]))
	}
	cols, err := r.layerCols(cols, byLevel[1], lay)
	if err != nil {
		return nil, err
	}
	from, _ := r.from(ctx)
	prev := r.cteName(prefix(ctx.Name, "layer_1"))
	body := "  SELECT\n    " + strings.Join(cols, ",\n    ") + "\n  FROM " + strings.ReplaceAll(from, "\n", "\n  ")
	// A dialect that limits the number of CTEs in a statement (MariaDB:
	// 64, as each is a bit of a table map) nests its layers as derived
	// tables in one CTE, each layer the FROM of the next (not indented
	// further, so that the text stays linear in the depth), each ending
	// with layerTail, which keeps the engine from merging it into the
	// layer that reads it.
	nest := r.d.layerTail != ""

	// Later layers read the earlier layers' columns by name.
	outer := r.layer
	r.layer = lay
	defer func() { r.layer = outer }()
	for l := 2; l <= depth; l++ {
		if len(byLevel[l]) == 0 {
			continue
		}
		cols, err := r.layerCols([]string{r.q(prev) + ".*"}, byLevel[l], lay)
		if err != nil {
			return nil, err
		}
		next := r.cteName(prefix(ctx.Name, fmt.Sprintf("layer_%d", l)))
		if nest {
			body = "  SELECT\n    " + strings.Join(cols, ",\n    ") + "\n  FROM (\n" + body + r.d.layerTail + "\n  ) AS " + r.q(prev)
		} else {
			r.ctes = append(r.ctes, r.layerSQL(prev, body))
			body = "  SELECT\n    " + strings.Join(cols, ",\n    ") + "\n  FROM " + r.q(prev)
		}
		prev = next
	}
	r.ctes = append(r.ctes, r.layerSQL(prev, body))
	r.keyRel[ctx] = prev
	r.froms[ctx] = fromClause{sql: r.q(prev), single: true}
	return r.values(exprs)
}

// layerCols adds the columns computing nodes to cols: each node's
// expression, over the columns of the layers before (r.layer, nil for the
// first layer).
func (r *renderer) layerCols(cols []string, nodes []*plan.Computed, lay *layering) ([]string, error) {
	for _, c := range nodes {
		s, err := r.value(c.X)
		if err != nil {
			return nil, err
		}
		cols = append(cols, s+" AS "+r.q(lay.nodes[c]))
	}
	return cols, nil
}

// values renders expressions as values.
func (r *renderer) values(exprs []model.Expr) ([]string, error) {
	out := make([]string, len(exprs))
	for i, e := range exprs {
		s, err := r.value(e)
		if err != nil {
			return nil, err
		}
		out[i] = s
	}
	return out, nil
}

// valueKey identifies a relation's column.
func valueKey(v *plan.ValueRef) string {
	return fmt.Sprintf("%p|%s", v.Rel, v.Column)
}

// computed renders a Computed node: its layer column, or its expression
// as a value (a node is never a predicate: see IsPredicate).
func (r *renderer) computed(c *plan.Computed) (string, error) {
	if r.layer != nil {
		if name, ok := r.layer.nodes[c]; ok {
			return r.q(name), nil
		}
	}
	return r.value(c.X)
}

// layerSQL is the WITH entry of a layer: AS MATERIALIZED on a dialect
// that would merge a CTE read once into the query that reads it, copying
// each expression of the CTE into every place that reads its column (so
// that a chain of layers would grow again in the engine's planner).
func (r *renderer) layerSQL(name, body string) string {
	if r.d.materialize {
		return r.q(name) + " AS MATERIALIZED (\n" + body + "\n)"
	}
	return r.cteSQL(name, body)
}
