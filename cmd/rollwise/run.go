package main

import (
	"context"
	"fmt"

	"github.com/spf13/cobra"

	"github.com/rollwise/rollwise/cmd/rollwise/engine"
	"github.com/rollwise/rollwise/cmd/rollwise/report"
	"github.com/rollwise/rollwise/dialects"
)

type runOptions struct {
	queryOptions
	data   string
	format string
	// dsn names a live database to run on; dialectSet says -d was given.
	dsn        string
	dialectSet bool
}

func newRunCmd(e *env) *cobra.Command {
	o := &runOptions{}
	cmd := &cobra.Command{
		Use:   "run MODEL... -m M1,M2 [-b T.C,...] [flags]",
		Short: "Compute measures on the embedded DuckDB and print the result",
		Long: `run compiles the query exactly as 'sql' prints it and runs it on an embedded
DuckDB in which every table of the model is exposed under its 'at' relation,
read from its 'from' file (or from --data DIR/NAME.csv or NAME.parquet).`,
		Example: `  rollwise run garden.roll -m revenue,margin_rate -b plants.family --totals grand
  rollwise run garden.roll -m revenue,receipts -b stores.region,plants.family --totals rollup --format json`,
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := modelArgs(args); err != nil {
				return err
			}
			o.models = args
			o.dialectSet = cmd.Flags().Changed("dialect")
			return scrubDSN(o.dsn, runRun(e, o))
		},
	}
	o.addFlags(cmd)
	cmd.Flags().StringVar(&o.data, "data", "", "read each table from DIR/NAME.csv or DIR/NAME.parquet")
	onceStringVarP(cmd.Flags(), &o.format, "format", "", "table", "output: table, csv, json or markdown")
	cmd.Flags().StringVar(&o.dsn, "dsn", "", "run on a live database instead: postgres://..., mysql://... or sqlite:PATH (the dialect follows unless -d says otherwise)")
	return cmd
}

func runRun(e *env, o *runOptions) error {
	if err := report.ValidFormat(o.format); err != nil {
		return &exitError{code: exitUsage, err: err}
	}
	if o.dsn != "" {
		d, err := liveDialect(o.dsn, o.dialect, o.dialectSet, o.data)
		if err != nil {
			return err
		}
		o.dialect = d
	} else if o.dialect != "duckdb" {
		return usageErr("-d %s needs a live database: run executes on the embedded DuckDB unless --dsn URL names a database of that engine (rollwise sql -d %s prints the SQL without running it)", o.dialect, o.dialect)
	}
	c, err := compile(e, &o.queryOptions)
	if err != nil {
		return err
	}
	var t *report.Table
	if o.dsn != "" {
		t, err = executeLive(context.Background(), c, o.dsn)
	} else {
		t, err = execute(context.Background(), c, o.data)
	}
	if err != nil {
		return err
	}
	if err := report.Write(e.stdout, t, report.Options{Format: o.format, Color: isTerminal(e.stdout)}); err != nil {
		return &exitError{code: exitInternal, err: err}
	}
	printCautions(e, c.plan)
	return nil
}

// execute runs a compiled query on the embedded engine and shapes the rows
// for the report.
//
// Parquet decimals are read in the files' own types, which is faster
// (engine.Options.FileDecimals); a query that overflows them is run again
// with every decimal read as the model's DECIMAL(38,6), as before.
func execute(ctx context.Context, c *compiled, dataDir string) (*report.Table, error) {
	res, err := executeOn(ctx, c, dataDir, engine.Options{FileDecimals: true})
	if engine.Overflowed(err) {
		res, err = executeOn(ctx, c, dataDir, engine.Options{})
	}
	if err != nil {
		return nil, err
	}
	return shape(c, res)
}

// executeOn opens the embedded engine with options o and runs c there.
func executeOn(ctx context.Context, c *compiled, dataDir string, o engine.Options) (*engine.Result, error) {
	db, err := engine.Open(ctx, c.model, dataDir, o)
	if err != nil {
		return nil, &exitError{code: exitFindings, err: err}
	}
	defer db.Close()
	res, err := engine.Query(ctx, db, c.sql)
	if err != nil {
		return nil, &exitError{code: exitFindings, err: fmt.Errorf("the engine rejected the query: %w", err)}
	}
	return res, nil
}

// shape turns engine rows into report rows: group columns, measures, and
// the rolled-up groups read from the grouping column.
func shape(c *compiled, res *engine.Result) (*report.Table, error) {
	q := c.query
	t := &report.Table{}
	for _, g := range q.GroupNames {
		t.Columns = append(t.Columns, report.Column{Name: g, Group: true})
	}
	for _, o := range c.plan.Outputs {
		t.Columns = append(t.Columns, report.Column{Name: o.Name, Format: o.Measure.Format})
	}
	want := len(t.Columns) + 1
	if len(res.Columns) != want || res.Columns[want-1] != dialects.GroupingColumn {
		return nil, &exitError{code: exitInternal, err: fmt.Errorf("internal error: the result has columns %v", res.Columns)}
	}
	for _, row := range res.Rows {
		var mask uint64
		switch g := row[want-1].(type) {
		case int64:
			mask = uint64(g)
		case nil:
		default:
			return nil, &exitError{code: exitInternal, err: fmt.Errorf("internal error: grouping column holds %T", g)}
		}
		t.Rows = append(t.Rows, report.Row{Values: row[:want-1], RolledUp: q.RolledUp(mask)})
	}
	return t, nil
}
