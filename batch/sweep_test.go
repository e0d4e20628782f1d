package batch

import (
	"errors"
	"strings"
	"testing"

	"slipfront/internal/badinput"
)

func TestParseSweep(t *testing.T) {
	s, err := ParseSweep(" fluids.slickwater.viscosity = 1 cP, 5cP ,20 cP")
	if err != nil {
		t.Fatal(err)
	}
	if s.Key != "fluids.slickwater.viscosity" || strings.Join(s.Values, "|") != "1 cP|5cP|20 cP" {
		t.Errorf("got %+v", s)
	}
	if s.String() != "fluids.slickwater.viscosity=1 cP,5cP,20 cP" {
		t.Errorf("String() = %q", s.String())
	}
	for _, tc := range []struct{ in, want string }{
		{"fluids.slickwater.viscosity", "want key=v1,v2"},
		{"=1,2", "want key=v1,v2"},
		{"seed=", "want key=v1,v2"},
		{"seed=1,,2", "value 2 is empty"},
		{"seed=1,2,1", `"1" is listed twice`},
		{"se ed..x=1", "bad key"},
		{"seed=1\t2", "control character"},
	} {
		_, err := ParseSweep(tc.in)
		if !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("ParseSweep(%q): err = %v, want bad input mentioning %q", tc.in, err, tc.want)
		}
	}
}

func TestParseShard(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want Shard
	}{{"0/1", Shard{0, 1}}, {"3/4", Shard{3, 4}}, {" 2 / 5 ", Shard{2, 5}}} {
		got, err := ParseShard(tc.in)
		if err != nil || got != tc.want {
			t.Errorf("ParseShard(%q) = %v, %v; want %v", tc.in, got, err, tc.want)
		}
	}
	for _, tc := range []struct{ in, want string }{
		{"1", "want i/n"},
		{"a/b", "want i/n"},
		{"1/2/3", "want i/n"},
		{"4/4", "index must be 0 to 3"},
		{"-1/3", "index must be 0 to 2"},
		{"0/0", "count must be ≥ 1"},
		{"", "want i/n"},
	} {
		_, err := ParseShard(tc.in)
		if !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("ParseShard(%q): err = %v, want bad input mentioning %q", tc.in, err, tc.want)
		}
	}
	// Round robin: shard 1/3 owns 1, 4, 7; the zero Shard owns all.
	var owned []int
	for r := range 9 {
		if (Shard{1, 3}).Owns(r) {
			owned = append(owned, r)
		}
		if !(Shard{}).Owns(r) {
			t.Errorf("the zero Shard does not own %d", r)
		}
	}
	if len(owned) != 3 || owned[0] != 1 || owned[1] != 4 || owned[2] != 7 {
		t.Errorf("shard 1/3 owns %v, want [1 4 7]", owned)
	}
}

func TestCasesOrder(t *testing.T) {
	cs := Cases([]Sweep{{Key: "a", Values: []string{"a0", "a1"}}, {Key: "b", Values: []string{"b0", "b1", "b2"}}})
	want := []string{
		"a=a0, b=b0", "a=a0, b=b1", "a=a0, b=b2",
		"a=a1, b=b0", "a=a1, b=b1", "a=a1, b=b2",
	}
	if len(cs) != len(want) {
		t.Fatalf("%d cases, want %d", len(cs), len(want))
	}
	for i, c := range cs {
		if c.Index != i || c.Label() != want[i] {
			t.Errorf("case %d: %d %q, want %q", i, c.Index, c.Label(), want[i])
		}
	}
	if base := Cases(nil); len(base) != 1 || base[0].Label() != "base" {
		t.Errorf("no sweeps: %+v", base)
	}
}
