package gis

import (
	"fmt"
	"sort"
	"strconv"
	"strings"
)

//go:generate go run ./internal/epsggen -db /usr/share/proj/proj.db

// wgs84Tie says how a datum relates to WGS 84, which GeoJSON and QuakeML
// longitudes and latitudes are in.
type wgs84Tie int

const (
	// tieNone: no conversion to WGS 84 is implemented; longitude and
	// latitude output is refused.
	tieNone wgs84Tie = iota
	// tieExact: the datum is WGS 84.
	tieExact
	// tieMetre: the datum is a realization of NAD83, within about 1–2 m
	// of WGS 84 in North America (NOAA NGS; from memory); coordinates are
	// used as WGS 84 unchanged.
	tieMetre
	// tieHelmert: a WKT1 TOWGS84 element gives the shift to WGS 84.
	tieHelmert
)

// geodeticBase is the base geographic CRS of projected CRSs in the table,
// with the names GDAL writes in WKT1 (gdalsrsinfo -o wkt1, GDAL 3.6.2 with
// PROJ 9.1.1).
type geodeticBase struct {
	code          int    // EPSG code of the geographic 2-D CRS
	name          string // "NAD83"
	datumWKT1     string // "North_American_Datum_1983"
	datumCode     int
	ellipsoidName string
	ellipsoidCode int
	el            Ellipsoid
	tie           wgs84Tie
}

var (
	baseWGS84         = &geodeticBase{4326, "WGS 84", "WGS_1984", 6326, "WGS 84", 7030, WGS84, tieExact}
	baseNAD83         = &geodeticBase{4269, "NAD83", "North_American_Datum_1983", 6269, "GRS 1980", 7019, GRS80, tieMetre}
	baseNAD83HARN     = &geodeticBase{4152, "NAD83(HARN)", "NAD83_High_Accuracy_Reference_Network", 6152, "GRS 1980", 7019, GRS80, tieMetre}
	baseNAD83NSRS2007 = &geodeticBase{4759, "NAD83(NSRS2007)", "NAD83_National_Spatial_Reference_System_2007", 6759, "GRS 1980", 7019, GRS80, tieMetre}
	baseNAD83_2011    = &geodeticBase{6318, "NAD83(2011)", "NAD83_National_Spatial_Reference_System_2011", 1116, "GRS 1980", 7019, GRS80, tieMetre}
	baseNAD83CSRS     = &geodeticBase{4617, "NAD83(CSRS)", "NAD83_Canadian_Spatial_Reference_System", 6140, "GRS 1980", 7019, GRS80, tieMetre}
	baseNAD27         = &geodeticBase{4267, "NAD27", "North_American_Datum_1927", 6267, "Clarke 1866", 7008, Clarke1866, tieNone}
)

// nad27Refusal explains why NAD27 gets no longitude and latitude. The
// size of the shift was measured with PROJ 9.1.1's cs2cs EPSG:4267
// EPSG:4326 (without the NADCON grids, as installed here): 35 m at
// 39° N 100° W, 87 m at 37° N 120° W.
const nad27Refusal = "NAD27 differs from WGS 84 by tens of metres (about 90 m in California) and this package has no NAD27 datum shift; " +
	"write GeoPackage or GeoTIFF, which carry the NAD27 CRS for GIS software to transform, or use a NAD83 or WGS 84 CRS"

// wkt1 returns the base CRS as nested in a WKT1 PROJCS (no AXIS).
func (b *geodeticBase) wkt1() string {
	return `GEOGCS["` + b.name + `",DATUM["` + b.datumWKT1 + `",SPHEROID["` + b.ellipsoidName + `",` +
		wktNumber(b.el.SemiMajorAxis) + `,` + wktNumber(b.el.InverseFlattening) + `,AUTHORITY["EPSG","` + strconv.Itoa(b.ellipsoidCode) +
		`"]],AUTHORITY["EPSG","` + strconv.Itoa(b.datumCode) + `"]],PRIMEM["Greenwich",0,AUTHORITY["EPSG","8901"]],` +
		`UNIT["degree",0.0174532925199433,AUTHORITY["EPSG","9122"]],AUTHORITY["EPSG","` + strconv.Itoa(b.code) + `"]]`
}

