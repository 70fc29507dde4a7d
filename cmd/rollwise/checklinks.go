package main

import (
	"context"
	"fmt"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/engine"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/grammar"
	"github.com/rollwise/rollwise/planner/model"
)

// requiredLinks lists the links of m declared required, in declaration
// order.
func requiredLinks(m *model.Model) []*model.Link {
	var out []*model.Link
	for _, t := range m.Tables {
		for _, l := range t.Links {
			if l.Required {
				out = append(out, l)
			}
		}
	}
	return out
}

// checkData checks, on the data (the embedded engine over the model's
// files or dataDir, or the live database at dsn), every promise the model
// makes about it: each link declared required finds its row, and each
// declared key (and each semiadditive column's key and date) is on one
// row (checkUnique). Each broken promise is an error at its declaration.
func checkData(ctx context.Context, m *model.Model, dataDir, dsn string, lo engine.LiveOptions) (grammar.Diagnostics, error) {
	links := requiredLinks(m)
	if len(links) == 0 && len(uniquenesses(m)) == 0 {
		return nil, nil
	}
	eng, err := openEngine(ctx, engine.Target{DSN: dsn, Live: lo, Model: m, DataDir: dataDir})
	if err != nil {
		return nil, err
	}
	defer eng.Close()
	d, err := dialects.Get(eng.Dialect())
	if err != nil {
		return nil, failure.New(failure.Internal, err)
	}
	var diags grammar.Diagnostics
	for _, l := range links {
		res, err := eng.Query(ctx, dialects.UnmatchedRows(l, d), nil)
		if err != nil {
			return nil, failure.Newf(failure.Input, "counting the rows of %s that link %s misses: %w", l.From.Name, l, err)
		}
		if len(res.Rows) != 1 || len(res.Rows[0]) != 1 {
			return nil, failure.Newf(failure.Internal, "internal error: counting unmatched rows gave %v", res.Rows)
		}
		if n := fmt.Sprint(res.Rows[0][0]); n != "0" {
			rows := n + " rows of " + l.From.Name + " find"
			if n == "1" {
				rows = "1 row of " + l.From.Name + " finds"
			}
			x := diags.Errorf(l.Pos, "required-unmatched", "link %s is declared required, but %s no row of %s", l, rows, l.To.Name)
			x.Notes = []string{"a row whose link columns are NULL finds no row either"}
			x.Suggestion = "fix the data, or remove `required`: while the data breaks the promise, results that read " +
				l.To.Name + " through this link are wrong"
		}
	}
	u, err := checkUnique(ctx, eng, d, m)
	diags.Append(u)
	return diags, err
}
