package dialects

import (
	"errors"
	"fmt"
	"slices"

	"github.com/rollwise/rollwise/planner/model"
)

// The renderer's side of Options.Approximate: where the dialect has no
// exact median aggregate but an approximate one (approxMedian), a median
// is that aggregate instead of the exact median by window functions
// (render_median.go); a scalar function the dialect refuses with a note
// for --approximate (refusal.approximate) is spelled plainly. Each use
// adds a note, which RenderWith returns as the caution.

// windowMedians reports whether medians must be computed with windows:
// the dialect has no exact median aggregate, nor may approximate one.
func (r *renderer) windowMedians() bool {
	return !r.d.exactMedian() && !r.approxMedians()
}

func (r *renderer) approxMedians() bool {
	return r.approximate && !r.d.exactMedian() && r.d.approxMedian != ""
}

// agg spells an aggregate as the dialect's Agg does, or a median
// approximately where the options allow it.
func (r *renderer) agg(fn string, distinct bool, arg string) (string, error) {
	if fn == "median" && !distinct && arg != "" && r.approxMedians() {
		r.note(fmt.Sprintf("medians are approximate: %s has no exact median aggregate, and --approximate uses %s instead of the exact median by window functions",
			r.d.name, r.d.fillArg(r.d.approxMedian, "x")))
		return r.d.fillArg(r.d.approxMedian, arg), nil
	}
	return r.d.Agg(fn, distinct, arg)
}

// filteredAgg is the package's filteredAgg with the rendering's options.
func (r *renderer) filteredAgg(fn string, distinct bool, arg, filter string) (string, error) {
	return filteredAgg(r.d, r.agg, fn, distinct, arg, filter)
}

// call spells a scalar function as the dialect's Call does, or plainly a
// function it refuses where the options allow it.
func (r *renderer) call(name string, args []string, types []model.Type) (string, error) {
	s, err := r.d.Call(name, args, types)
	var ue *UnsupportedError
	if r.approximate && errors.As(err, &ue) {
		if ref := r.d.refused[name]; ref.approximate != "" {
			r.note(ref.approximate)
			return plainCall(name, args), nil
		}
	}
	return s, err
}

func (r *renderer) note(n string) {
	if !slices.Contains(r.notes, n) {
		r.notes = append(r.notes, n)
	}
}
