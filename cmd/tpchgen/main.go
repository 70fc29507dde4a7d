// Command tpchgen writes TPC-H data as Parquet files for rollwise's TPC-H
// checks:
//
//	go run ./cmd/tpchgen -sf 0.01 -out .cache/tpch/sf0.01
//
// It writes OUT/<table>.parquet for the eight TPC-H tables and a manifest,
// OUT/tpchgen.json, last. When OUT already holds a complete set for the
// same scale factor it does nothing. Exit codes: 0 done, 1 generation
// failed, 2 usage error.
package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/signal"
	"time"

	"github.com/rollwise/rollwise/cmd/internal/tpch"
)

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	code := run(ctx, os.Args[1:], os.Stderr)
	stop()
	os.Exit(code)
}

// run parses args, generates, and reports on stderr; it returns the exit code.
func run(ctx context.Context, args []string, stderr io.Writer) int {
	fs := flag.NewFlagSet("tpchgen", flag.ContinueOnError)
	fs.SetOutput(stderr)
	sf := fs.Float64("sf", 0.01, "TPC-H scale factor: a whole number, or a multiple of 0.001 below 1")
	out := fs.String("out", "", "output folder (required)")
	fs.Usage = func() {
		fmt.Fprintf(stderr, "usage: tpchgen -sf SF -out DIR\n\nWrites DIR/<table>.parquet for the eight TPC-H tables.\n\n")
		fs.PrintDefaults()
	}
	if err := fs.Parse(args); err != nil {
		if errors.Is(err, flag.ErrHelp) {
			return 0
		}
		return 2
	}
	if *out == "" || fs.NArg() > 0 {
		fs.Usage()
		return 2
	}
	if tpch.Complete(*out, *sf) {
		fmt.Fprintf(stderr, "tpchgen: %s already holds scale factor %v\n", *out, *sf)
		return 0
	}
	start := time.Now()
	if err := tpch.Generate(ctx, *out, *sf); err != nil {
		fmt.Fprintf(stderr, "tpchgen: %v\n", err)
		return 1
	}
	m, err := tpch.ReadManifest(*out)
	if err != nil {
		fmt.Fprintf(stderr, "tpchgen: %v\n", err)
		return 1
	}
	for _, t := range m.Tables {
		fmt.Fprintf(stderr, "%-9s %10d rows %12d bytes\n", t.Name, t.Rows, t.Bytes)
	}
	fmt.Fprintf(stderr, "tpchgen: scale factor %v written to %s in %.1fs\n", *sf, *out, time.Since(start).Seconds())
	return 0
}
