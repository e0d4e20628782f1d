package scenarios

import (
	"errors"
	"fmt"
	"math"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"unicode"
)

// Conversion factors to SI. Exact values where the definition is exact;
// sources: NIST Special Publication 811 (2008 edition), "Guide for the Use
// of the International System of Units", Appendix B.8 and B.9.
const (
	foot       = 0.3048                     // m, exact (SP 811 B.8: foot)
	surveyFoot = 1200.0 / 3937              // m, exact (SP 811 B.8: foot (U.S. survey) 3.048006 E-01; the ratio from memory)
	inch       = 0.0254                     // m, exact (SP 811 B.8: inch)
	poundForce = 4.4482216152605            // N, exact (SP 811 B.8: pound-force)
	psi        = poundForce / (inch * inch) // Pa = 6894.757293168 (SP 811 B.8: 6.894757 E+03)
	usGallon   = 3.785411784e-3             // m³, exact (SP 811 B.8: gallon [U.S.])
	oilBarrel  = 42 * usGallon              // m³ = 0.158987294928 (SP 811 B.8: barrel [for petroleum, 42 gallons (U.S.)] 1.589873 E-01)
	centipoise = 1e-3                       // Pa·s (SP 811 B.8: centipoise 1.0 E-03)
	minute     = 60.0                       // s
	hour       = 3600.0                     // s
	day        = 86400.0                    // s
	julianYear = 365.25 * day               // s (SP 811 B.8: year [365.25 days] 3.15576 E+07, from memory)
	darcy      = 9.869233e-13               // m² (SP 811 B.8: darcy 9.869233 E-13, from memory)
	// poundPerGallon is the pound (avoirdupois, 0.45359237 kg exactly, SP
	// 811 B.8) per US gallon, kg/m³ = 119.826427 (SP 811 B.8: 1.198264 E+02).
	poundPerGallon = 0.45359237 / usGallon
	degree         = math.Pi / 180 // rad
)

// unitKind is the physical dimension a scenario value must carry.
type unitKind string

// The unit kinds named in struct tags.
const (
	kindLength          unitKind = "length"
	kindPressure        unitKind = "pressure"
	kindGradient        unitKind = "gradient"
	kindViscosity       unitKind = "viscosity"
	kindCompressibility unitKind = "compressibility"
	kindRate            unitKind = "rate"
	kindVolume          unitKind = "volume"
	kindTime            unitKind = "time"
	kindAngle           unitKind = "angle"
	kindAzimuth         unitKind = "azimuth"
	kindIntensity       unitKind = "intensity"
	kindLeakoff         unitKind = "leakoff"
	kindPermeability    unitKind = "permeability"
	kindDensity         unitKind = "density"
	kindToughness       unitKind = "toughness"
	kindStressingRate   unitKind = "stressing rate"
)