// epsgCRS is one projected CRS of the EPSG dataset (epsg_table.go).
type epsgCRS struct {
	code   int
	name   string
	base   *geodeticBase
	unit   LinearUnit
	method Method
	// lat0, lon0: latitude and longitude of the natural (TM, LCC 1SP) or
	// false (LCC 2SP) origin; lat1, lat2: standard parallels (LCC 2SP);
	// degrees. k0: scale factor (1 for LCC 2SP).
	lat0, lon0, k0, lat1, lat2 float64
	// fe, fn: false easting and northing in the CRS unit.
	fe, fn float64
}

// lookupEPSG returns the table entry of a code.
func lookupEPSG(code int) (*epsgCRS, bool) {
	i := sort.Search(len(epsgTable), func(i int) bool { return epsgTable[i].code >= code })
	if i < len(epsgTable) && epsgTable[i].code == code {
		return &epsgTable[i], true
	}
	return nil, false
}

// definition returns the CRS definition of a table entry.
func (e *epsgCRS) definition() *crsDef {
	d := &crsDef{
		name: e.name, epsg: e.code, unit: e.unit, el: e.base.el, methodName: e.method.String(),
		conv: Conversion{Method: e.method, LatOrigin: e.lat0, LonOrigin: e.lon0, Scale: e.k0, StdParallel1: e.lat1, StdParallel2: e.lat2,
			FalseEasting: e.fe * e.unit.Metres, FalseNorthing: e.fn * e.unit.Metres},
		geogName: e.base.name, geogEPSG: e.base.code, datumName: e.base.datumWKT1, datumEPSG: e.base.datumCode, tie: e.base.tie,
	}
	if e.base == baseNAD27 {
		d.tieNote = nad27Refusal
	}
	return d
}

// wkt1 returns the entry as GDAL writes it in WKT1 (gdalsrsinfo -o wkt1
// --single-line; TestWKTMatchesGDAL checks a sample of codes).
func (e *epsgCRS) wkt1() string {
	var b strings.Builder
	b.WriteString(`PROJCS["` + e.name + `",` + e.base.wkt1() + `,PROJECTION["`)
	param := func(name string, v float64) { b.WriteString(`,PARAMETER["` + name + `",` + wktNumber(v) + `]`) }
	switch e.method {
	case MethodTransverseMercator:
		b.WriteString(`Transverse_Mercator"]`)
	case MethodLambertConic1SP:
		b.WriteString(`Lambert_Conformal_Conic_1SP"]`)
	case MethodLambertConic2SP:
		b.WriteString(`Lambert_Conformal_Conic_2SP"]`)
	}
	param("latitude_of_origin", e.lat0)
	param("central_meridian", e.lon0)
	if e.method == MethodLambertConic2SP {
		param("standard_parallel_1", e.lat1)
		param("standard_parallel_2", e.lat2)
	} else {
		param("scale_factor", e.k0)
	}
	param("false_easting", e.fe)
	param("false_northing", e.fn)
	b.WriteString(`,UNIT["` + e.unit.Name + `",` + wktNumber(e.unit.Metres) + `,AUTHORITY["EPSG","` + strconv.Itoa(e.unit.EPSG) + `"]]`)
	b.WriteString(`,AXIS["Easting",EAST],AXIS["Northing",NORTH],AUTHORITY["EPSG","` + strconv.Itoa(e.code) + `"]]`)
	return b.String()
}

// wktNumber formats v with 15 significant digits and no trailing zeros,
// as GDAL writes WKT numbers.
func wktNumber(v float64) string {
	return strconv.FormatFloat(v, 'g', 15, 64)
}

// SupportedCRSs describes the EPSG codes ParseCRS accepts, for messages.
func SupportedCRSs() string { return supportedCRSs }

// supportedCRSs describes the codes ParseCRS accepts, for messages.
// TestSupportedCRSsMessage checks every range it names against the table.
var supportedCRSs = fmt.Sprintf("EPSG:32601–32660 and 32701–32760 (WGS 84 / UTM), 26901–26923 (NAD83 / UTM), 26701–26722 (NAD27 / UTM), "+
	"the US State Plane zones on NAD83 (26929–26998 and 32100–32161 in metres, 2222–2289 in feet and US survey feet; "+
	"not 26931, Alaska zone 1, an oblique Mercator), on NAD83(HARN), NAD83(NSRS2007) and NAD83(2011), and on NAD27 (32001–32058 in US survey feet), "+
	"and every other transverse Mercator and Lambert conic conformal CRS of the EPSG dataset on these datums and NAD83(CSRS): "+
	"%d codes from the %s; any other projected CRS can be given as a WKT file", len(epsgTable), epsgSource)
