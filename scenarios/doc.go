// Package scenarios reads, converts and validates slipfront scenario files.
//
// A scenario is a TOML file that describes one stimulation case: the map
// domain and its projected CRS, the reservoir layer, the in-situ stress,
// the rock and fracture properties, the natural fracture sets, mapped
// fractures, wells with stages and perforation clusters, fluids, the
// pumping schedule and numerical settings. Template returns an annotated
// file listing every key; Examples lists the scenarios embedded in the
// program (among them "demo").
//
// Parse converts every value to SI, applies defaults, checks each value's
// range and the rules that join several values, and reports every problem
// at once as Errors: each names the file, the line, the dotted key, the
// value and what is allowed ("demo.toml:44: sets[1].orientation.kappa = -3:
// must be > 0"). Unknown keys are errors with the closest known key
// suggested. Overrides ("--set key=value") change single values by their
// dotted key before validation, so they are checked exactly like the file.
// An override may not add a fluid that nothing names unless its key
// declares it with a leading "+" ("+fluids.gel.viscosity"), and may not
// change a value that no run reads (a fluid no stage pumps, a key of a
// law the scenario does not choose): a mistyped key never runs silently.
// A fluid that no stage pumps is a warning (Scenario.Warnings).
// UsedDigest identifies what a run uses, Digest everything.
//
// # Units
//
// Values with a dimension are strings with a unit ("2600 m", "0.7 psi/ft",
// "80 bbl/min", "N75E"); a bare number for such a value is an error, so no
// unit is ever guessed. Inside, everything is SI (m, s, Pa, Pa·s, 1/Pa, m³,
// m³/s) and angles are radians. Conversion factors follow NIST Special
// Publication 811 (2008), Appendix B; the US oil barrel is 42 US gallons.
// Lengths may be in the US survey foot, "ftUS" (1200/3937 m), which State
// Plane coordinates use; "ft" is the international foot (0.3048 m).
//
// # Conventions
//
// Local coordinates are East-North metres from the scenario origin, depths
// are true vertical depth, positive down. The origin lies in the projected
// CRS named by domain.crs (an EPSG code the gis package knows) or read
// from the WKT file domain.crs_wkt; the local axes are parallel to its
// grid. Stress is compression-positive.
// Azimuths are clockwise from north; quadrant bearings such as N75E (75°
// east of north) and S20W (200°) are accepted.
//
// # References
//
// Thompson, A. & Taylor, B.N. (2008), Guide for the Use of the
// International System of Units (SI), NIST Special Publication 811.
package scenarios
