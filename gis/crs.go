package gis

import (
	"errors"
	"fmt"
	"strconv"
	"strings"

	"github.com/paulmach/orb"
)

// CRS is a projected coordinate reference system named by its EPSG code.
// The zero value is the undefined local Cartesian frame (metres, no place
// on the Earth).
type CRS struct {
	// EPSG is the code, 0 for the undefined frame.
	EPSG int
}

// EPSG codes of the transverse Mercator families this package can convert
// to longitude and latitude (EPSG registry: "WGS 84 / UTM zone NN[N|S]"
// and "NAD83 / UTM zone NNN").
const (
	epsgWGS84UTMNorth1  = 32601
	epsgWGS84UTMNorth60 = 32660
	epsgWGS84UTMSouth1  = 32701
	epsgWGS84UTMSouth60 = 32760
	epsgNAD83UTM1       = 26901
	epsgNAD83UTM23      = 26923

	epsgWGS84Geographic = 4326
	maxEPSGCode         = 999999 // larger than any EPSG registry code; common practice, no source

	srsIDUndefinedCartesian  = -1 // GeoPackage 1.3 (OGC 12-128r18), Req 11
	srsIDUndefinedGeographic = 0  // GeoPackage 1.3 (OGC 12-128r18), Req 11
)

// geographicCodes are EPSG codes of geographic 2-D CRSs that users might
// name by mistake; local metres cannot be placed in degrees.
// (EPSG registry: 4326 WGS 84, 4269 NAD83, 4258 ETRS89.)
var geographicCodes = map[int]bool{4326: true, 4269: true, 4258: true}

// supportedRanges names the codes Geographic accepts, for error messages.
const supportedRanges = "EPSG:32601–32660 and 32701–32760 (WGS 84 / UTM) and EPSG:26901–26923 (NAD83 / UTM)"

// ErrNoGeographic is returned (wrapped) when a CRS cannot be converted to
// WGS 84 longitude and latitude by this package.
var ErrNoGeographic = errors.New("gis: no conversion to WGS 84 longitude/latitude")

// ParseCRS parses "EPSG:<code>" (case-insensitive prefix) or "" (the
// undefined local frame). Geographic CRSs (degrees) are rejected because
// the local frame is in metres.
func ParseCRS(s string) (CRS, error) {
	s = strings.TrimSpace(s)
	if s == "" {
		return CRS{}, nil
	}
	prefix, code, ok := strings.Cut(s, ":")
	if !ok || !strings.EqualFold(prefix, "EPSG") {
		return CRS{}, fmt.Errorf("gis: CRS %q: want \"EPSG:<code>\" or empty for an undefined local frame", s)
	}
	n, err := strconv.Atoi(code)
	if err != nil || n <= 0 || n > maxEPSGCode {
		return CRS{}, fmt.Errorf("gis: CRS %q: EPSG code must be an integer in 1..%d", s, maxEPSGCode)
	}
	if geographicCodes[n] {
		return CRS{}, fmt.Errorf("gis: CRS %q is geographic (degrees); local coordinates in metres need a projected CRS such as a UTM zone", s)
	}
	return CRS{EPSG: n}, nil
}

// String returns "EPSG:<code>", or "" for the undefined frame.
func (c CRS) String() string {
	if c.EPSG == 0 {
		return ""
	}
	return "EPSG:" + strconv.Itoa(c.EPSG)
}

// Defined reports whether c names an EPSG CRS.
func (c CRS) Defined() bool { return c.EPSG != 0 }

// srsID returns the GeoPackage srs_id: the EPSG code, or −1 for the
// undefined Cartesian frame (GeoPackage 1.3, Req 11).
func (c CRS) srsID() int {
	if c.EPSG == 0 {
		return srsIDUndefinedCartesian
	}
	return c.EPSG
}

// utm describes a UTM zone of a supported family.
type utm struct {
	datum string    // "WGS 84" or "NAD83"
	el    Ellipsoid // ellipsoid of the datum
	zone  int       // 1..60
	south bool      // false northing 10 000 000 m
}

