package main

import "testing"

func TestParseBytes(t *testing.T) {
	for _, tc := range []struct {
		in   string
		want float64
	}{{"8GB", 8e9}, {"512 MiB", 512 << 20}, {"1.5GiB", 1.5 * (1 << 30)}, {"100B", 100}} {
		got, err := parseBytes(tc.in)
		if err != nil || got != tc.want {
			t.Errorf("parseBytes(%q) = %g, %v; want %g", tc.in, got, err, tc.want)
		}
	}
	for _, bad := range []string{"", "8", "GB", "-1GB", "0GB", "8 gigs", "1e3GB"} {
		if _, err := parseBytes(bad); err == nil {
			t.Errorf("parseBytes(%q) accepted", bad)
		}
	}
}
