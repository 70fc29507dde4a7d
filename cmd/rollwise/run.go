package main

import (
	"context"
	"strings"

	"github.com/spf13/cobra"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/engine"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/pipeline"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/report"
	"github.com/rollwise/rollwise/dialects"
	"github.com/rollwise/rollwise/planner/model"
)

type runOptions struct {
	queryOptions
	data   string
	format string
	// dsn names a live database to run on; dialectSet says -d was given.
	dsn        string
	dialectSet bool
	live       liveFlags
}

func newRunCmd(e *env) *cobra.Command {
	o := &runOptions{}
	cmd := &cobra.Command{
		Use:   "run MODEL... -m M1,M2 [-b T.C,...] [flags]",
		Short: "Compute measures on the embedded DuckDB and print the result",
		Long: `run compiles the query exactly as 'sql' prints it and runs it on an embedded
DuckDB in which the tables the query reads are exposed under their 'at'
relations, read from their 'from' files (or from --data DIR/NAME.csv or
NAME.parquet). The result is written as it arrives.`,
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
	onceStringVarP(cmd.Flags(), &o.format, "format", "", "table", "output: table, csv, json, markdown or html (one page with charts)")
	o.live.add(cmd.Flags())
	cmd.Flags().StringVar(&o.dsn, "dsn", "", "run on a live database instead: postgres://..., mysql://... or sqlite:PATH (the dialect follows unless -d says otherwise)")
	return cmd
}

func runRun(e *env, o *runOptions) error {
	if err := report.ValidFormat(o.format); err != nil {
		return failure.New(failure.Usage, err)
	}
	if o.dsn != "" {
		d, err := liveDialect(o.dsn, o.dialect, o.dialectSet, o.data)
		if err != nil {
			return err
		}
		o.dialect = d
	} else if o.dialect != "duckdb" {
		return failure.Usagef("-d %s needs a live database: run executes on the embedded DuckDB unless --dsn URL names a database of that engine (rollwise sql -d %s prints the SQL without running it)", o.dialect, o.dialect)
	}
	c, err := compile(e, &o.queryOptions)
	if err != nil {
		return err
	}
	// The rows go to the output as the engine returns them: a result of
	// any size is written in bounded memory. The html page is the
	// exception: its charts scale to all the values, so it holds the rows
	// (at most report.MaxHTMLRows; the rest are counted).
	var out *report.Stream
	var page *report.Table
	omitted := 0
	write := func(r report.Row) error {
		switch {
		case out != nil:
			if err := out.Row(r); err != nil {
				return failure.New(failure.Internal, err)
			}
		case len(page.Rows) < report.MaxHTMLRows:
			page.Rows = append(page.Rows, r)
		default:
			omitted++
		}
		return nil
	}
	if o.format == report.FormatHTML {
		page = &report.Table{Columns: reportColumns(c)}
	} else if out, err = report.NewStream(e.stdout, reportColumns(c), report.Options{Format: o.format, Color: isTerminal(e.stdout)}); err != nil {
		return failure.New(failure.Internal, err)
	}
	if o.dsn != "" {
		err = executeLive(e.context(), c, o.dsn, o.live.options(), write)
	} else {
		err = executeEach(e.context(), c, o.data, write)
	}
	if err != nil {
		return err
	}
	if page != nil {
		err = report.Write(e.stdout, page, report.Options{Format: o.format, Title: resultTitle(c), Cautions: c.Notes, Omitted: omitted})
	} else {
		err = out.Close()
	}
	if err != nil {
		return failure.New(failure.Internal, err)
	}
	printCautions(e, c.Notes)
	return nil
}

// resultTitle names a result for the html page: the measures, the group
// columns and the filter.
func resultTitle(c *pipeline.Compiled) string {
	var names []string
	for _, m := range c.Query.Measures {
		names = append(names, m.Name)
	}
	s := strings.Join(names, ", ")
	if len(c.Query.GroupNames) > 0 {
		s += " by " + strings.Join(c.Query.GroupNames, ", ")
	}
	for _, f := range c.Query.Filters {
		s += " where " + model.Text(f)
	}
	return s
}

// execute runs a compiled query on the embedded engine and returns the
// rows shaped for the report.
func execute(ctx context.Context, c *pipeline.Compiled, dataDir string) (*report.Table, error) {
	t := &report.Table{Columns: reportColumns(c)}
	err := executeEach(ctx, c, dataDir, func(r report.Row) error { t.Rows = append(t.Rows, r); return nil })
	if err != nil {
		return nil, err
	}
	return t, nil
}

// executeEach runs a compiled query on the embedded engine, with only the
// tables it reads loaded, and hands each row, shaped for the report, to
// write.
//
// Parquet decimals are read in the files' own types, which is faster
// (engine.Options.FileDecimals); a query that overflows them before its
// first row is run again with every decimal read as the model's
// DECIMAL(38,6).
func executeEach(ctx context.Context, c *pipeline.Compiled, dataDir string, write func(report.Row) error) error {
	written := false
	t := engine.Target{Model: c.Model, DataDir: dataDir,
		DuckDB: engine.Options{FileDecimals: true, Tables: engine.TablesRead(c.Model, c.Plan)}}
	err := executeOn(ctx, c, t, func(r report.Row) error {
		written = true
		return write(r)
	})
	if engine.Overflowed(err) && !written {
		t.DuckDB.FileDecimals = false
		err = executeOn(ctx, c, t, write)
	}
	return rejected("the engine", err)
}

// executeOn opens the engine t names and runs c there.
func executeOn(ctx context.Context, c *pipeline.Compiled, t engine.Target, write func(report.Row) error) error {
	eng, err := openEngine(ctx, t)
	if err != nil {
		return err
	}
	defer eng.Close()
	return eng.QueryEach(ctx, c.SQL, resultTypes(c), shaper(c, write))
}

// rejected says that the engine rejected the query, unless err is
// already an exit error (from writing the output, or shaping the rows).
func rejected(engineName string, err error) error {
	if _, ok := failure.KindOf(err); err == nil || ok {
		return err
	}
	return failure.Newf(failure.Input, "%s rejected the query: %w", engineName, err)
}

// reportColumns are the result's columns: the group columns, then the
// measures, each with its type.
func reportColumns(c *pipeline.Compiled) []report.Column {
	var cols []report.Column
	for i, g := range c.Query.GroupNames {
		col := c.Query.Groups[i]
		cols = append(cols, report.Column{Name: g, Group: true, Type: col.Type, Period: periodOf(col)})
	}
	for _, o := range c.Plan.Outputs {
		cols = append(cols, report.Column{Name: o.Name, Format: o.Measure.Format, Type: o.Expr.Type()})
	}
	return cols
}

// periodOf is the period whose starts a group column holds, when it is
// derived as date_trunc(month|quarter|year, ...), or "".
func periodOf(c *model.Column) string {
	if f, ok := c.Derived.(*model.Func); ok && f.Name == "date_trunc" {
		switch f.Unit {
		case "month", "quarter", "year":
			return f.Unit
		}
	}
	return ""
}

// shape turns engine rows into report rows: group columns, measures, and
// the rolled-up groups read from the grouping column.
func shape(c *pipeline.Compiled, res *engine.Result) (*report.Table, error) {
	t := &report.Table{Columns: reportColumns(c)}
	each := shaper(c, func(r report.Row) error { t.Rows = append(t.Rows, r); return nil })
	if err := each.Columns(res.Columns); err != nil {
		return nil, err
	}
	for _, row := range res.Rows {
		if err := each.Row(row); err != nil {
			return nil, err
		}
	}
	return t, nil
}

// shaper checks the engine's columns and turns each engine row into a
// report row for write: the values, and the rolled-up groups read from
// the grouping column.
func shaper(c *pipeline.Compiled, write func(report.Row) error) engine.Each {
	want := len(c.Query.GroupNames) + len(c.Plan.Outputs) + 1
	return engine.Each{
		Columns: func(names []string) error {
			if len(names) != want || names[want-1] != dialects.GroupingColumn {
				return failure.Newf(failure.Internal, "internal error: the result has columns %v", names)
			}
			return nil
		},
		Row: func(row []any) error {
			var mask uint64
			switch g := row[want-1].(type) {
			case int64:
				mask = uint64(g)
			case nil:
			default:
				return failure.Newf(failure.Internal, "internal error: grouping column holds %T", g)
			}
			return write(report.Row{Values: row[:want-1], RolledUp: c.Query.RolledUp(mask)})
		},
	}
}
