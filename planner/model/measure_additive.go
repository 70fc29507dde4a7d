package model

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
