package gis

import (
	"errors"
	"fmt"
	"strings"
)

// GeoKeys (OGC 19-008r4, §7.3 and annex C; the numbers are those of
// GeoTIFF 1.0, Ritter & Ruth 1995, §6.2, which 1.1 keeps).
const (
	keyGTModelType           = 1024
	keyGTRasterType          = 1025
	keyGTCitation            = 1026
	keyGeographicType        = 2048
	keyGeogCitation          = 2049
	keyGeogGeodeticDatum     = 2050
	keyGeogAngularUnits      = 2054
	keyGeogEllipsoid         = 2056
	keyGeogSemiMajorAxis     = 2057
	keyGeogSemiMinorAxis     = 2058
	keyGeogInvFlattening     = 2059
	keyProjectedCSType       = 3072
	keyProjection            = 3074
	keyProjCoordTrans        = 3075
	keyProjLinearUnits       = 3076
	keyProjLinearUnitSize    = 3077
	keyProjStdParallel1      = 3078
	keyProjStdParallel2      = 3079
	keyProjNatOriginLong     = 3080
	keyProjNatOriginLat      = 3081
	keyProjFalseEasting      = 3082
	keyProjFalseNorthing     = 3083
	keyProjFalseOriginLong   = 3084
	keyProjFalseOriginLat    = 3085
	keyProjFalseOriginEast   = 3086
	keyProjFalseOriginNorth  = 3087
	keyProjScaleAtNatOrigin  = 3092
	modelTypeProjected       = 1
	rasterPixelIsArea        = 1
	userDefined              = 32767
	angularUnitDegree        = 9102 // EPSG unit of measure "degree"
	geoKeyDirVersion         = 1
	geoKeyRevision           = 1
	geoKeyMinorRevision1     = 1 // 1 declares GeoTIFF 1.1 (OGC 19-008r4; from memory)
	ctTransverseMercator     = 1 // coordinate transformation codes (GeoTIFF 1.0 §6.3.3.3)
	ctLambertConfConic2SP    = 8
	ctLambertConfConic1SP    = 9
	geoASCIITerminator       = "|" // ends each string in GeoASCIIParams (GeoTIFF 1.0 §2.4)
	tiffLocationGeoKeyDir    = 0   // value stored in the key entry itself
	tiffLocationGeoDoubles   = tagGeoDoubleParams
	tiffLocationGeoASCII     = tagGeoASCIIParams
	maxProjectedCSTypeCode   = userDefined - 1
	maxGeoTIFFCitationLength = 4096 // keeps offsets in 16 bits; the citation is for people; common practice, no source
)

// geoKeyDirectory is the GeoKeyDirectory with the values it points to.
type geoKeyDirectory struct {
	keys    []uint16  // header {version, revision, minor, count}, then {id, location, count, value} sorted by id
	doubles []float64 // GeoDoubleParams
	ascii   string    // GeoASCIIParams, strings ended by '|'
}

// geoKeyWriter collects keys in any order.
type geoKeyWriter struct {
	entries [][4]uint16
	gk      geoKeyDirectory
}

func (w *geoKeyWriter) short(id, v uint16) {
	w.entries = append(w.entries, [4]uint16{id, tiffLocationGeoKeyDir, 1, v})
}

func (w *geoKeyWriter) double(id uint16, v float64) {
	w.entries = append(w.entries, [4]uint16{id, tiffLocationGeoDoubles, 1, uint16(len(w.gk.doubles))})
	w.gk.doubles = append(w.gk.doubles, v)
}

func (w *geoKeyWriter) text(id uint16, s string) {
	s = strings.ReplaceAll(s, geoASCIITerminator, "/") + geoASCIITerminator
	w.entries = append(w.entries, [4]uint16{id, tiffLocationGeoASCII, uint16(len(s)), uint16(len(w.gk.ascii))})
	w.gk.ascii += s
}

// directory sorts the keys by id (OGC 19-008r4, §7.1) and adds the header.
func (w *geoKeyWriter) directory() geoKeyDirectory {
	for i := 1; i < len(w.entries); i++ { // insertion sort: a dozen keys
		for j := i; j > 0 && w.entries[j][0] < w.entries[j-1][0]; j-- {
			w.entries[j], w.entries[j-1] = w.entries[j-1], w.entries[j]
		}
	}
	w.gk.keys = []uint16{geoKeyDirVersion, geoKeyRevision, geoKeyMinorRevision1, uint16(len(w.entries))}
	for _, e := range w.entries {
		w.gk.keys = append(w.gk.keys, e[:]...)
	}
	return w.gk
}

