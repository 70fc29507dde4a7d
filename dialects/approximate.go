package dialects

import "fmt"

// approximator is implemented by dialects with an approximate median.
type approximator interface {
	approxMedian(arg string) string
}

// Approximate is a dialect allowed to compute a median approximately
// where it has no exact one: the user's --approximate. Used reports
// whether a rendering actually used an approximation, so that the output
// can say so.
type Approximate struct {
	Dialect
	used bool
}

// WithApproximate allows d to answer medians approximately. A dialect with
// an exact median, or with no approximate one, is returned unchanged: it
// either needs no approximation or still refuses.
func WithApproximate(d Dialect) Dialect {
	c := d.Caps()
	if c.ExactMedian || !c.ApproxMedian {
		return d
	}
	if _, ok := d.(approximator); !ok {
		return d
	}
	return &Approximate{Dialect: d}
}

// Caps reports an exact median, so that the renderer asks Agg for one.
func (a *Approximate) Caps() Caps {
	c := a.Dialect.Caps()
	c.ExactMedian = true
	return c
}

// Agg spells the median approximately.
func (a *Approximate) Agg(fn string, distinct bool, arg string) (string, error) {
	if fn == "median" && !distinct && arg != "" {
		a.used = true
		return a.Dialect.(approximator).approxMedian(arg), nil
	}
	return a.Dialect.Agg(fn, distinct, arg)
}

// Used reports whether an approximate median was rendered.
func (a *Approximate) Used() bool { return a.used }

// Note says what was approximated, for the output.
func (a *Approximate) Note() string {
	return fmt.Sprintf("medians are approximate: %s has no exact median aggregate, and --approximate uses %s",
		a.Dialect.Name(), a.Dialect.(approximator).approxMedian("x"))
}

// Approximated reports whether d rendered an approximation, and the note
// that says so.
func Approximated(d Dialect) (string, bool) {
	if a, ok := d.(*Approximate); ok && a.Used() {
		return a.Note(), true
	}
	return "", false
}