// unitTable lists, per kind, the accepted unit spellings and their factor
// to SI. The first entry of each kind is the SI unit. Spellings are
// case-sensitive (mPa is not MPa); normalizeUnit maps typographic variants
// (m³, µm, Pa·s) to these.
var unitTable = map[unitKind][]struct {
	name   string
	factor float64
}{
	kindLength: {{"m", 1}, {"km", 1e3}, {"cm", 1e-2}, {"mm", 1e-3}, {"um", 1e-6}, {"ft", foot}, {"ftUS", surveyFoot}, {"in", inch}},
	kindPressure: {{"Pa", 1}, {"kPa", 1e3}, {"MPa", 1e6}, {"GPa", 1e9}, {"bar", 1e5}, {"psi", psi},
		{"ksi", 1e3 * psi}},
	kindGradient: {{"Pa/m", 1}, {"kPa/m", 1e3}, {"MPa/m", 1e6}, {"MPa/km", 1e3}, {"bar/m", 1e5},
		{"psi/ft", psi / foot}},
	kindViscosity:       {{"Pa.s", 1}, {"mPa.s", 1e-3}, {"cP", centipoise}, {"P", 100 * centipoise}},
	kindCompressibility: {{"1/Pa", 1}, {"1/kPa", 1e-3}, {"1/MPa", 1e-6}, {"1/GPa", 1e-9}, {"1/bar", 1e-5}, {"1/psi", 1 / psi}},
	kindRate: {{"m3/s", 1}, {"m3/min", 1 / minute}, {"m3/h", 1 / hour}, {"L/s", 1e-3}, {"L/min", 1e-3 / minute},
		{"bbl/min", oilBarrel / minute}, {"gal/min", usGallon / minute}},
	kindVolume:    {{"m3", 1}, {"L", 1e-3}, {"bbl", oilBarrel}, {"gal", usGallon}},
	kindTime:      {{"s", 1}, {"ms", 1e-3}, {"min", minute}, {"h", hour}, {"d", day}, {"yr", julianYear}},
	kindAngle:     {{"rad", 1}, {"deg", degree}},
	kindAzimuth:   {{"rad", 1}, {"deg", degree}},
	kindIntensity: {{"1/m", 1}, {"1/km", 1e-3}, {"1/ft", 1 / foot}},
	kindLeakoff:   {{"m/s^0.5", 1}, {"ft/min^0.5", foot / math.Sqrt(minute)}},
	kindPermeability: {{"m2", 1}, {"D", darcy}, {"mD", 1e-3 * darcy}, {"uD", 1e-6 * darcy},
		{"nD", 1e-9 * darcy}},
	kindDensity:       {{"kg/m3", 1}, {"g/cm3", 1e3}, {"lb/gal", poundPerGallon}},
	kindToughness:     {{"Pa.m^0.5", 1}, {"MPa.m^0.5", 1e6}, {"psi.in^0.5", psi * math.Sqrt(inch)}},
	kindStressingRate: {{"Pa/s", 1}, {"kPa/yr", 1e3 / julianYear}, {"MPa/yr", 1e6 / julianYear}, {"bar/yr", 1e5 / julianYear}},
}

// shownUnit is the unit in which messages and the template state a
// quantity of each kind: the unit of the output files where they hold such
// a quantity (MPa, m, s, m3, m3/s: the README's table of units in outputs),
// otherwise the unit the trade writes most (kPa/m, cP, 1/GPa: common
// practice, no source). Angles are in degrees.
var shownUnit = map[unitKind]string{
	kindLength: "m", kindPressure: "MPa", kindGradient: "kPa/m", kindViscosity: "cP",
	kindCompressibility: "1/GPa", kindRate: "m3/s", kindVolume: "m3", kindTime: "s",
	kindAngle: "deg", kindAzimuth: "deg", kindIntensity: "1/m", kindLeakoff: "m/s^0.5",
	kindPermeability: "m2", kindDensity: "kg/m3", kindToughness: "MPa.m^0.5",
	kindStressingRate: "kPa/yr",
}

// usualUnits are the units suggested for a number written without one:
// the ones the trade writes most, metric and oilfield (common practice, no
// source). The SI unit alone would mislead where it is far from the
// habit: 20 Pa.s is a thousand times the likely 20 cP.
var usualUnits = map[unitKind][]string{
	kindLength: {"m", "ft"}, kindPressure: {"MPa", "psi"}, kindGradient: {"kPa/m", "psi/ft"},
	kindViscosity: {"cP", "mPa.s"}, kindCompressibility: {"1/GPa", "1/psi"}, kindRate: {"bbl/min", "m3/min"},
	kindVolume: {"m3", "bbl"}, kindTime: {"min", "h", "s"}, kindAngle: {"deg"}, kindAzimuth: {"deg"},
	kindIntensity: {"1/m", "1/ft"}, kindLeakoff: {"m/s^0.5", "ft/min^0.5"},
	kindPermeability: {"nD", "mD"}, kindDensity: {"kg/m3", "lb/gal"}, kindToughness: {"MPa.m^0.5", "psi.in^0.5"},
	kindStressingRate: {"kPa/yr", "MPa/yr"},
}

// unitFactor is the factor to SI of the unit name of kind k; it panics on
// a unit the table lacks (a bug in the tables above).
func unitFactor(k unitKind, name string) float64 {
	for _, u := range unitTable[k] {
		if u.name == name {
			return u.factor
		}
	}
	panic(fmt.Sprintf("scenarios: no unit %q for a %s", name, k))
}