// geoKeys returns the GeoKeys of a CRS definition (nil: the undefined
// frame, a user-defined CRS in metres with no projection).
func geoKeys(d *crsDef) (geoKeyDirectory, error) {
	var w geoKeyWriter
	w.short(keyGTModelType, modelTypeProjected)
	w.short(keyGTRasterType, rasterPixelIsArea)
	switch {
	case d == nil:
		w.short(keyProjectedCSType, userDefined)
		w.short(keyProjLinearUnits, uint16(Metre.EPSG))
	case d.epsg > maxProjectedCSTypeCode:
		return geoKeyDirectory{}, fmt.Errorf("EPSG code %d does not fit ProjectedCSTypeGeoKey (codes up to %d)", d.epsg, maxProjectedCSTypeCode)
	case d.epsg != 0:
		w.short(keyProjectedCSType, uint16(d.epsg))
	default:
		if err := userDefinedKeys(&w, d); err != nil {
			return geoKeyDirectory{}, err
		}
	}
	return w.directory(), nil
}

// userDefinedKeys writes a projected CRS that has no EPSG code: the
// geographic base by code when it has one (else datum and ellipsoid), the
// projection by its coordinate transformation code and parameters in
// degrees and the linear unit (GeoTIFF 1.0 §2.5.3.3, "user-defined
// projections"; the keys each method takes follow the GeoTIFF 1.0
// projection parameter table, as libgeotiff reads them).
func userDefinedKeys(w *geoKeyWriter, d *crsDef) error {
	switch {
	case d.conv.Method == 0:
		return fmt.Errorf("its projection method %q has no GeoTIFF encoding here and the WKT has no EPSG identifier; write a GeoPackage, or give a WKT with an EPSG ID", d.methodName)
	case d.primeMeridian != 0:
		return errors.New("its prime meridian is not Greenwich; write a GeoPackage, or give a WKT with an EPSG ID")
	}
	w.text(keyGTCitation, truncate(d.name, maxGeoTIFFCitationLength))
	if d.geogEPSG != 0 && d.geogEPSG < userDefined {
		w.short(keyGeographicType, uint16(d.geogEPSG))
	} else {
		w.short(keyGeographicType, userDefined)
		w.text(keyGeogCitation, truncate(d.geogName, maxGeoTIFFCitationLength))
		datum := uint16(userDefined)
		if d.datumEPSG != 0 && d.datumEPSG < userDefined {
			datum = uint16(d.datumEPSG)
		}
		w.short(keyGeogGeodeticDatum, datum)
		w.short(keyGeogAngularUnits, angularUnitDegree)
		w.short(keyGeogEllipsoid, userDefined)
		w.double(keyGeogSemiMajorAxis, d.el.SemiMajorAxis)
		if f := d.el.flattening(); f == 0 {
			w.double(keyGeogSemiMinorAxis, d.el.SemiMajorAxis)
		} else {
			w.double(keyGeogInvFlattening, d.el.InverseFlattening)
		}
	}
	w.short(keyProjectedCSType, userDefined)
	w.short(keyProjection, userDefined)
	if d.unit.EPSG != 0 {
		w.short(keyProjLinearUnits, uint16(d.unit.EPSG))
	} else {
		w.short(keyProjLinearUnits, userDefined)
		w.double(keyProjLinearUnitSize, d.unit.Metres)
	}
	cv, u := d.conv, d.unit.Metres
	switch cv.Method {
	case MethodLambertConic2SP:
		w.short(keyProjCoordTrans, ctLambertConfConic2SP)
		w.double(keyProjStdParallel1, cv.StdParallel1)
		w.double(keyProjStdParallel2, cv.StdParallel2)
		w.double(keyProjFalseOriginLong, cv.LonOrigin)
		w.double(keyProjFalseOriginLat, cv.LatOrigin)
		w.double(keyProjFalseOriginEast, cv.FalseEasting/u)
		w.double(keyProjFalseOriginNorth, cv.FalseNorthing/u)
	default:
		ct := uint16(ctTransverseMercator)
		if cv.Method == MethodLambertConic1SP {
			ct = ctLambertConfConic1SP
		}
		w.short(keyProjCoordTrans, ct)
		w.double(keyProjNatOriginLong, cv.LonOrigin)
		w.double(keyProjNatOriginLat, cv.LatOrigin)
		w.double(keyProjFalseEasting, cv.FalseEasting/u)
		w.double(keyProjFalseNorthing, cv.FalseNorthing/u)
		w.double(keyProjScaleAtNatOrigin, cv.Scale)
	}
	return nil
}

// truncate cuts s to at most n bytes at a character boundary.
func truncate(s string, n int) string {
	if len(s) <= n {
		return s
	}
	for n > 0 && (s[n]&0xC0) == 0x80 {
		n--
	}
	return s[:n]
}
