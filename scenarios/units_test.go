package scenarios

import (
	"math"
	"strings"
	"testing"

	"slipfront/internal/numtest"
)

// unitTol: the factors are exact or given to 10+ digits; round-off only.
const unitTol = 1e-12

func TestParseQuantity(t *testing.T) {
	tests := []struct {
		in   string
		kind unitKind
		want float64
		src  string
	}{
		{"2600 m", kindLength, 2600, "SI"},
		{"8500 ft", kindLength, 2590.8, "NIST SP 811 B.8: ft = 0.3048 m exactly"},
		{"3937 ftUS", kindLength, 1200, "NIST SP 811 B.8: ftUS = 1200/3937 m exactly (ratio from memory)"},
		{"3937 us-ft", kindLength, 1200, "PROJ's spelling of ftUS"},
		{"0.05 mm", kindLength, 5e-5, "SI prefix"},
		{"65 MPa", kindPressure, 65e6, "SI prefix"},
		{"9400 psi", kindPressure, 64810718.555782594, "NIST SP 811 B.8: lbf = 4.4482216152605 N, in = 0.0254 m"},
		{"0.7 psi/ft", kindGradient, 15834.416355701615, "NIST SP 811 B.8 psi and ft"},
		{"22 kPa/m", kindGradient, 22000, "SI prefix"},
		{"1 cP", kindViscosity, 1e-3, "NIST SP 811 B.8: centipoise = 1.0e-3 Pa·s"},
		{"1 mPa·s", kindViscosity, 1e-3, "SI prefix"},
		{"80 bbl/min", kindRate, 0.21198305990400002, "NIST SP 811 B.8: barrel (42 US gal) = 0.158987294928 m³"},
		{"4.5e-10 1/Pa", kindCompressibility, 4.5e-10, "SI"},
		{"4.5e-4 1/MPa", kindCompressibility, 4.5e-10, "SI prefix"},
		{"30 min", kindTime, 1800, "common practice, no source"},
		{"75 deg", kindAzimuth, 75 * math.Pi / 180, "definition of the degree"},
		{"N75E", kindAzimuth, 75 * math.Pi / 180, "quadrant bearing, common practice"},
		{"S20W", kindAzimuth, 200 * math.Pi / 180, "quadrant bearing, common practice"},
		{"N10W", kindAzimuth, 350 * math.Pi / 180, "quadrant bearing, common practice"},
		{"S30E", kindAzimuth, 150 * math.Pi / 180, "quadrant bearing, common practice"},
		{"0.02 1/m", kindIntensity, 0.02, "SI"},
		{"0.03/m", kindIntensity, 0.03, "SI, written as a rate"},
		{"2 m³", kindVolume, 2, "typographic variant of m3"},
		{"1e-5 m/sqrt(s)", kindLeakoff, 1e-5, "SI"},
		{"2600m", kindLength, 2600, "no space between number and unit"},
		{"100 nD", kindPermeability, 9.869233e-20, "NIST SP 811 B.8: darcy = 9.869233e-13 m² (from memory)"},
		{"0.5 mD", kindPermeability, 4.9346165e-16, "NIST SP 811 B.8 darcy (from memory)"},
		{"2 yr", kindTime, 63115200, "NIST SP 811 B.8: year (365.25 d) = 3.15576e7 s (from memory)"},
		{"8.34 lb/gal", kindDensity, 8.34 * 0.45359237 / 3.785411784e-3, "NIST SP 811 B.8: lb = 0.45359237 kg, gal = 3.785411784e-3 m³, both exact"},
		{"1.2 g/cm3", kindDensity, 1200, "SI prefix"},
		{"1.5 MPa.m^0.5", kindToughness, 1.5e6, "SI prefix"},
		{"1000 psi.in^0.5", kindToughness, 1000 * 6894.757293168361 * math.Sqrt(0.0254), "NIST SP 811 B.8: psi and in"},
		{"2 MPa√m", kindToughness, 2e6, "typographic variant"},
		{"1 kPa/yr", kindStressingRate, 1e3 / (365.25 * 86400), "SI prefix and the Julian year"},
	}
	for _, tc := range tests {
		got, err := parseQuantity(tc.in, tc.kind)
		if err != nil {
			t.Errorf("%q: %v", tc.in, err)
			continue
		}
		numtest.Rel(t, tc.in+" ("+tc.src+")", got, tc.want, unitTol)
	}
}

func TestParseQuantityErrors(t *testing.T) {
	tests := []struct {
		in   string
		kind unitKind
		want string
	}{
		{"2600", kindLength, "needs a unit"},
		{"20 cQ", kindViscosity, `unknown unit "cQ"`},
		{"20 Mpa", kindPressure, `did you mean "MPa"?`},
		{"sixty m", kindLength, "not a number"},
		{"N95E", kindAzimuth, "within 0–90"},
		{"1e999 m", kindLength, "out of range"},
	}
	for _, tc := range tests {
		_, err := parseQuantity(tc.in, tc.kind)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%q: error %v, want it to contain %q", tc.in, err, tc.want)
		}
	}
}

