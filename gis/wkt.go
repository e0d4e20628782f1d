package gis

import "strconv"

// The WKT1 texts below reproduce, character for character, the output of
// `gdalsrsinfo -o wkt1 --single-line EPSG:<code>` from GDAL 3.6.2 with
// PROJ 9.1.1 (Debian 12) for EPSG:4326, 32614, 32714, 26914 and the other
// zones; only the name, central meridian, false northing and final
// AUTHORITY change from zone to zone. TestWKTMatchesGDAL re-checks them
// against gdalsrsinfo when it is installed.
const (
	wktWGS84Geographic = `GEOGCS["WGS 84",DATUM["WGS_1984",SPHEROID["WGS 84",6378137,298.257223563,AUTHORITY["EPSG","7030"]],AUTHORITY["EPSG","6326"]],PRIMEM["Greenwich",0,AUTHORITY["EPSG","8901"]],UNIT["degree",0.0174532925199433,AUTHORITY["EPSG","9122"]],AXIS["Latitude",NORTH],AXIS["Longitude",EAST],AUTHORITY["EPSG","4326"]]`

	// Base geographic CRSs as nested in a PROJCS (no AXIS).
	wktWGS84Base = `GEOGCS["WGS 84",DATUM["WGS_1984",SPHEROID["WGS 84",6378137,298.257223563,AUTHORITY["EPSG","7030"]],AUTHORITY["EPSG","6326"]],PRIMEM["Greenwich",0,AUTHORITY["EPSG","8901"]],UNIT["degree",0.0174532925199433,AUTHORITY["EPSG","9122"]],AUTHORITY["EPSG","4326"]]`
	wktNAD83Base = `GEOGCS["NAD83",DATUM["North_American_Datum_1983",SPHEROID["GRS 1980",6378137,298.257222101,AUTHORITY["EPSG","7019"]],AUTHORITY["EPSG","6269"]],PRIMEM["Greenwich",0,AUTHORITY["EPSG","8901"]],UNIT["degree",0.0174532925199433,AUTHORITY["EPSG","9122"]],AUTHORITY["EPSG","4269"]]`

	// wktUndefined is GeoPackage's definition for an SRS without a WKT
	// (OGC 12-128r18, Req 11).
	wktUndefined = "undefined"
)

// wkt1 returns the WKT1 definition of c for gpkg_spatial_ref_sys, or
// "undefined" for codes outside the supported UTM families (GDAL then
// takes the CRS from organization and organization_coordsys_id).
func wkt1(c CRS) string {
	if c.EPSG == epsgWGS84Geographic {
		return wktWGS84Geographic
	}
	z, ok := c.utmZone()
	if !ok {
		return wktUndefined
	}
	base := wktWGS84Base
	if z.datum == "NAD83" {
		base = wktNAD83Base
	}
	return `PROJCS["` + z.name() + `",` + base +
		`,PROJECTION["Transverse_Mercator"],PARAMETER["latitude_of_origin",0]` +
		`,PARAMETER["central_meridian",` + strconv.Itoa(int(z.centralMeridian())) + `]` +
		`,PARAMETER["scale_factor",0.9996],PARAMETER["false_easting",500000]` +
		`,PARAMETER["false_northing",` + strconv.Itoa(int(z.falseNorthing())) + `]` +
		`,UNIT["metre",1,AUTHORITY["EPSG","9001"]],AXIS["Easting",EAST],AXIS["Northing",NORTH]` +
		`,AUTHORITY["EPSG","` + strconv.Itoa(c.EPSG) + `"]]`
}
