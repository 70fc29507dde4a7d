// Package failure classifies what goes wrong in a rollwise command. Every
// error a command returns is an *Error of one Kind; the command line maps
// each kind to its exit status in one place (exitCode in cmd/rollwise).
package failure

import (
	"errors"
	"fmt"

	"github.com/rollwise/rollwise/grammar"
)

// Kind is what went wrong, as the exit status tells it.
type Kind int

const (
	// Internal is a bug, or a failure of the machine rather than of what
	// the command was given (writing the output, a temporary folder).
	Internal Kind = iota + 1
	// Usage is a command line that cannot be carried out as written: an
	// unknown flag value, a missing argument, a path that cannot be read.
	Usage
	// Findings are errors in the model or the query, broken promises of
	// the model, and differences found by a check.
	Findings
	// Input is data or a database the command cannot use: a file a table
	// reads, a connection, a statement the engine rejects.
	Input
)

// Error is an error of a kind. A nil Err means the message was already
// printed (the diagnostics, a report of differences).
type Error struct {
	Kind Kind
	Err  error
}

func (e *Error) Error() string {
	if e.Err == nil {
		return ""
	}
	return e.Err.Error()
}

// Unwrap returns the error of the kind.
func (e *Error) Unwrap() error { return e.Err }

// New is err as an error of kind k (nil when err is nil).
func New(k Kind, err error) error {
	if err == nil {
		return nil
	}
	return &Error{Kind: k, Err: err}
}

// Newf is an error of kind k with a formatted message.
func Newf(k Kind, format string, args ...any) error {
	return &Error{Kind: k, Err: fmt.Errorf(format, args...)}
}

// Usagef is a usage error with a formatted message.
func Usagef(format string, args ...any) error {
	return Newf(Usage, format, args...)
}

// Printed is an error of kind k whose message was already printed.
func Printed(k Kind) error { return &Error{Kind: k} }

// KindOf is the kind of err, and false for an error that has none (one
// from outside rollwise's own code).
func KindOf(err error) (Kind, bool) {
	var e *Error
	if errors.As(err, &e) {
		return e.Kind, true
	}
	return 0, false
}

// Diagnostics is the error of a list of diagnostics: nil without errors;
// else "N errors" (the same message at the same place counted once, as
// Print shows them), of kind Usage when every error is about the command
// line's shape (code "usage"), Internal when one is internal, and Findings
// otherwise.
func Diagnostics(d grammar.Diagnostics) error {
	if !d.HasErrors() {
		return nil
	}
	return &Error{Kind: diagnosticsKind(d), Err: errors.New(CountErrors(d))}
}

func diagnosticsKind(d grammar.Diagnostics) Kind {
	k := Usage
	for _, x := range d.Errors() {
		switch x.Code {
		case "internal":
			return Internal
		case "usage":
		default:
			k = Findings
		}
	}
	return k
}

// CountErrors counts the errors as Print shows them: the same message at
// the same place, found twice, once ("1 error", "3 errors"), and those
// counted and not kept past grammar.MaxKept.
func CountErrors(d grammar.Diagnostics) string {
	seen := map[string]bool{}
	more := 0
	for _, x := range d.Errors() {
		if x.More > 0 {
			more += x.More
			continue
		}
		seen[x.Error()] = true
	}
	if len(seen)+more == 1 {
		return "1 error"
	}
	return fmt.Sprintf("%d errors", len(seen)+more)
}
