package main

import (
	"context"

	"github.com/spf13/cobra"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/engine"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/explain"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/planner/model"
	"github.com/rollwise/rollwise/planner/reference"
)

type explainOptions struct {
	models   []string
	measures []string
	by       []string
	where    string
	cell     string
	data     string
	dsn      string
	format   string
	live     liveFlags
}

func newExplainCmd(e *env) *cobra.Command {
	o := &explainOptions{}
	cmd := &cobra.Command{
		Use:   "explain MODEL... -m M [-b T.C,... -w PRED] [--cell 'T.C=v,...']",
		Short: "Show why a measure has its value in a cell: its parts, their cells and values",
		Long: `explain shows one measure as the tree of the measures and aggregates it is
made of: each part with its iteration tables, the narrowings and edits on
the way to it, its additivity, and, in the cell named by --cell (the grand
total without it), the row constraints it is evaluated under and its value
there. The values are computed by the reference evaluator from the rows
the measure reads, loaded from the embedded DuckDB (or --dsn), and match
what run prints for the same cell.`,
		Example: `  rollwise explain garden.roll -m margin_rate -b districts.region --cell "districts.region='North'"
  rollwise explain garden.roll -m growth --cell calendar.month_start=2026-03-01 --format json`,
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := modelArgs(args); err != nil {
				return err
			}
			o.models = args
			return scrubDSN(o.dsn, runExplain(e, o))
		},
	}
	f := cmd.Flags()
	listVarP(f, &o.measures, "measures", "m", "the measure to explain")
	listVarP(f, &o.by, "by", "b", "group columns of the report the cell belongs to, written table.column (default: the columns --cell names)")
	whereVar(f, &o.where)
	onceStringVarP(f, &o.cell, "cell", "", "", "the cell, as group values: \"stores.region='North',sales.item='rose'\" (default: the grand total)")
	f.StringVar(&o.data, "data", "", "read each table from DIR/NAME.csv or DIR/NAME.parquet")
	f.StringVar(&o.dsn, "dsn", "", "read the rows from a live database instead: postgres://..., mysql://... or sqlite:PATH")
	onceStringVarP(f, &o.format, "format", "", "table", "table (an indented tree) or json")
	o.live.add(f)
	return cmd
}

func runExplain(e *env, o *explainOptions) error {
	if o.format != "table" && o.format != "json" {
		return failure.Usagef("--format takes table or json, not %q", o.format)
	}
	if len(o.measures) != 1 {
		return failure.Usagef("explain takes one measure (-m M), not %d", len(o.measures))
	}
	pairs, err := explain.SplitCell(o.cell)
	if o.cell == "" {
		pairs, err = nil, nil
	}
	if err != nil {
		return failure.New(failure.Usage, err)
	}
	qo := queryOptions{models: o.models, measures: o.measures, by: o.by, where: o.where, dialect: "duckdb"}
	if len(qo.by) == 0 {
		for _, p := range pairs {
			qo.by = append(qo.by, p.Ref)
		}
	}
	if o.dsn != "" {
		if qo.dialect, err = liveDialect(o.dsn, "", false, o.data); err != nil {
			return err
		}
	}
	c, err := compile(e, &qo)
	if err != nil {
		return err
	}
	cell, err := explain.Resolve(c.Query, pairs)
	if err != nil {
		return failure.New(failure.Usage, err)
	}
	data, err := explainData(e.context(), c.Model, c.Query, o)
	if err != nil {
		return err
	}
	if err := explain.Check(data, c.Query, cell); err != nil {
		return failure.New(failure.Findings, err)
	}
	tree, err := explain.Explain(data, c.Query, cell)
	if err != nil {
		return failure.New(failure.Findings, err)
	}
	if o.format == "json" {
		err = explain.WriteJSON(e.stdout, tree)
	} else {
		err = explain.WriteText(e.stdout, tree)
	}
	if err != nil {
		return failure.New(failure.Internal, err)
	}
	printCautions(e, c.Notes)
	return nil
}

// explainData loads the rows of the tables q reads, from the live
// database of --dsn or from the embedded DuckDB over the model's files
// (or --data).
func explainData(ctx context.Context, m *model.Model, q *model.Query, o *explainOptions) (*reference.Data, error) {
	tables := explain.Tables(m, q)
	eng, err := openEngine(ctx, engine.Target{DSN: o.dsn, Live: o.live.options(), Model: m, DataDir: o.data,
		DuckDB: engine.Options{Tables: tables}})
	if err != nil {
		return nil, err
	}
	defer eng.Close()
	data, err := explain.Load(ctx, m, tables, eng)
	if err != nil {
		if _, ok := failure.KindOf(err); ok {
			return nil, err
		}
		return nil, failure.New(failure.Findings, err)
	}
	return data, nil
}
