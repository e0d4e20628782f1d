package report

import (
	"bufio"
	"errors"
	"fmt"
	"math"
	"os"
	"strings"
	"testing"

	"gonum.org/v1/plot/palette"

	"slipfront/internal/numtest"
)

// readViridis256 reads testdata/viridis256.txt: matplotlib's full viridis
// table (mpl-colormaps, CC0; van der Walt & Smith 2015).
func readViridis256(t *testing.T) [][3]float64 {
	t.Helper()
	f, err := os.Open("testdata/viridis256.txt")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var rows [][3]float64
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := sc.Text()
		if strings.HasPrefix(line, "#") || strings.TrimSpace(line) == "" {
			continue
		}
		var c [3]float64
		if _, err := fmt.Sscan(line, &c[0], &c[1], &c[2]); err != nil {
			t.Fatalf("viridis256.txt: %q: %v", line, err)
		}
		rows = append(rows, c)
	}
	if len(rows) != 256 {
		t.Fatalf("viridis256.txt has %d rows, want 256", len(rows))
	}
	return rows
}

// TestViridisTable checks the interpolated subset against every entry of
// matplotlib's full 256-entry table.
func TestViridisTable(t *testing.T) {
	full := readViridis256(t)
	// interpTol: linear interpolation between every 5th entry stays within
	// one 8-bit level (1/255 ≈ 0.0039); measured worst case 0.0024.
	const interpTol = 0.003
	// knotTol: at the knots the subset is the table itself (6 decimals).
	const knotTol = 1e-12
	for i, want := range full {
		got := viridisRGB(float64(i) / 255)
		tol := interpTol
		if i%5 == 0 {
			tol = knotTol
		}
		for k := range 3 {
			numtest.Abs(t, fmt.Sprintf("viridis[%d][%d]", i, k), got[k], want[k], tol)
		}
	}
}

// lightness returns CIE 1976 L* of an sRGB colour with components in
// [0, 1]: the sRGB transfer function of IEC 61966-2-1:1999, relative
// luminance Y = 0.2126 R + 0.7152 G + 0.0722 B (ITU-R BT.709 primaries, D65),
// and L* = 116 f(Y) − 16 with f(t) = t^(1/3) above (6/29)³ and
// t/(3 (6/29)²) + 4/29 below (CIE 15:2004).
func lightness(c [3]float64) float64 {
	lin := func(v float64) float64 {
		if v <= 0.04045 {
			return v / 12.92
		}
		return math.Pow((v+0.055)/1.055, 2.4)
	}
	y := 0.2126*lin(c[0]) + 0.7152*lin(c[1]) + 0.0722*lin(c[2])
	const d = 6.0 / 29
	f := y/(3*d*d) + 4.0/29
	if y > d*d*d {
		f = math.Cbrt(y)
	}
	return 116*f - 16
}

// TestViridisLightness checks the property that makes the colour map
// readable in greyscale: lightness rises strictly from start to end, over a
// wide range (van der Walt & Smith 2015 designed viridis for this).
func TestViridisLightness(t *testing.T) {
	const samples = 1001
	prev := math.Inf(-1)
	first := lightness(viridisRGB(0))
	for i := range samples {
		l := lightness(viridisRGB(float64(i) / (samples - 1)))
		if !(l > prev) {
			t.Fatalf("L* at t = %g is %.4f, not above %.4f at the previous sample", float64(i)/(samples-1), l, prev)
		}
		prev = l
	}
	// minSpan: black-to-white is 100 units of L*; a sequential map that
	// reads in greyscale should span at least half of it (common practice,
	// no source).
	const minSpan = 50
	if span := prev - first; span < minSpan {
		t.Errorf("L* span = %.1f, want ≥ %d", span, minSpan)
	}
}

func TestViridisMap(t *testing.T) {
	m := NewViridisMap(2, 6)
	for _, tc := range []struct {
		name string
		v    float64
		want error
	}{
		{"below", 1.9, palette.ErrUnderflow},
		{"above", 6.1, palette.ErrOverflow},
		{"NaN", math.NaN(), palette.ErrNaN},
		{"min", 2, nil},
		{"max", 6, nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			_, err := m.At(tc.v)
			if !errors.Is(err, tc.want) {
				t.Errorf("At(%g) error = %v, want %v", tc.v, err, tc.want)
			}
		})
	}
	// The mid value maps to t = 0.5, table entry 127.5: between the
	// entries 127 and 128 of the full table.
	got, _ := m.At(4)
	want := Viridis(0.5)
	if got != want {
		t.Errorf("At(4) = %v, want Viridis(0.5) = %v", got, want)
	}
	if p := m.Palette(5).Colors(); len(p) != 5 || p[0] != Viridis(0) || p[4] != Viridis(1) {
		t.Errorf("Palette(5) = %v: want 5 colours from Viridis(0) to Viridis(1)", p)
	}
	m.SetAlpha(0.5)
	if c := m.clamped(100); c.A != 128 || c.R != Viridis(1).R {
		t.Errorf("clamped(100) with alpha 0.5 = %v, want the last colour with A = 128", c)
	}
	defer func() {
		if recover() == nil {
			t.Error("SetAlpha(2) did not panic")
		}
	}()
	m.SetAlpha(2)
}
