package gis

import (
	"errors"
	"fmt"
	"strconv"
	"strings"

	"github.com/paulmach/orb"
)

// CRS is a projected coordinate reference system: an EPSG code this
// package knows (see ParseCRS) or a definition read from WKT (ParseWKT).
// The zero value is the undefined local Cartesian frame (metres, no place
// on the Earth).
type CRS struct {
	// EPSG is the code, 0 for the undefined frame and for a WKT
	// definition without an EPSG identifier.
	EPSG int
	// wkt is the definition read from WKT text, nil for a code.
	wkt *crsDef
}

// crsDef is what the writers need to know of a CRS.
type crsDef struct {
	name string
	epsg int // the projected CRS's EPSG code, 0 if none
	unit LinearUnit
	el   Ellipsoid
	// conv is the projection; conv.Method is 0 when the method (named by
	// methodName) is not implemented.
	conv       Conversion
	methodName string
	geogName   string // base geographic CRS
	geogEPSG   int
	datumName  string
	datumEPSG  int
	// primeMeridian, degrees east of Greenwich.
	primeMeridian float64
	tie           wgs84Tie
	helmert       *helmert // the shift to WGS 84 when tie is tieHelmert
	tieNote       string   // why longitude and latitude are refused, when tie is tieNone
	wkt           string   // the WKT text, compacted; "" for a table CRS
}

// EPSG codes and limits used by ParseCRS.
const (
	epsgWGS84Geographic = 4326
	maxEPSGCode         = 999999 // larger than any EPSG registry code; common practice, no source

	srsIDUndefinedCartesian  = -1 // GeoPackage 1.3 (OGC 12-128r18), Req 11
	srsIDUndefinedGeographic = 0  // GeoPackage 1.3 (OGC 12-128r18), Req 11
)

// geographicCodes are EPSG codes of geographic 2-D CRSs that users might
// name by mistake; local metres cannot be placed in degrees. (EPSG
// registry: the base CRSs of epsgTable and 4258 ETRS89.)
var geographicCodes = map[int]bool{4326: true, 4269: true, 4152: true, 4759: true, 6318: true, 4617: true, 4267: true, 4258: true}

// ErrUnsupportedCRS is returned (wrapped) for an EPSG code that is not a
// projected CRS of this package's table; the message lists the table.
var ErrUnsupportedCRS = errors.New("gis: not a projected CRS this program can place")

// ErrNoGeographic is returned (wrapped) when a CRS cannot be converted to
// WGS 84 longitude and latitude by this package.
var ErrNoGeographic = errors.New("gis: no conversion to WGS 84 longitude/latitude")

// ParseCRS parses "EPSG:<code>" (case-insensitive prefix) of a projected
// CRS this package knows, a WKT text of a projected CRS (see ParseWKT), or
// "" (the undefined local frame). Geographic CRSs (degrees) are rejected
// because the local frame is in metres, and so are EPSG codes outside
// the table of supported CRSs, with a message that lists them.
func ParseCRS(s string) (CRS, error) {
	s = strings.TrimSpace(s)
	if s == "" {
		return CRS{}, nil
	}
	if looksLikeWKT(s) {
		return ParseWKT(s)
	}
	prefix, code, ok := strings.Cut(s, ":")
	if !ok || !strings.EqualFold(prefix, "EPSG") {
		return CRS{}, fmt.Errorf("gis: CRS %q: want \"EPSG:<code>\", a WKT text, or empty for an undefined local frame", s)
	}
	n, err := strconv.Atoi(code)
	if err != nil || n <= 0 || n > maxEPSGCode {
		return CRS{}, fmt.Errorf("gis: CRS %q: EPSG code must be an integer in 1..%d", s, maxEPSGCode)
	}
	if geographicCodes[n] {
		return CRS{}, fmt.Errorf("gis: CRS %q is geographic (degrees); local coordinates in metres need a projected CRS such as a UTM zone", s)
	}
	if _, ok := lookupEPSG(n); !ok {
		return CRS{}, fmt.Errorf("%w: %q; supported: %s", ErrUnsupportedCRS, s, supportedCRSs)
	}
	return CRS{EPSG: n}, nil
}