// utmZone returns the UTM zone c stands for, if it is a supported code.
func (c CRS) utmZone() (utm, bool) {
	switch {
	case c.EPSG >= epsgWGS84UTMNorth1 && c.EPSG <= epsgWGS84UTMNorth60:
		return utm{"WGS 84", WGS84, c.EPSG - epsgWGS84UTMNorth1 + 1, false}, true
	case c.EPSG >= epsgWGS84UTMSouth1 && c.EPSG <= epsgWGS84UTMSouth60:
		return utm{"WGS 84", WGS84, c.EPSG - epsgWGS84UTMSouth1 + 1, true}, true
	case c.EPSG >= epsgNAD83UTM1 && c.EPSG <= epsgNAD83UTM23:
		return utm{"NAD83", GRS80, c.EPSG - epsgNAD83UTM1 + 1, false}, true
	}
	return utm{}, false
}

// UTM projection constants (NGA.SIG.0012_2.0.0_UTMUPS, 2014, §2; the
// same parameters gdalsrsinfo -o wkt1 prints for every UTM CRS of the
// EPSG registry, GDAL 3.6.2): scale factor 0.9996 on the central
// meridian, false easting 500 000 m, false northing 0 (north) or
// 10 000 000 m (south), central meridian −183° + 6°·zone.
const (
	utmScale              = 0.9996
	utmFalseEasting       = 500000.0
	utmFalseNorthingSouth = 10000000.0
)

// centralMeridian returns the zone's central meridian, degrees.
func (z utm) centralMeridian() float64 { return -183 + 6*float64(z.zone) }

func (z utm) falseNorthing() float64 {
	if z.south {
		return utmFalseNorthingSouth
	}
	return 0
}

func (z utm) name() string {
	hemi := "N"
	if z.south {
		hemi = "S"
	}
	return fmt.Sprintf("%s / UTM zone %d%s", z.datum, z.zone, hemi)
}

// Projection returns the transverse Mercator projection of a supported UTM
// CRS. For other codes and for the undefined frame it returns an error
// wrapping ErrNoGeographic that names the code and the supported ranges.
func (c CRS) Projection() (*TransverseMercator, error) {
	if c.EPSG == 0 {
		return nil, fmt.Errorf("%w: the CRS is undefined (a local frame); set an EPSG code, one of %s", ErrNoGeographic, supportedRanges)
	}
	z, ok := c.utmZone()
	if !ok {
		return nil, fmt.Errorf("%w for %s: supported are %s", ErrNoGeographic, c, supportedRanges)
	}
	return NewTransverseMercator(z.el, z.centralMeridian(), utmScale, utmFalseEasting, z.falseNorthing()), nil
}

// Name returns the CRS name as in the EPSG registry for the supported
// families ("WGS 84 / UTM zone 14N"), "EPSG:<code>" for other codes and
// "undefined Cartesian" for the undefined frame.
func (c CRS) Name() string {
	if c.EPSG == 0 {
		return "undefined Cartesian"
	}
	if z, ok := c.utmZone(); ok {
		return z.name()
	}
	return c.String()
}

// Placement places the local East-North frame (m) in a CRS: local (x, y)
// is the CRS point (x + Easting, y + Northing). The local axes are assumed
// parallel to the CRS grid axes (no rotation, no scale).
type Placement struct {
	CRS CRS
	// Easting of local (0, 0) in the CRS, m.
	Easting float64
	// Northing of local (0, 0) in the CRS, m.
	Northing float64
}

// ToCRS returns the CRS coordinates of local point p, m.
func (pl Placement) ToCRS(p orb.Point) orb.Point {
	return orb.Point{p[0] + pl.Easting, p[1] + pl.Northing}
}

// Geographic returns the conversion of local points to WGS 84 longitude
// and latitude, or an error wrapping ErrNoGeographic when the CRS is not
// supported.
//
// NAD83 coordinates are returned unchanged as WGS 84 coordinates: the two
// datums differ by about 1–2 m in North America (NOAA NGS; from memory),
// which is below the resolution of a stimulated-area map but not of a
// survey. Use a WGS 84 UTM CRS where that matters.
func (pl Placement) Geographic() (*Geographic, error) {
	tm, err := pl.CRS.Projection()
	if err != nil {
		return nil, err
	}
	return &Geographic{placement: pl, tm: tm}, nil
}

// Geographic converts local East-North points to WGS 84 longitude and
// latitude.
type Geographic struct {
	placement Placement
	tm        *TransverseMercator
}

// LonLat returns [longitude, latitude] in degrees of local point p (m).
func (g *Geographic) LonLat(p orb.Point) orb.Point {
	q := g.placement.ToCRS(p)
	lon, lat := g.tm.Inverse(q[0], q[1])
	return orb.Point{lon, lat}
}
