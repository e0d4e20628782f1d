package gis

import "math"

// LinearUnit is the length unit of a projected CRS's axes.
type LinearUnit struct {
	// Name as in the EPSG dataset ("metre", "US survey foot") or as a
	// WKT text gives it.
	Name string
	// Metres is the length of one unit, m.
	Metres float64
	// EPSG is the unit's code in the EPSG dataset (9001 metre, 9002 foot,
	// 9003 US survey foot), 0 for another unit.
	EPSG int
}

// The linear units of the CRSs this package knows by code (EPSG dataset,
// units of measure 9001–9003). The international foot is 0.3048 m exactly
// and the US survey foot 1200/3937 m exactly (NIST (2008), Guide for the
// Use of the International System of Units, Special Publication 811,
// Appendix B.8, "foot" and "foot (U.S. survey)"; the exact ratio from
// memory, and the EPSG dataset's 0.304800609601219 agrees to 15 digits);
// the two differ by 2 parts per million, 4.6 ft at 2 300 000 ft.
var (
	Metre        = LinearUnit{Name: "metre", Metres: 1, EPSG: 9001}
	Foot         = LinearUnit{Name: "foot", Metres: 0.3048, EPSG: 9002}
	USSurveyFoot = LinearUnit{Name: "US survey foot", Metres: 1200.0 / 3937, EPSG: 9003}
)

// knownUnitTol is the relative difference below which a unit read from a
// WKT text is taken for one of the EPSG units above: WKT writers print
// the US survey foot as 0.304800609601219 (15 significant digits, 7e-16
// from 1200/3937), so 1e-12 recognises every printing and no other unit.
const knownUnitTol = 1e-12

// canonicalUnit returns the EPSG unit whose length is within knownUnitTol
// of metres, or a unit with the given name and length.
func canonicalUnit(name string, metres float64) LinearUnit {
	for _, u := range [...]LinearUnit{Metre, Foot, USSurveyFoot} {
		if math.Abs(metres-u.Metres) <= knownUnitTol*u.Metres {
			return u
		}
	}
	return LinearUnit{Name: name, Metres: metres}
}

// Abbrev returns a short unit symbol for column names and notes: "m",
// "ft", "ftUS", or the unit's name.
func (u LinearUnit) Abbrev() string {
	switch u.EPSG {
	case Metre.EPSG:
		return "m"
	case Foot.EPSG:
		return "ft"
	case USSurveyFoot.EPSG:
		return "ftUS"
	}
	return u.Name
}