// needsUnit says that the number needs a unit and writes it with each
// usual unit of kind k: "needs a unit: "20 cP" or "20 mPa.s" (viscosity
// units: Pa.s, mPa.s, cP, P)".
func needsUnit(number string, k unitKind) string {
	var with []string
	for _, u := range usualUnits[k] {
		with = append(with, strconv.Quote(number+" "+u))
	}
	return fmt.Sprintf("needs a unit: write %s (%s units: %s)", orList(with), k, unitNames(k))
}

// orList joins items as "a", "a or b", "a, b or c".
func orList(items []string) string {
	if len(items) <= 1 {
		return strings.Join(items, "")
	}
	return strings.Join(items[:len(items)-1], ", ") + " or " + items[len(items)-1]
}

// unitNames returns the accepted spellings of a kind, for messages.
func unitNames(k unitKind) string {
	var names []string
	for _, u := range unitTable[k] {
		names = append(names, u.name)
	}
	if k == kindAzimuth {
		names = append(names, `quadrant bearing such as "N75E"`)
	}
	return strings.Join(names, ", ")
}

// normalizeUnit maps typographic variants to the spellings of unitTable.
func normalizeUnit(u string) string {
	r := strings.NewReplacer(
		"³", "3", "µ", "u", "μ", "u", "·", ".", "*", ".", "°", "deg",
	)
	switch {
	case strings.HasSuffix(u, "^-1"):
		u = "1/" + strings.TrimSuffix(u, "^-1")
	case strings.HasSuffix(u, "⁻¹"):
		u = "1/" + strings.TrimSuffix(u, "⁻¹")
	}
	u = r.Replace(u)
	if strings.HasPrefix(u, "/") {
		u = "1" + u // "/m" for "1/m"
	}
	switch u {
	case "m/sqrt(s)", "m/s^(1/2)", "m/s0.5":
		return "m/s^0.5"
	case "ft/sqrt(min)", "ft/min^(1/2)":
		return "ft/min^0.5"
	case "Pas":
		return "Pa.s"
	case "mPas":
		return "mPa.s"
	case "bpm":
		return "bbl/min"
	case "us-ft", "usft", "USft", "US-ft", "ft_US", "ftus":
		return "ftUS"
	case "degrees", "degree":
		return "deg"
	case "sec":
		return "s"
	case "hr":
		return "h"
	case "day", "days":
		return "d"
	case "year", "years":
		return "yr"
	case "md", "millidarcy":
		return "mD"
	case "nd", "nanodarcy":
		return "nD"
	case "ppg":
		return "lb/gal"
	case "MPa.sqrt(m)", "MPa√m", "MPa.√m", "MPa.m^(1/2)":
		return "MPa.m^0.5"
	case "psi.sqrt(in)", "psi√in", "psi.√in", "psi.in^(1/2)":
		return "psi.in^0.5"
	}
	return u
}

var numberPrefix = regexp.MustCompile(`^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*(.*?)\s*$`)

// bearingPattern matches quadrant bearings such as N75E or S20.5W.
var bearingPattern = regexp.MustCompile(`^\s*([NSns])\s*(\d+(?:\.\d*)?)\s*([EWew])\s*$`)

// parseQuantity converts a value with a unit, such as "2600 m" or
// "0.7 psi/ft", to SI. Azimuths also accept quadrant bearings.
func parseQuantity(s string, k unitKind) (float64, error) {
	if k == kindAzimuth {
		if m := bearingPattern.FindStringSubmatch(s); m != nil {
			return parseBearing(m)
		}
	}
	m := numberPrefix.FindStringSubmatch(s)
	if m == nil {
		return 0, fmt.Errorf("not a number with a unit (%s: %s)", k, unitNames(k))
	}
	v, err := strconv.ParseFloat(m[1], 64)
	if err != nil || math.IsInf(v, 0) {
		return 0, fmt.Errorf("number %s out of range", echo(m[1]))
	}
	if m[2] == "" {
		return 0, errors.New(needsUnit(m[1], k))
	}
	if strings.ContainsFunc(m[2], unicode.IsSpace) {
		return 0, fmt.Errorf("the unit %s has a space inside; write it without spaces, e.g. \"%s %s\"", echo(m[2]), m[1], usualUnits[k][0])
	}
	u := normalizeUnit(m[2])
	for _, e := range unitTable[k] {
		if e.name == u {
			return v * e.factor, nil
		}
	}
	return 0, fmt.Errorf("unknown unit %s for a %s; use one of: %s%s", echo(m[2]), k, unitNames(k), suggest(u, unitSpellings(k)))
}