// String returns "EPSG:<code>" for a code, the compacted WKT text for a
// WKT definition, or "" for the undefined frame; ParseCRS reads it back.
func (c CRS) String() string {
	switch {
	case c.wkt != nil:
		return c.wkt.wkt
	case c.EPSG == 0:
		return ""
	}
	return "EPSG:" + strconv.Itoa(c.EPSG)
}

// label names c in messages: "EPSG:<code>" or the WKT CRS's name.
func (c CRS) label() string {
	if c.wkt != nil {
		return fmt.Sprintf("WKT CRS %q", c.wkt.name)
	}
	if c.EPSG == 0 {
		return "the undefined local frame"
	}
	return c.String()
}

// Equal reports whether c and d are the same CRS: the same code, or the
// same WKT text.
func (c CRS) Equal(d CRS) bool { return c.EPSG == d.EPSG && c.String() == d.String() }

// Defined reports whether c is a CRS rather than the undefined frame.
func (c CRS) Defined() bool { return c.EPSG != 0 || c.wkt != nil }

// definition returns what the writers need of c; nil for the undefined
// frame. It fails for an EPSG code this package does not know (a CRS
// value built by hand: ParseCRS refuses such codes).
func (c CRS) definition() (*crsDef, error) {
	if c.wkt != nil {
		return c.wkt, nil
	}
	if c.EPSG == 0 {
		return nil, nil
	}
	e, ok := lookupEPSG(c.EPSG)
	if !ok {
		return nil, fmt.Errorf("%w: %v; supported: %s", ErrUnsupportedCRS, c, supportedCRSs)
	}
	return e.definition(), nil
}

// Unit returns the length unit of c's axes: the metre for the undefined
// frame, the zero LinearUnit for an EPSG code this package does not know.
func (c CRS) Unit() LinearUnit {
	switch {
	case c.wkt != nil:
		return c.wkt.unit
	case c.EPSG == 0:
		return Metre
	}
	if e, ok := lookupEPSG(c.EPSG); ok {
		return e.unit
	}
	return LinearUnit{}
}

// Projection returns the map projection of c, in metres. It fails,
// wrapping ErrNoGeographic, for the undefined frame and for a WKT
// projection method this package does not implement.
func (c CRS) Projection() (Projection, error) {
	d, err := c.definition()
	switch {
	case err != nil:
		return nil, fmt.Errorf("%w: %v", ErrNoGeographic, err)
	case d == nil:
		return nil, fmt.Errorf("%w: the CRS is undefined (a local frame); set a projected CRS: %s", ErrNoGeographic, supportedCRSs)
	case d.conv.Method == 0:
		return nil, fmt.Errorf("%w for %s: its projection method %q is not implemented; implemented are %v, %v and %v",
			ErrNoGeographic, c.label(), d.methodName, MethodTransverseMercator, MethodLambertConic1SP, MethodLambertConic2SP)
	}
	p, err := NewProjection(d.el, d.conv)
	if err != nil {
		return nil, fmt.Errorf("%w for %s: %v", ErrNoGeographic, c.label(), err)
	}
	return p, nil
}

// Name returns the CRS name as in the EPSG dataset ("NAD83 / Texas
// Central (ftUS)") or the WKT text, "EPSG:<code>" for a code this package
// does not know and "undefined Cartesian" for the undefined frame.
func (c CRS) Name() string {
	d, err := c.definition()
	switch {
	case err != nil:
		return c.String()
	case d == nil:
		return "undefined Cartesian"
	}
	return d.name
}

