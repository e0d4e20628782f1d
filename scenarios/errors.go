package scenarios

import (
	"fmt"
	"strings"

	"slipfront/internal/badinput"
)

// FieldError is a problem with one value of a scenario: the file and line
// it came from, its dotted key, the value as written and what is wrong,
// including the allowed range.
type FieldError struct {
	// File is the scenario file, or "--set" for a command-line override.
	File string
	// Line is the 1-based line of the key in File; 0 when unknown.
	Line int
	// Key is the dotted path, e.g. "sets[1].orientation.kappa".
	Key string
	// Value is the value as written; "" when the key is missing.
	Value string
	// Msg says what is wrong and what is allowed.
	Msg string
}

func (e *FieldError) Error() string {
	var b strings.Builder
	switch {
	case e.File == overrideSource:
		fmt.Fprintf(&b, "--set %s=%s", e.Key, e.Value)
	default:
		b.WriteString(e.File)
		if e.Line > 0 {
			fmt.Fprintf(&b, ":%d", e.Line)
		}
		if e.Key != "" {
			b.WriteString(": " + e.Key)
			if e.Value != "" {
				b.WriteString(" = " + e.Value)
			}
		}
	}
	b.WriteString(": " + e.Msg)
	return b.String()
}

// Is reports whether target is badinput.Err: every FieldError is bad
// input.
func (e *FieldError) Is(target error) bool { return target == badinput.Err }

// Errors is every problem found in one scenario, in file order.
type Errors []*FieldError

func (e Errors) Error() string {
	lines := make([]string, len(e))
	for i, fe := range e {
		lines[i] = fe.Error()
	}
	return strings.Join(lines, "\n")
}

// Is reports whether target is badinput.Err.
func (e Errors) Is(target error) bool { return target == badinput.Err }

// overrideSource marks values that came from --set.
const overrideSource = "--set"
