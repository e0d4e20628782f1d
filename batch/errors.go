package batch

import (
	"errors"
	"fmt"

	"slipfront/internal/badinput"
)

// ErrFormat marks a result or probability-grid file that is not in the
// expected format (corrupt, cut, or not such a file).
var ErrFormat = errors.New("malformed batch file")

// inputErrorf returns a bad-input error (matching badinput.Err) with the
// package prefix.
func inputErrorf(format string, args ...any) error {
	return badinput.Errorf("batch: "+format, args...)
}

// inputError returns err, marked as bad input, under what it concerns.
func inputError(what string, err error) error {
	return badinput.Errorf("batch: %s: %w", what, err)
}

// MismatchError is returned when a folder's manifest differs from the batch
// being resumed or the folders being merged. It matches badinput.Err.
type MismatchError struct {
	// Field names the first difference, e.g. "scenario digest" or
	// "cases[1].label".
	Field string
	// Want is the value in the reference (the batch being run, or the
	// first folder of a merge) and Got the value in Dir.
	Want, Got string
	// WantFrom and Dir say where each value came from.
	WantFrom, Dir string
}

func (e *MismatchError) Error() string {
	return fmt.Sprintf("batch: %s does not match %s: %s is %s there but %s in %s",
		e.Dir, e.WantFrom, e.Field, e.Got, e.Want, e.WantFrom)
}

// Is reports whether target is badinput.Err.
func (e *MismatchError) Is(target error) bool { return target == badinput.Err }

// FormatError is a malformed file: what is wrong and at which byte offset
// (or line, for text files) it was found. It matches ErrFormat.
type FormatError struct {
	// What names the file kind, e.g. "result file".
	What string
	// Offset is the byte offset for binary files; -1 when not known.
	Offset int64
	// Line is the 1-based line for text files; 0 when not applicable.
	Line int
	// Msg says what is wrong.
	Msg string
}

func (e *FormatError) Error() string {
	switch {
	case e.Line > 0:
		return fmt.Sprintf("batch: %s line %d: %s", e.What, e.Line, e.Msg)
	case e.Offset >= 0:
		return fmt.Sprintf("batch: %s at byte %d: %s", e.What, e.Offset, e.Msg)
	}
	return fmt.Sprintf("batch: %s: %s", e.What, e.Msg)
}

// Is reports whether target is ErrFormat.
func (e *FormatError) Is(target error) bool { return target == ErrFormat }

// UnsupportedError is a file written by a newer format version than this
// program reads. It matches ErrFormat.
type UnsupportedError struct {
	// What names the file kind; Version is the version found and Max the
	// newest this program reads.
	What         string
	Version, Max int
}

func (e *UnsupportedError) Error() string {
	return fmt.Sprintf("batch: %s format version %d is newer than this program reads (up to %d); update slipfront",
		e.What, e.Version, e.Max)
}

// Is reports whether target is ErrFormat.
func (e *UnsupportedError) Is(target error) bool { return target == ErrFormat }
