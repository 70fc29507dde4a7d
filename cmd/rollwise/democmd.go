package main

import (
	"context"
	"fmt"
	"os"
	"path/filepath"

	"github.com/shopspring/decimal"
	"github.com/spf13/cobra"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/demo"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/report"
)

type demoOptions struct {
	dir string
}

func newDemoCmd(e *env) *cobra.Command {
	o := &demoOptions{}
	cmd := &cobra.Command{
		Use:   "demo",
		Short: "Show rollwise on a made-up chain of garden centres",
		Long: `demo runs a short showcase on an embedded model of a chain of garden centres,
with generated data (the same every time): a report with subtotals, the SQL
behind it, and why a ratio's total is not the sum of its rows.

With --dir DIR it writes the model and the data out instead, for you to edit
and run.`,
		Example: `  rollwise demo
  rollwise demo --dir garden
  rollwise run garden/garden.roll -m revenue,margin_rate -b plants.family --totals grand`,
		Args: cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error { return runDemo(e, o) },
	}
	cmd.Flags().StringVar(&o.dir, "dir", "", "write the model and data into DIR instead of running the showcase")
	return cmd
}

func runDemo(e *env, o *demoOptions) error {
	if o.dir != "" {
		if err := demo.WriteFiles(o.dir); err != nil {
			return failure.New(failure.Input, err)
		}
		model := filepath.Join(o.dir, demo.ModelFile)
		fmt.Fprintf(e.stdout, "wrote the garden-centre model and data to %s\n\ntry:\n", o.dir)
		fmt.Fprintf(e.stdout, "  rollwise check %s\n", model)
		fmt.Fprintf(e.stdout, "  rollwise run %s -m revenue,margin_rate -b plants.family --totals grand\n", model)
		fmt.Fprintf(e.stdout, "  rollwise sql %s -m revenue,repair_fees -b districts.region\n", model)
		return nil
	}
	dir, err := os.MkdirTemp("", "rollwise-demo-")
	if err != nil {
		return failure.New(failure.Internal, err)
	}
	defer os.RemoveAll(dir)
	model := filepath.Join(dir, demo.ModelFile)
	if err := os.WriteFile(model, []byte(demo.Model()), 0o644); err != nil {
		return failure.New(failure.Internal, err)
	}
	if err := demo.WriteData(dir, demo.DefaultSalesLines); err != nil {
		return failure.New(failure.Internal, err)
	}
	color := isTerminal(e.stdout)
	heading := func(s string) {
		if color {
			s = "\x1b[1m" + s + "\x1b[0m"
		}
		fmt.Fprintf(e.stdout, "\n%s\n\n", s)
	}
	ctx := context.Background()
	q := &queryOptions{models: []string{model}, measures: []string{"revenue", "margin_rate", "receipts", "repair_fees"},
		by: []string{"districts.region", "calendar.season"}, totals: "rollup", dialect: "duckdb"}
	fmt.Fprintf(e.stdout, "A chain of garden centres: %d sales lines and %d repair jobs (generated, the same every run).\n",
		demo.DefaultSalesLines, demo.Repairs)
	heading("$ rollwise run garden.roll -m revenue,margin_rate,receipts,repair_fees -b districts.region,calendar.season --totals rollup")
	c, err := compile(e, q)
	if err != nil {
		return err
	}
	t, err := execute(ctx, c, "")
	if err != nil {
		return err
	}
	if err := report.Write(e.stdout, t, report.Options{Format: "table", Color: color}); err != nil {
		return failure.New(failure.Internal, err)
	}
	heading("$ rollwise sql ... (the statement behind the report: one per query, totals as grouping sets)")
	fmt.Fprintln(e.stdout, c.SQL+";")

	// Why a ratio's total is not the sum of its rows.
	q2 := &queryOptions{models: []string{model}, measures: []string{"margin_rate"},
		by: []string{"plants.family"}, totals: "grand", dialect: "duckdb"}
	c2, err := compile(e, q2)
	if err != nil {
		return err
	}
	t2, err := execute(ctx, c2, "")
	if err != nil {
		return err
	}
	var sum, total decimal.Decimal
	rows := 0
	for _, r := range t2.Rows {
		v, ok := toDecimal(r.Values[1])
		if !ok {
			continue
		}
		if len(r.RolledUp) > 0 {
			total = v
			continue
		}
		if r.Values[0] == nil {
			continue // plants with no family: not a family of their own
		}
		sum = sum.Add(v)
		rows++
	}
	heading("Why totals are re-evaluated")
	avg := sum.Div(decimal.NewFromInt(int64(max(rows, 1))))
	fmt.Fprintf(e.stdout, "margin_rate over all plant families is %s%%: margin / revenue over every sales line.\n",
		total.Mul(decimal.NewFromInt(100)).StringFixed(1))
	fmt.Fprintf(e.stdout, "Adding the %d families' rates would give %s%%, and averaging them %s%%: both wrong.\n",
		rows, sum.Mul(decimal.NewFromInt(100)).StringFixed(1), avg.Mul(decimal.NewFromInt(100)).StringFixed(1))

	// Time: last year, growth, the year to date and a closing balance.
	heading("$ rollwise run garden.roll --view month_report   (last year, growth, year to date, closing stock)")
	c3, err := compile(e, &queryOptions{models: []string{model}, view: "month_report", dialect: "duckdb"})
	if err != nil {
		return err
	}
	t3, err := execute(ctx, c3, "")
	if err != nil {
		return err
	}
	if err := report.Write(e.stdout, t3, report.Options{Format: "table", Color: color}); err != nil {
		return failure.New(failure.Internal, err)
	}
	fmt.Fprintln(e.stdout, "\nrevenue_ly moves each day a year forward into this year's months; revenue_ytd runs from")
	fmt.Fprintln(e.stdout, "January 1st to the month's last sale; closing_stock is the month's last weekly count, summed")
	fmt.Fprintln(e.stdout, "over stores (stock is a balance: it adds up across stores, never across days).")
	fmt.Fprintln(e.stdout, "\nNext: rollwise demo --dir garden writes the model and data out for you to edit.")
	return nil
}

func toDecimal(v any) (decimal.Decimal, bool) {
	switch x := v.(type) {
	case decimal.Decimal:
		return x, true
	case float64:
		return decimal.NewFromFloat(x), true
	case int64:
		return decimal.NewFromInt(x), true
	}
	return decimal.Decimal{}, false
}
