// Package crash turns a panic (a programmer's bug) into an error that
// carries the stack, so that a command can report it as an internal error
// with its own exit code instead of dying with a trace that looks like bad
// input, and so that a panic in a worker goroutine reaches the caller.
package crash

import (
	"fmt"
	"runtime/debug"
)

// Error is a recovered panic.
type Error struct {
	// Value is what was passed to panic; Stack the goroutine's stack at
	// the panic.
	Value any
	Stack []byte
}

func (e *Error) Error() string { return fmt.Sprintf("internal error: %v", e.Value) }

// Unwrap returns the panic value when it is an error (a runtime error such
// as an index out of range), so errors.As can reach it.
func (e *Error) Unwrap() error {
	if err, ok := e.Value.(error); ok {
		return err
	}
	return nil
}

// Capture calls fn and returns its error, or an *Error when fn panics.
func Capture(fn func() error) (err error) {
	defer func() {
		if v := recover(); v != nil {
			err = &Error{Value: v, Stack: debug.Stack()}
		}
	}()
	return fn()
}
