package mechanics

import (
	"fmt"
	"math"

	"slipfront/internal/badinput"
)

// InputError reports a parameter outside its allowed range. Name is the
// scenario key of the parameter where there is one (e.g. "friction_static").
type InputError struct {
	Name  string  // parameter name
	Value float64 // offending value, SI units
	Want  string  // the allowed range, e.g. "must be > 0"
}

// Is reports whether target is badinput.Err: a parameter out of range is
// bad input.
func (e *InputError) Is(target error) bool { return target == badinput.Err }

func (e *InputError) Error() string {
	return fmt.Sprintf("mechanics: %s = %g: %s", e.Name, e.Value, e.Want)
}

// positive returns an error unless v is finite and > 0.
func positive(name string, v float64) error {
	if !(v > 0) || math.IsInf(v, 0) {
		return &InputError{Name: name, Value: v, Want: "must be finite and > 0"}
	}
	return nil
}

// nonNegative returns an error unless v is finite and ≥ 0.
func nonNegative(name string, v float64) error {
	if !(v >= 0) || math.IsInf(v, 0) {
		return &InputError{Name: name, Value: v, Want: "must be finite and ≥ 0"}
	}
	return nil
}

// poisson returns an error unless 0 < ν < 0.5.
func poisson(name string, v float64) error {
	if !(v > 0 && v < 0.5) {
		return &InputError{Name: name, Value: v, Want: "must be in (0, 0.5)"}
	}
	return nil
}

// finite returns an error unless v is a finite number.
func finite(name string, v float64) error {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return &InputError{Name: name, Value: v, Want: "must be a finite number"}
	}
	return nil
}

// firstError returns the first non-nil error.
func firstError(errs ...error) error {
	for _, err := range errs {
		if err != nil {
			return err
		}
	}
	return nil
}
