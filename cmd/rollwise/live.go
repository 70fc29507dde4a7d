package main

import (
	"context"
	"errors"
	"fmt"
	"time"

	"github.com/spf13/pflag"

	"github.com/rollwise/rollwise/cmd/rollwise/internal/engine"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/failure"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/pipeline"
	"github.com/rollwise/rollwise/cmd/rollwise/internal/report"
	"github.com/rollwise/rollwise/planner/model"
)

// liveDialect settles the dialect of run --dsn: the one the URL implies,
// unless -d named one.
func liveDialect(dsn, dialect string, dialectSet bool, dataDir string) (string, error) {
	if dataDir != "" {
		return "", failure.Usagef("--data is for the embedded DuckDB; with --dsn the tables are read from the database")
	}
	d, err := engine.DialectOfDSN(dsn)
	if err != nil {
		return "", failure.New(failure.Usage, err)
	}
	if dialectSet {
		return dialect, nil
	}
	return d, nil
}

// scrubDSN removes from err's message every password dsn may hold, in
// whatever form the driver shows it (see engine.ScrubError), keeping the
// exit code.
func scrubDSN(dsn string, err error) error {
	if err == nil || dsn == "" {
		return err
	}
	var fe *failure.Error
	if errors.As(err, &fe) {
		if fe.Err == nil {
			return fe
		}
		return &failure.Error{Kind: fe.Kind, Err: engine.ScrubError(dsn, fe.Err)}
	}
	return engine.ScrubError(dsn, err)
}

// liveFlags bound a live session (--dsn): each statement, and connecting.
type liveFlags struct{ timeout, connectTimeout time.Duration }

// add declares --timeout and --connect-timeout.
func (f *liveFlags) add(fs *pflag.FlagSet) {
	fs.DurationVar(&f.timeout, "timeout", engine.DefaultStatementTimeout, "with --dsn: stop (on the server too) a statement that runs longer; 0 for no limit")
	fs.DurationVar(&f.connectTimeout, "connect-timeout", engine.DefaultConnectTimeout, "with --dsn: give up connecting after this long")
}

// options are the session's engine.LiveOptions.
func (f liveFlags) options() engine.LiveOptions {
	st := f.timeout
	if st <= 0 {
		st = -1 // no bound
	}
	return engine.LiveOptions{StatementTimeout: st, ConnectTimeout: f.connectTimeout}
}

// executeLive runs a compiled query on the database at dsn and hands
// each row, shaped for the report exactly as for the embedded engine, to
// write as the server sends it.
func executeLive(ctx context.Context, c *pipeline.Compiled, dsn string, lo engine.LiveOptions, write func(report.Row) error) error {
	eng, err := openEngine(ctx, engine.Target{DSN: dsn, Live: lo})
	if err != nil {
		return err
	}
	defer eng.Close()
	if err := rejected(engineName(eng), eng.QueryEach(ctx, c.SQL, resultTypes(c), shaper(c, write))); err != nil {
		return err
	}
	addLiveCautions(ctx, eng, c)
	return nil
}

// openEngine opens the engine t names (engine.Open); data it cannot use
// is an input error.
func openEngine(ctx context.Context, t engine.Target) (engine.Engine, error) {
	eng, err := engine.Open(ctx, t)
	if err != nil {
		return nil, failure.New(failure.Input, err)
	}
	return eng, nil
}

// engineName names an engine in messages: the server as it reports
// itself, or "the engine" for the embedded DuckDB.
func engineName(eng engine.Engine) string {
	if l, ok := eng.(*engine.Live); ok {
		return l.Server
	}
	return "the engine"
}

// addLiveCautions adds to c's notes what may make a live engine's
// numbers differ from the embedded engine's: SQLite's float decimals, and
// MySQL/MariaDB group columns whose collation merges values that differ
// in case or trailing spaces. The embedded engine adds none.
func addLiveCautions(ctx context.Context, eng engine.Engine, c *pipeline.Compiled) {
	l, ok := eng.(*engine.Live)
	if !ok {
		return
	}
	loose, err := l.LooseGroupCollations(ctx, c.Query.Groups)
	if err != nil {
		loose = append(loose, fmt.Sprintf("%s: could not check that the group columns compare text exactly (%v): groups may merge values that differ in case or trailing spaces", l.Server, err))
	}
	c.Notes = append(c.Notes, loose...)
	if l.Dialect() != "sqlite" {
		return
	}
	for _, o := range c.Plan.Outputs {
		if o.Expr.Type() == model.TypeDecimal {
			c.Notes = append(c.Notes,
				"SQLite has no exact decimal type: decimal values were computed as 64-bit floats")
			return
		}
	}
}

// resultTypes are the logical types of the statement's columns: the
// groups, the measures, then the grouping id.
func resultTypes(c *pipeline.Compiled) []model.Type {
	var out []model.Type
	for _, g := range c.Query.Groups {
		out = append(out, g.Type)
	}
	for _, o := range c.Plan.Outputs {
		out = append(out, o.Expr.Type())
	}
	return append(out, model.TypeInteger)
}
