package main

import (
	"fmt"
	"strconv"
	"strings"

	"github.com/spf13/pflag"
)

// whereValue is the -w flag: each repetition adds a filter, and the
// filters combine with and (each in parentheses, so that an or inside one
// stays inside it).
type whereValue struct {
	p     *string
	parts []string
}

func (w *whereValue) Set(s string) error {
	w.parts = append(w.parts, s)
	if len(w.parts) == 1 {
		*w.p = s
		return nil
	}
	*w.p = "(" + strings.Join(w.parts, ") and (") + ")"
	return nil
}

func (w *whereValue) String() string { return *w.p }

func (w *whereValue) Type() string { return "string" }

// whereVar registers -w/--where on f, writing the combined filter to p.
func whereVar(f *pflag.FlagSet, p *string) {
	f.VarP(&whereValue{p: p}, "where", "w", "filter, a row predicate such as \"stores.region = 'North'\"; repeated -w combine with and")
}

// onceValue is a single-valued flag that refuses to be given twice: a
// second value would otherwise silently replace the first.
type onceValue struct {
	name, kind string
	set        bool
	// assign parses and stores the value; show prints it.
	assign func(string) error
	show   func() string
}

func (o *onceValue) Set(s string) error {
	if o.set {
		return fmt.Errorf("--%s is given more than once; give it once", o.name)
	}
	o.set = true
	return o.assign(s)
}

func (o *onceValue) String() string { return o.show() }

func (o *onceValue) Type() string { return o.kind }

// onceStringVarP registers a string flag that may be given at most once.
func onceStringVarP(f *pflag.FlagSet, p *string, name, short, value, usage string) {
	*p = value
	v := &onceValue{name: name, kind: "string",
		assign: func(s string) error { *p = s; return nil },
		show:   func() string { return *p }}
	f.VarP(v, name, short, usage)
}

// onceIntVar registers an integer flag that may be given at most once.
func onceIntVar(f *pflag.FlagSet, p *int, name string, value int, usage string) {
	*p = value
	v := &onceValue{name: name, kind: "int",
		assign: func(s string) error {
			n, err := strconv.Atoi(s)
			if err != nil {
				return fmt.Errorf("--%s takes a whole number, not %q", name, s)
			}
			*p = n
			return nil
		},
		show: func() string { return strconv.Itoa(*p) }}
	f.VarP(v, name, "", usage)
}
