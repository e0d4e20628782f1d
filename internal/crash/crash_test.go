package crash

import (
	"errors"
	"runtime"
	"strings"
	"testing"
)

func TestCapture(t *testing.T) {
	boom := errors.New("boom")
	if err := Capture(func() error { return boom }); err != boom {
		t.Errorf("an ordinary error came back as %v", err)
	}
	err := Capture(func() error {
		var s []int
		_ = s[3] // index out of range
		return nil
	})
	var ce *Error
	if !errors.As(err, &ce) {
		t.Fatalf("panic gave %v, want *Error", err)
	}
	var re runtime.Error
	if !errors.As(err, &re) {
		t.Errorf("the runtime error is not reachable through Unwrap")
	}
	if !strings.Contains(string(ce.Stack), "TestCapture") || !strings.HasPrefix(err.Error(), "internal error: ") {
		t.Errorf("message %q or stack lack the panic's origin", err)
	}
}