// parseBearing converts a quadrant bearing (N75E: 75° east of north) to an
// azimuth in radians.
func parseBearing(m []string) (float64, error) {
	a, err := strconv.ParseFloat(m[2], 64)
	if err != nil || a > 90 {
		return 0, fmt.Errorf("quadrant bearing angle %s must be within 0–90 degrees", m[2])
	}
	ns, ew := strings.ToUpper(m[1]), strings.ToUpper(m[3])
	var az float64
	switch ns + ew {
	case "NE":
		az = a
	case "SE":
		az = 180 - a
	case "SW":
		az = 180 + a
	case "NW":
		az = 360 - a
	}
	if az == 360 {
		az = 0
	}
	return az * degree, nil
}

func unitSpellings(k unitKind) []string {
	var names []string
	for _, u := range unitTable[k] {
		names = append(names, u.name)
	}
	return names
}

// formatQuantity writes an SI value in the shown unit of its kind, for
// messages: formatQuantity(2.86e7, kindPressure) is "28.6 MPa".
func formatQuantity(v float64, k unitKind) string {
	u := shownUnit[k]
	return formatNumber(v/unitFactor(k, u)) + " " + u
}

// formatNumber writes v with at most 10 significant digits (so that a
// converted value such as 1e-5/1e-3 reads 0.01) and exponents without a
// plus sign or leading zero (1e6, 2.5e-7).
func formatNumber(v float64) string {
	v, _ = strconv.ParseFloat(strconv.FormatFloat(v, 'g', 10, 64), 64)
	t := strconv.FormatFloat(v, 'g', -1, 64)
	return strings.NewReplacer("e+0", "e", "e+", "e", "e-0", "e-").Replace(t)
}

// suggest returns ` (did you mean "x"?)` for the candidate closest to s, or
// "" when none is close.
func suggest(s string, candidates []string) string {
	best, bestD := "", 1<<30
	sorted := append([]string(nil), candidates...)
	sort.Strings(sorted)
	for _, c := range sorted {
		// Also against the leading words of snake_case names, so that
		// "frction" finds "friction_static" (one more for the cut).
		lc := strings.ToLower(c)
		d := editDistance(strings.ToLower(s), lc)
		for i, r := range lc {
			if r == '_' {
				d = min(d, editDistance(strings.ToLower(s), lc[:i])+1)
			}
		}
		if d < bestD {
			best, bestD = c, d
		}
	}
	if best == "" || bestD > max(2, len(s)/3) {
		return ""
	}
	return fmt.Sprintf(" (did you mean %q?)", best)
}

// editDistance is the Levenshtein distance between a and b.
func editDistance(a, b string) int {
	ra, rb := []rune(a), []rune(b)
	prev := make([]int, len(rb)+1)
	cur := make([]int, len(rb)+1)
	for j := range prev {
		prev[j] = j
	}
	for i := 1; i <= len(ra); i++ {
		cur[0] = i
		for j := 1; j <= len(rb); j++ {
			cost := 1
			if ra[i-1] == rb[j-1] {
				cost = 0
			}
			cur[j] = min(prev[j]+1, cur[j-1]+1, prev[j-1]+cost)
		}
		prev, cur = cur, prev
	}
	return prev[len(rb)]
}

// ParseDuration reads a time such as "90 min", "2 h" or "3600 s" for
// command-line flags; a bare number is seconds.
func ParseDuration(s string) (float64, error) {
	if v, err := strconv.ParseFloat(strings.TrimSpace(s), 64); err == nil && !math.IsNaN(v) && !math.IsInf(v, 0) {
		return v, nil
	}
	return parseQuantity(s, kindTime)
}
