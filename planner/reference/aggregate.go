package reference

import (
	"fmt"
	"math"
	"math/big"
	"sort"

	"github.com/shopspring/decimal"

	"github.com/rollwise/rollwise/planner/model"
)

// aggregate applies an aggregate function to values, as language.md
// defines them: NULLs are skipped; sum, avg, min, max, median, stddev and
// variance of nothing are NULL; count of nothing is 0; median is the
// continuous median; stddev and variance are the sample statistics. t is
// the aggregate's static type: a float sum is added in floats, an exact
// one exactly. Exact statistics are computed exactly and rounded once.
func aggregate(fn string, distinct bool, vals []Value, t model.Type) (Value, error) {
	var xs []Value
	seen := map[string]bool{}
	for _, v := range vals {
		if v == nil {
			continue
		}
		if distinct {
			k := key(v)
			if seen[k] {
				continue
			}
			seen[k] = true
		}
		xs = append(xs, v)
	}
	if fn == "count" {
		return decimal.NewFromInt(int64(len(xs))), nil
	}
	if len(xs) == 0 {
		return nil, nil
	}
	switch fn {
	case "min", "max":
		best := xs[0]
		for _, x := range xs[1:] {
			c, err := compare(x, best)
			if err != nil {
				return nil, err
			}
			if (fn == "min" && c < 0) || (fn == "max" && c > 0) {
				best = x
			}
		}
		return best, nil
	}
	for _, x := range xs {
		if !isNumber(x) {
			return nil, fmt.Errorf("%s of a %s value", fn, kindOf(x))
		}
	}
	exact := allExact(xs)
	switch fn {
	case "sum":
		if exact && t != model.TypeFloat {
			s := decimal.Zero
			for _, x := range xs {
				s = s.Add(x.(decimal.Decimal))
			}
			return s, nil
		}
		s := 0.0
		for _, x := range xs {
			s += toFloat(x)
		}
		return s, nil
	case "avg":
		if exact {
			return ratFloat(ratMean(xs)), nil
		}
		s := 0.0
		for _, x := range xs {
			s += toFloat(x)
		}
		return s / float64(len(xs)), nil
	case "median":
		return median(xs, exact), nil
	case "variance", "stddev":
		if len(xs) < 2 {
			return nil, nil
		}
		v := variance(xs, exact)
		if fn == "stddev" {
			return math.Sqrt(v), nil
		}
		return v, nil
	}
	return nil, fmt.Errorf("unknown aggregate %s", fn)
}

func allExact(xs []Value) bool {
	for _, x := range xs {
		if _, ok := x.(decimal.Decimal); !ok {
			return false
		}
	}
	return true
}

func ratMean(xs []Value) *big.Rat {
	s := new(big.Rat)
	for _, x := range xs {
		s.Add(s, toRat(x))
	}
	return s.Quo(s, new(big.Rat).SetInt64(int64(len(xs))))
}

// median is the continuous median: the middle value, or the mean of the
// two middle values for an even count.
func median(xs []Value, exact bool) Value {
	n := len(xs)
	if exact {
		rs := make([]*big.Rat, n)
		for i, x := range xs {
			rs[i] = toRat(x)
		}
		sort.Slice(rs, func(i, j int) bool { return rs[i].Cmp(rs[j]) < 0 })
		if n%2 == 1 {
			return ratFloat(rs[n/2])
		}
		m := new(big.Rat).Add(rs[n/2-1], rs[n/2])
		return ratFloat(m.Quo(m, big.NewRat(2, 1)))
	}
	fs := make([]float64, n)
	for i, x := range xs {
		fs[i] = toFloat(x)
	}
	sort.Float64s(fs)
	if n%2 == 1 {
		return fs[n/2]
	}
	return (fs[n/2-1] + fs[n/2]) / 2
}

// variance is the sample variance (divided by n-1), for n >= 2.
func variance(xs []Value, exact bool) float64 {
	n := len(xs)
	if exact {
		mean := ratMean(xs)
		ss := new(big.Rat)
		for _, x := range xs {
			d := new(big.Rat).Sub(toRat(x), mean)
			ss.Add(ss, d.Mul(d, d))
		}
		return ratFloat(ss.Quo(ss, new(big.Rat).SetInt64(int64(n-1))))
	}
	mean := 0.0
	for _, x := range xs {
		mean += toFloat(x)
	}
	mean /= float64(n)
	ss := 0.0
	for _, x := range xs {
		d := toFloat(x) - mean
		ss += d * d
	}
	return ss / float64(n-1)
}
