package model

import "slices"

// AdditiveMeasure reports whether measure expression e is sums and counts joined
// by + and -, through the measures it names, so that its value over a
// set of rows is the sum of its values over the parts: its subtotals
// equal the sums of their rows (common practice: the definition of an
// additive measure). Anything else is re-evaluated in every cell.
func AdditiveMeasure(e Expr) bool { return additiveIn(e, map[*Measure]bool{}) }

func additiveIn(e Expr, seen map[*Measure]bool) bool {
	switch x := e.(type) {
	case *Agg:
		return (x.Func == "sum" || x.Func == "count") && !x.Distinct
	case *MeasureRef:
		if seen[x.Measure] {
			return false
		}
		seen[x.Measure] = true
		return additiveIn(x.Measure.Expr, seen)
	case *BinOp:
		return (x.Op == "+" || x.Op == "-") && additiveIn(x.L, seen) && additiveIn(x.R, seen)
	}
	return false
}

// WalkMeasures walks e as Walk does, and the expression of every measure
// it names (through measures they name), each measure once.
func WalkMeasures(e Expr, fn func(Expr) bool) {
	seen := map[*Measure]bool{}
	var walk func(e Expr)
	walk = func(e Expr) {
		Walk(e, func(x Expr) bool {
			if !fn(x) {
				return false
			}
			if r, ok := x.(*MeasureRef); ok && r.Measure != nil && !seen[r.Measure] {
				seen[r.Measure] = true
				walk(r.Measure.Expr)
			}
			return true
		})
	}
	walk(e)
}

// IterationTables are the tables whose rows e's aggregates iterate over,
// through the measures it names, in first-use order; a count(* per ...)
// counts the groups of its first per column's table.
func IterationTables(e Expr) []*Table {
	var out []*Table
	add := func(t *Table) {
		if t != nil && !slices.Contains(out, t) {
			out = append(out, t)
		}
	}
	WalkMeasures(e, func(x Expr) bool {
		switch x := x.(type) {
		case *Agg:
			add(x.Table)
		case *PerAgg:
			if x.X == nil && len(x.Per) > 0 {
				add(x.Per[0].Table)
			}
		}
		return true
	})
	return out
}
