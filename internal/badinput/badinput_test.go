package badinput

import (
	"errors"
	"io/fs"
	"testing"
)

func TestMark(t *testing.T) {
	cause := fs.ErrNotExist
	err := Errorf("scenario %s: %w", "x.toml", cause)
	if !errors.Is(err, Err) {
		t.Errorf("Errorf result does not match Err")
	}
	if !errors.Is(err, cause) {
		t.Errorf("Errorf result lost its cause")
	}
	if got, want := err.Error(), "scenario x.toml: file does not exist"; got != want {
		t.Errorf("message %q, want %q", got, want)
	}
	if Mark(nil) != nil {
		t.Errorf("Mark(nil) is not nil")
	}
	if again := Mark(err); again != err {
		t.Errorf("Mark of a marked error wrapped it again")
	}
	var pe *fs.PathError
	wrapped := Mark(&fs.PathError{Op: "open", Path: "a", Err: fs.ErrPermission})
	if !errors.As(wrapped, &pe) || pe.Path != "a" {
		t.Errorf("errors.As does not reach the marked error's cause")
	}
	if errors.Is(errors.New("run failed"), Err) {
		t.Errorf("an unmarked error matches Err")
	}
}
