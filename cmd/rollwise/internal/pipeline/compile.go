package pipeline

import (
	"fmt"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/plan"
)

// Request is what to compute: measures by groups under a filter, or a
// view block of the model (whose totals, order and limit the request may
// change), in a dialect.
type Request struct {
	model.Request
	// View names a view block to compute instead of Measures, By and
	// Where.
	View string
	// Dialect is the dialect's name (dialects.Get).
	Dialect string
	// Approximate allows the dialect to answer approximately what it
	// cannot answer exactly; the notes then say so.
	Approximate bool
}

// Options say how to render a query: in which dialect, whether it may
// approximate, and whether the statement is the body of a view.
type Options struct {
	Dialect     *dialects.Dialect
	Approximate bool
	// View renders the statement as a view's body (dialects.RenderView).
	View bool
}

// Compiled is a query planned and rendered.
type Compiled struct {
	Model *model.Model
	Query *model.Query
	Plan  *plan.Plan
	SQL   string
	// Notes are what the reader of the result must know (the plan's
	// cautions, an approximation); a command adds those of the engine.
	Notes []string
	// Approximation is the note of an approximation (also among Notes),
	// or "" when the dialect answered exactly.
	Approximation string
}

// Compile resolves the request against m, plans the query and renders it.
// The diagnostics (positions in the request's parts, under the names
// r.Names gives them) hold the errors and warnings; the error is a usage error for an
// unknown dialect or a bad option, of kind Findings for a query the model
// or the dialect cannot answer, or the kind the diagnostics give
// (failure.Diagnostics).
func Compile(m *model.Model, r Request) (*Compiled, grammar.Diagnostics, error) {
	d, err := r.dialect()
	if err != nil {
		return nil, nil, err
	}
	var q *model.Query
	var diags grammar.Diagnostics
	if r.View != "" {
		if len(r.Measures)+len(r.By) > 0 || r.Where != "" {
			return nil, nil, failure.Usagef("--view computes the view as declared; leave out -m, -b and -w")
		}
		v, err := view(m, r.View)
		if err != nil {
			return nil, nil, err
		}
		q = m.ViewQuery(v)
		diags = q.Override(model.Request{Totals: r.Totals, Order: r.Order, Limit: r.Limit, Names: r.Names})
	} else {
		q, diags = m.NewQuery(r.Request)
	}
	if diags.HasErrors() {
		return nil, diags, failure.Diagnostics(diags)
	}
	c, d2, err := Render(m, q, Options{Dialect: d, Approximate: r.Approximate})
	diags.Append(d2)
	if err != nil {
		if _, ok := failure.KindOf(err); !ok {
			err = failure.New(failure.Findings, err)
		}
		return nil, diags, err
	}
	return c, diags, nil
}

// Check returns the usage error of a request that no model can answer:
// an unknown dialect, a negative limit. A command checks before it loads
// the model.
func (r Request) Check() error {
	_, err := r.dialect()
	return err
}

// dialect is the request's dialect, after checking the request.
func (r Request) dialect() (*dialects.Dialect, error) {
	d, err := dialects.Get(r.Dialect)
	if err != nil {
		return nil, failure.New(failure.Usage, err)
	}
	if r.Limit < 0 {
		return nil, failure.Usagef("--limit must be a positive number, not %d", r.Limit)
	}
	return d, nil
}

// view finds the view block called name, or says which name was meant.
func view(m *model.Model, name string) (*model.View, error) {
	var names []string
	for _, x := range m.Views {
		if x.Name == name {
			return x, nil
		}
		names = append(names, x.Name)
	}
	msg := fmt.Sprintf("the model has no view %q", name)
	if near := grammar.Closest(name, names); near != "" {
		msg += fmt.Sprintf("; did you mean %q?", near)
	}
	return nil, failure.Newf(failure.Findings, "%s", msg)
}

// Render plans q, a query of model m, and renders it as o says. The
// diagnostics are the planner's; the error is the diagnostics' error
// (failure.Diagnostics) when the planner found errors, and the dialect's
// refusal, without a kind, when it cannot render the plan.
func Render(m *model.Model, q *model.Query, o Options) (*Compiled, grammar.Diagnostics, error) {
	p, diags := plan.NewPlan(q)
	if p == nil || diags.HasErrors() {
		if err := failure.Diagnostics(diags); err != nil {
			return nil, diags, err
		}
		return nil, diags, failure.Newf(failure.Internal, "internal error: the planner gave no plan")
	}
	render := dialects.RenderWith
	if o.View {
		render = dialects.RenderView
	}
	sql, note, err := render(p, o.Dialect, dialects.Options{Approximate: o.Approximate})
	if err != nil {
		return nil, diags, err
	}
	c := &Compiled{Model: m, Query: q, Plan: p, SQL: sql, Notes: append([]string{}, p.Cautions...)}
	if note != "" {
		c.Notes = append(c.Notes, note)
		c.Approximation = note
	}
	return c, diags, nil
}
