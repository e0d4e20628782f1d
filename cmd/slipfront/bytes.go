package main

import (
	"fmt"
	"strconv"
	"strings"
)

// byteUnits are the units of --memory-limit: SI (kB = 1000 B) and binary
// (KiB = 1024 B) prefixes, as IEC 80000-13 defines them.
var byteUnits = map[string]float64{
	"B": 1, "kB": 1e3, "MB": 1e6, "GB": 1e9, "TB": 1e12,
	"KiB": 1 << 10, "MiB": 1 << 20, "GiB": 1 << 30, "TiB": 1 << 40,
}

// parseBytes reads a size such as "8GB" or "512 MiB".
func parseBytes(s string) (float64, error) {
	t := strings.TrimSpace(s)
	i := strings.IndexFunc(t, func(r rune) bool { return (r < '0' || r > '9') && r != '.' })
	if i <= 0 {
		return 0, fmt.Errorf("want a size with a unit, e.g. 8GB or 512MiB")
	}
	v, err := strconv.ParseFloat(t[:i], 64)
	unit, ok := byteUnits[strings.TrimSpace(t[i:])]
	if err != nil || !ok || !(v > 0) {
		return 0, fmt.Errorf("want a positive size with a unit (B, kB, MB, GB, TB, KiB, MiB, GiB, TiB), e.g. 8GB")
	}
	return v * unit, nil
}
