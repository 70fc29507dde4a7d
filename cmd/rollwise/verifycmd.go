package main

import (
	"os"
	"strings"

	"github.com/spf13/cobra"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/engine"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/verify"
	"github.com/rollwise/rollwise/dialects"
)

// verifyOptions are the flags of verify.
type verifyOptions struct {
	models    []string
	sqlFile   string
	measures  []string
	by        []string
	where     string
	totals    string
	dialect   string
	data      string
	format    string
	maps      []string
	tolerance float64
	grouping  string
	// dsn names a live database to verify on; dialectSet says -d was given.
	dsn        string
	dialectSet bool
	live       liveFlags
}

func newVerifyCmd(e *env) *cobra.Command {
	o := &verifyOptions{}
	cmd := &cobra.Command{
		Use:   "verify MODEL... --sql FILE.sql -m M1,M2 [-b T.C,...] [flags]",
		Short: "Check a handwritten SQL rollup against the measure definitions",
		Long: `verify runs a handwritten SQL query and rollwise's own query for the same
measures on the embedded DuckDB (every table exposed under its 'at'
relation), aligns their rows by the group values, and compares every value.

A handwritten column matches a --by reference by its column name (region) or
its full reference ("stores.region"); a measure matches the column of its
own name, or the one --map gives. With --totals, rows whose group values are
NULL are matched with total rows; where a genuine NULL group and a total row
could be confused, verify says so, and --grouping-column NAME names a column
the SQL computes as GROUPING(g1, ..., gn) over the --by columns in order.

Each value that differs is diagnosed: verify computes the usual wrong
formulas for the measure on the same data (sum-of-ratios, average-of-ratios,
product-of-sums, fan-out, dropped-unmatched, sum-of-distinct-counts,
filter-ignored, filter-leaked, null-as-zero) and names the one that gives
the handwritten value.

Integers and decimals are compared exactly when both sides have them;
otherwise two values agree when |a - b| <= REL * max(1, |a|, |b|), with REL
from --tolerance (default 1e-9).

Exit status: 0 when everything agrees, 1 when anything differs (or the SQL
fails), 2 for usage errors.`,
		Example: `  rollwise verify garden.roll --sql family_margin.sql -m revenue,margin_rate -b plants.family --totals grand
  rollwise verify shop.roll --sql rollup.sql -m revenue -b stores.region --totals rollup --grouping-column g
  rollwise verify shop.roll --sql report.sql -m revenue --map revenue=total_sales -b stores.region --format json`,
		RunE: func(cmd *cobra.Command, args []string) error {
			if err := modelArgs(args); err != nil {
				return err
			}
			o.models = args
			o.dialectSet = cmd.Flags().Changed("dialect")
			return scrubDSN(o.dsn, runVerify(e, o))
		},
	}
	f := cmd.Flags()
	f.StringVar(&o.sqlFile, "sql", "", "the handwritten SQL file to check")
	listVarP(f, &o.measures, "measures", "m", "measures to compare, comma-separated")
	listVarP(f, &o.by, "by", "b", "group columns, written table.column, comma-separated")
	whereVar(f, &o.where)
	onceStringVarP(f, &o.totals, "totals", "", "none", "total rows: none, grand, rollup or all")
	f.StringSliceVar(&o.maps, "map", nil, "MEASURE=COLUMN or TABLE.COLUMN=COLUMN: the SQL's column that holds a measure or a --by column (repeatable)")
	f.Float64Var(&o.tolerance, "tolerance", verify.DefaultTolerance, "relative tolerance for values that are not both exact")
	f.StringVar(&o.grouping, "grouping-column", "", "the SQL's GROUPING(...) column, which tells total rows from NULL groups")
	f.StringVar(&o.data, "data", "", "read each table from DIR/NAME.csv or DIR/NAME.parquet")
	o.live.add(f)
	f.StringVar(&o.dsn, "dsn", "", "verify on a live database instead: postgres://..., mysql://... or sqlite:PATH (the dialect follows unless -d says otherwise)")
	onceStringVarP(f, &o.dialect, "dialect", "d", "duckdb", "SQL dialect")
	onceStringVarP(f, &o.format, "format", "", "table", "output: table or json")
	return cmd
}

// runVerify compiles the query, runs both sides on the embedded DuckDB
// and writes the report. It is the whole command, without cobra.
func runVerify(e *env, o *verifyOptions) error {
	if o.format != "table" && o.format != "json" {
		return failure.Usagef("unknown format %q: verify writes table or json", o.format)
	}
	if o.dsn != "" {
		name, err := liveDialect(o.dsn, o.dialect, o.dialectSet, o.data)
		if err != nil {
			return err
		}
		o.dialect = name
	}
	d, err := dialects.Get(o.dialect)
	if err != nil {
		return failure.New(failure.Usage, err)
	}
	if d.Name() != "duckdb" && o.dsn == "" {
		return failure.Usagef("verify runs on the embedded DuckDB unless --dsn names a live database; -d %s needs --dsn", o.dialect)
	}
	if o.sqlFile == "" {
		return failure.Usagef("name the handwritten SQL with --sql FILE.sql")
	}
	text, err := os.ReadFile(o.sqlFile)
	if err != nil {
		return failure.Usagef("cannot read the handwritten SQL: %v", err)
	}
	maps := map[string]string{}
	for _, m := range o.maps {
		name, col, ok := strings.Cut(m, "=")
		name, col = strings.TrimSpace(name), strings.TrimSpace(col)
		if !ok || name == "" || col == "" {
			return failure.Usagef("--map takes MEASURE=COLUMN or TABLE.COLUMN=COLUMN, not %q", m)
		}
		if prev, dup := maps[name]; dup && prev != col {
			return failure.Usagef("--map gives %s two columns, %s and %s", name, prev, col)
		}
		maps[name] = col
	}
	c, err := compile(e, &queryOptions{models: o.models, measures: o.measures, by: o.by, where: o.where,
		totals: o.totals, dialect: o.dialect})
	if err != nil {
		return err
	}
	ctx := e.context()
	eng, err := openEngine(ctx, engine.Target{DSN: o.dsn, Live: o.live.options(), Model: c.Model, DataDir: o.data})
	if err != nil {
		return err
	}
	defer eng.Close()
	addLiveCautions(ctx, eng, c)
	in := &verify.Input{
		Spec: verify.Spec{Measures: o.measures, By: o.by, Where: o.where, Totals: o.totals, Map: maps,
			GroupingColumn: o.grouping, Tolerance: o.tolerance},
		Model: c.Model, Query: c.Query, Plan: c.Plan, Compiled: c.SQL,
		Handwritten: string(text), SQLName: o.sqlFile, Dialect: d,
	}
	rep, err := verify.Run(ctx, in, eng)
	if err != nil {
		if _, ok := failure.KindOf(err); ok {
			return err
		}
		return failure.New(failure.Input, err)
	}
	if o.format == "json" {
		err = verify.WriteJSON(e.stdout, rep)
	} else {
		err = verify.WriteText(e.stdout, rep)
	}
	if err != nil {
		return failure.New(failure.Internal, err)
	}
	printCautions(e, c.Notes)
	if !rep.OK() {
		return failure.Printed(failure.Findings)
	}
	return nil
}