// Placement places the local East-North frame (m) in a CRS. Easting and
// Northing of local (0, 0) are lengths in metres (SI, like everything
// inside slipfront); the CRS's coordinates are in its own unit, so local
// (x, y) is the CRS point ((Easting + x)/u, (Northing + y)/u), u the
// length of the CRS unit in metres.
//
// The local axes are parallel to the CRS grid axes (local north is grid
// north) and a local metre is a grid metre: the projection's scale factor
// and the convergence of the meridians are not applied, so local lengths
// are grid lengths, which differ from ground lengths by the point scale
// factor (within 1 part in 2500 in UTM, 1 in 10 000 in State Plane zones).
type Placement struct {
	CRS CRS
	// Easting of local (0, 0) in the CRS, m.
	Easting float64
	// Northing of local (0, 0) in the CRS, m.
	Northing float64
}

// ToCRS returns the CRS coordinates of local point p (m), in the CRS
// unit. It panics for an EPSG code this package does not know (ParseCRS
// refuses such codes; the writers report them as errors).
func (pl Placement) ToCRS(p orb.Point) orb.Point {
	u := pl.CRS.Unit().Metres
	if u == 0 {
		panic("gis: ToCRS: unknown CRS " + pl.CRS.String())
	}
	return orb.Point{(p[0] + pl.Easting) / u, (p[1] + pl.Northing) / u}
}

// resolve returns c's definition (nil for the undefined frame) and the
// conversion of local points to CRS coordinates, for the writers.
func (pl Placement) resolve() (*crsDef, func(orb.Point) orb.Point, error) {
	d, err := pl.CRS.definition()
	if err != nil {
		return nil, nil, err
	}
	u := Metre.Metres
	if d != nil {
		u = d.unit.Metres
	}
	e, n := pl.Easting, pl.Northing
	return d, func(p orb.Point) orb.Point { return orb.Point{(p[0] + e) / u, (p[1] + n) / u} }, nil
}

// Geographic returns the conversion of local points to WGS 84 longitude
// and latitude, or an error wrapping ErrNoGeographic when the CRS has no
// implemented projection or its datum no known relation to WGS 84.
//
// WGS 84 CRSs are exact. NAD83 and its realizations (HARN, NSRS2007,
// 2011, CSRS) are returned unchanged as WGS 84: the datums differ by
// about 1–2 m in North America (NOAA NGS; from memory), below the
// resolution of a stimulated-area map but not of a survey. NAD27 is
// refused: it differs by tens of metres and no datum shift is
// implemented. A WKT CRS is accepted when its datum is one of these (by
// EPSG identifier or name) or has a TOWGS84 element, whose seven-parameter
// shift (position vector convention) is then applied on the geocentric
// coordinates.
func (pl Placement) Geographic() (*Geographic, error) {
	tm, err := pl.CRS.Projection()
	if err != nil {
		return nil, err
	}
	d, _ := pl.CRS.definition() // a projection implies a definition
	switch {
	case d.tie == tieNone:
		note := d.tieNote
		if note == "" {
			note = fmt.Sprintf("its datum %q has no known relation to WGS 84 here (give the datum's EPSG identifier, or a WKT1 TOWGS84 element)", d.datumName)
		}
		return nil, fmt.Errorf("%w for %s: %s", ErrNoGeographic, pl.CRS.label(), note)
	case d.primeMeridian != 0:
		return nil, fmt.Errorf("%w for %s: its prime meridian is %g° from Greenwich; only Greenwich is supported", ErrNoGeographic, pl.CRS.label(), d.primeMeridian)
	}
	return &Geographic{placement: pl, proj: tm, el: d.el, shift: d.helmert}, nil
}

// Geographic converts local East-North points to WGS 84 longitude and
// latitude.
type Geographic struct {
	placement Placement
	proj      Projection
	el        Ellipsoid // of the CRS's datum
	shift     *helmert  // to WGS 84; nil when the datum is taken as WGS 84
}

// LonLat returns [longitude, latitude] in degrees of local point p (m).
// The projection works in metres, so the CRS unit plays no part here.
func (g *Geographic) LonLat(p orb.Point) orb.Point {
	lon, lat := g.proj.Inverse(p[0]+g.placement.Easting, p[1]+g.placement.Northing)
	if g.shift != nil {
		lon, lat = g.shift.toWGS84(g.el, lon, lat)
	}
	return orb.Point{lon, lat}
}
