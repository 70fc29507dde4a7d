package main

import (
	"strings"

	"github.com/spf13/pflag"

	"github.com/rollwise/rollwise/planner/model"
)

// listValue is a comma-separated list flag (-m, -b) that understands
// backquoted names: -m '`net, after tax`' is one measure, and a double
// quote is an ordinary character (pflag's string slices read the value as
// CSV, splitting inside backquotes and refusing a bare "). Repeating the
// flag adds to the list.
type listValue struct{ p *[]string }

func (l *listValue) Set(s string) error {
	*l.p = append(*l.p, model.SplitList(s)...)
	return nil
}

func (l *listValue) String() string { return strings.Join(*l.p, ",") }

func (l *listValue) Type() string { return "strings" }

// listVarP registers a list flag; see listValue.
func listVarP(f *pflag.FlagSet, p *[]string, name, short, usage string) {
	f.VarP(&listValue{p: p}, name, short, usage)
}