// A number without a unit is suggested with the units the trade uses,
// never with the SI unit alone where that is far from the habit (20 Pa.s
// is 1000 times the likely 20 cP).
func TestNeedsUnitSuggestsUsualUnits(t *testing.T) {
	tests := []struct {
		in      string
		kind    unitKind
		want    []string
		notWant string
	}{
		{"20", kindViscosity, []string{`"20 cP" or "20 mPa.s"`}, `"20 Pa.s"`},
		{"55", kindPressure, []string{`"55 MPa" or "55 psi"`}, `"55 Pa"`},
		{"80", kindRate, []string{`"80 bbl/min" or "80 m3/min"`}, `"80 m3/s"`},
		{"2600", kindLength, []string{`"2600 m" or "2600 ft"`}, `"2600 km"`},
		{"22", kindGradient, []string{`"22 kPa/m" or "22 psi/ft"`}, `"22 Pa/m"`},
		{"30", kindTime, []string{`"30 min", "30 h" or "30 s"`}, `"30 d"`},
		{"0.45", kindCompressibility, []string{`"0.45 1/GPa" or "0.45 1/psi"`}, `"0.45 1/Pa"`},
	}
	for _, tc := range tests {
		_, err := parseQuantity(tc.in, tc.kind)
		if err == nil {
			t.Errorf("%s %q: accepted without a unit", tc.kind, tc.in)
			continue
		}
		for _, w := range tc.want {
			if !strings.Contains(err.Error(), w) {
				t.Errorf("%s %q: error %q, want it to contain %s", tc.kind, tc.in, err, w)
			}
		}
		if strings.Contains(err.Error(), tc.notWant) {
			t.Errorf("%s %q: error %q suggests %s", tc.kind, tc.in, err, tc.notWant)
		}
	}
}

// Every kind has a shown unit and usual units, and each of them is a unit
// of that kind (unitFactor panics otherwise).
func TestUnitTablesAgree(t *testing.T) {
	if len(unitTable) == 0 {
		t.Fatal("no unit kinds")
	}
	for k := range unitTable {
		if _, ok := shownUnit[k]; !ok {
			t.Errorf("%s: no shown unit", k)
		}
		if len(usualUnits[k]) == 0 {
			t.Errorf("%s: no usual units", k)
		}
		for _, u := range append([]string{shownUnit[k]}, usualUnits[k]...) {
			if f := unitFactor(k, u); !(f > 0) {
				t.Errorf("%s: unit %s has factor %g", k, u, f)
			}
		}
	}
	if len(shownUnit) != len(unitTable) || len(usualUnits) != len(unitTable) {
		t.Errorf("%d kinds, %d shown units, %d usual unit lists", len(unitTable), len(shownUnit), len(usualUnits))
	}
}

// Messages state quantities in the units of the output files (MPa, m, s)
// or the trade's (kPa/m, cP), rounded to ten significant digits.
func TestFormatQuantity(t *testing.T) {
	tests := []struct {
		v    float64
		kind unitKind
		want string
	}{
		{2.86e7, kindPressure, "28.6 MPa"},
		{18500, kindGradient, "18.5 kPa/m"},
		{1e-5, kindViscosity, "0.01 cP"},
		{4.5e-10, kindCompressibility, "0.45 1/GPa"},
		{90 * degree, kindAzimuth, "90 deg"},
		{1e7, kindLength, "1e7 m"},
		{7200, kindTime, "7200 s"},
	}
	for _, tc := range tests {
		if got := formatQuantity(tc.v, tc.kind); got != tc.want {
			t.Errorf("formatQuantity(%g, %s) = %q, want %q", tc.v, tc.kind, got, tc.want)
		}
	}
}

func TestEditDistance(t *testing.T) {
	for _, tc := range []struct {
		a, b string
		d    int
	}{{"kappa", "kapa", 1}, {"", "abc", 3}, {"flaw", "lawn", 2}, {"same", "same", 0}} {
		if got := editDistance(tc.a, tc.b); got != tc.d {
			t.Errorf("editDistance(%q, %q) = %d, want %d", tc.a, tc.b, got, tc.d)
		}
	}
}

func TestParseDuration(t *testing.T) {
	for in, want := range map[string]float64{"90 min": 5400, "2 h": 7200, "3600": 3600, " 1.5 d": 129600} {
		got, err := ParseDuration(in)
		if err != nil {
			t.Errorf("%q: %v", in, err)
			continue
		}
		numtest.Rel(t, in, got, want, 1e-15)
	}
	if _, err := ParseDuration("2 furlongs"); err == nil {
		t.Error("accepted a length as a time")
	}
}
