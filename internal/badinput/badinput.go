// Package badinput is the one vocabulary for errors caused by the user's
// input: a scenario value out of range, a flag that does not parse, an
// output that exists without --force, a folder that is not what a command
// needs. Every such error matches [Err] under errors.Is, whatever package
// made it, so that the command line maps it to exit code 2 with a single
// test; the error's own chain is kept, so callers can still match the
// specific cause (errors.Is(err, gis.ErrNoGeographic)).
package badinput

import (
	"errors"
	"fmt"
)

// Err is matched (errors.Is) by every error caused by bad input.
var Err = errors.New("bad input")

// markedError is an error that also matches Err.
type markedError struct{ err error }

func (e *markedError) Error() string { return e.err.Error() }

// Unwrap returns the cause and Err, so that errors.Is and errors.As see
// both.
func (e *markedError) Unwrap() []error { return []error{e.err, Err} }

// Mark returns err marked as bad input; nil stays nil, and an error that
// already matches Err is returned as it is.
func Mark(err error) error {
	if err == nil || errors.Is(err, Err) {
		return err
	}
	return &markedError{err}
}

// Errorf formats an error (with fmt.Errorf, so %w wraps) and marks it as
// bad input.
func Errorf(format string, args ...any) error {
	return Mark(fmt.Errorf(format, args...))
}
