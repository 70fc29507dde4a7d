package dialects

import (
	"errors"
	"fmt"
	"strings"

	"github.com/rollwise/rollwise/planner/model"
)

// approximator is implemented by dialects with an approximate median.
type approximator interface {
	approxMedian(arg string) string
}

// callApproximator is implemented by dialects that refuse a scalar
// function they can only approximate: it returns the approximate spelling
// and a note that says what is approximate.
type callApproximator interface {
	approxCall(name string, args []string, types []model.Type) (sql, note string, ok bool)
}

// Approximate is a dialect allowed to answer approximately what it cannot
// answer exactly, or only slowly (the user's --approximate): a median
// where the engine has no exact median aggregate (Render computes it
// exactly with window functions otherwise), a function it computes
// differently. Approximated
// tells whether a rendering used an approximation, so that the output can
// say so.
type Approximate struct {
	Dialect
	median bool
	notes  []string
}

// WithApproximate allows d to answer approximately. A dialect with nothing
// to approximate is returned unchanged: it either needs no approximation
// or still refuses.
func WithApproximate(d Dialect) Dialect {
	c := d.Caps()
	_, hasMedian := d.(approximator)
	median := hasMedian && !c.ExactMedian && c.ApproxMedian
	_, calls := d.(callApproximator)
	if !median && !calls {
		return d
	}
	return &Approximate{Dialect: d, median: median}
}

// Caps reports an exact median where an approximate one will do, so that
// the renderer asks Agg for one.
func (a *Approximate) Caps() Caps {
	c := a.Dialect.Caps()
	c.ExactMedian = c.ExactMedian || a.median
	return c
}

// Agg spells the median approximately where the engine has no exact one.
func (a *Approximate) Agg(fn string, distinct bool, arg string) (string, error) {
	if fn == "median" && a.median && !distinct && arg != "" {
		ap := a.Dialect.(approximator)
		a.note(fmt.Sprintf("medians are approximate: %s has no exact median aggregate, and --approximate uses %s instead of the exact median by window functions",
			a.Dialect.Name(), ap.approxMedian("x")))
		return ap.approxMedian(arg), nil
	}
	return a.Dialect.Agg(fn, distinct, arg)
}

// Call spells a function the engine refuses approximately, if it can.
func (a *Approximate) Call(name string, args []string, types []model.Type) (string, error) {
	s, err := a.Dialect.Call(name, args, types)
	var ue *UnsupportedError
	if ap, ok := a.Dialect.(callApproximator); ok && errors.As(err, &ue) {
		if sql, note, ok := ap.approxCall(name, args, types); ok {
			a.note(note)
			return sql, nil
		}
	}
	return s, err
}

func (a *Approximate) note(n string) {
	for _, m := range a.notes {
		if m == n {
			return
		}
	}
	a.notes = append(a.notes, n)
}

// Approximated reports whether d rendered an approximation, and the note
// that says what is approximate.
func Approximated(d Dialect) (string, bool) {
	if a, ok := d.(*Approximate); ok && len(a.notes) > 0 {
		return strings.Join(a.notes, "; "), true
	}
	return "", false
}
