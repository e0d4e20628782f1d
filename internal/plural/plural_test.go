package plural

import "testing"

func TestCount(t *testing.T) {
	tests := []struct {
		n    int
		got  string
		want string
	}{
		{0, S(0, "fracture"), "0 fractures"},
		{1, S(1, "fracture"), "1 fracture"},
		{2, S(2, "fracture"), "2 fractures"},
		{-1, S(-1, "step"), "-1 steps"},
		{1, Count(1, "entry", "entries"), "1 entry"},
		{3, Count(3, "entry", "entries"), "3 entries"},
	}
	for _, tc := range tests {
		if tc.got != tc.want {
			t.Errorf("n = %d: got %q, want %q", tc.n, tc.got, tc.want)
		}
	}
}
