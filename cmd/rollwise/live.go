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
	"github.com/rollwise/rollwise/cmd/rollwise/internal/verify"
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
	l, err := engine.OpenLive(ctx, dsn, lo)
	if err != nil {
		return failure.New(failure.Input, err)
	}
	defer l.Close()
	if err := rejected(l.Server, l.QueryEach(ctx, c.SQL, resultTypes(c), shaper(c, write))); err != nil {
		return err
	}
	addLiveCautions(ctx, l, c)
	return nil
}

// openData opens the data a command reads: the live database at dsn, or
// else the embedded DuckDB over m's files (or dataDir). live is nil on
// the embedded engine; closeData releases what was opened.
func openData(ctx context.Context, m *model.Model, dataDir, dsn string, lo engine.LiveOptions) (run verify.Runner, live *engine.Live, closeData func(), err error) {
	if dsn != "" {
		l, err := engine.OpenLive(ctx, dsn, lo)
		if err != nil {
			return nil, nil, nil, failure.New(failure.Input, err)
		}
		return liveRunner{l: l}, l, func() { l.Close() }, nil
	}
	db, err := engine.OpenDuckDB(ctx, m, dataDir)
	if err != nil {
		return nil, nil, nil, failure.New(failure.Input, err)
	}
	return verify.DB(db), nil, func() { db.Close() }, nil
}

// liveRunner runs queries on a live database; the types of each result
// column come from the server.
type liveRunner struct{ l *engine.Live }

func (r liveRunner) Query(ctx context.Context, q string) (*engine.Result, error) {
	return r.l.Query(ctx, q, nil)
}

// addLiveCautions adds to c's notes what may make the live engine's
// numbers differ from the embedded engine's: SQLite's float decimals, and
// MySQL/MariaDB group columns whose collation merges values that differ
// in case or trailing spaces.
func addLiveCautions(ctx context.Context, l *engine.Live, c *pipeline.Compiled) {
	loose, err := l.LooseGroupCollations(ctx, c.Query.Groups)
	if err != nil {
		loose = append(loose, fmt.Sprintf("%s: could not check that the group columns compare text exactly (%v): groups may merge values that differ in case or trailing spaces", l.Server, err))
	}
	c.Notes = append(c.Notes, loose...)
	if l.Dialect != "sqlite" {
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
