// Package gis places local map-view results on the Earth and writes them
// in open GIS formats: GeoPackage, GeoJSON, GeoTIFF and QuakeML, and 3-D
// fracture outlines and events as VTK XML PolyData for 3-D viewers.
//
// The package knows nothing of the physics: it takes generic vector
// layers (Layer: named fields and features with orb geometries), rasters
// (Raster on a Grid) and point events (Catalog), all in the local
// East-North frame, and a Placement that puts that frame in a projected
// CRS. Outline and ContourLayer turn cell masks and value grids into
// polygons. VTKPolygons and VTKPoints carry 3-D outlines (DiscRing,
// RectangleRing) and points with named float fields.
//
// # Units
//
// Local coordinates, cell sizes, the Placement origin and depths are in
// metres; map coordinates (GeoPackage geometries, GeoTIFF tiepoint and
// pixel size) are in the CRS's own unit: metre, foot (0.3048 m) or US
// survey foot (1200/3937 m), or the unit a WKT text gives. Longitudes and
// latitudes are in degrees (WGS 84); times in seconds after a UTC start
// time; areas in square metres.
//
// # Conventions
//
// Local coordinates are East-North metres. A Placement maps local (x, y)
// to the CRS point ((x + Easting)/u, (y + Northing)/u), u the CRS unit in
// metres: the local axes are parallel to the CRS grid (local north is
// grid north) and a local metre is a grid metre (no rotation, no scale
// factor). The zero CRS is an undefined local Cartesian frame: GeoPackage
// writes srs_id −1, GeoTIFF a user-defined projected CRS in metres, and
// GeoJSON and QuakeML, which need longitude and latitude, refuse it.
//
// A CRS is an EPSG code of a table generated from PROJ's database
// (epsg_table.go, by internal/epsggen; ParseCRS lists what it holds):
// every transverse Mercator and Lambert conic conformal projected CRS on
// WGS 84, NAD83 and its realizations, and NAD27, which covers UTM and the
// US State Plane zones in metres, feet and US survey feet. Any other
// projected CRS can be read from WKT (ParseWKT: WKT1 or WKT2); its unit
// is taken from the text, and it is written back as given.
//
// Longitude and latitude come from pure-Go projections: transverse
// Mercator by Krüger's series to order n⁶ (Karney 2011), Lambert conic
// conformal in closed form (IOGP Guidance Note 7-2); both match PROJ's
// cs2cs to well under a millimetre. WGS 84 CRSs are exact. NAD83 and its
// realizations are written as WGS 84 unchanged: the datums differ by
// about 1–2 m in North America (from memory; PROJ gives 1 m in Texas).
// NAD27 is refused for longitude and latitude: it differs by tens of
// metres and no datum shift is implemented (GeoPackage and GeoTIFF carry
// the NAD27 CRS exactly). A WKT CRS gets longitude and latitude when its
// datum is one of these or has a WKT1 TOWGS84 shift, which is applied.
//
// Grids are indexed from the SOUTH-west: cell (i, j) is column i from the
// west and row j from the south, value index j·Cols + i. GeoTIFF stores
// the north row first; WriteGeoTIFF flips the rows.
//
// Polygons are written with counter-clockwise exteriors and clockwise
// holes (RFC 7946 §3.1.6), whatever the input winding. Empty geometries
// are written as no geometry (GeoPackage NULL, GeoJSON null).
//
// VTK files (.vtp) are 3-D: x and y are the CRS easting and northing
// (local East and North plus the Placement's offsets, in the CRS's
// linear unit) and z is the elevation relative to the depth datum,
// positive up (z = −depth), in the same unit, so that a 3-D viewer shows
// depth downwards without flipping an axis and without exaggeration.
// Polygons carry their fields as cell data, points as point data, in
// binary (base64) little-endian doubles so that values round-trip exactly.
// The local axes are assumed parallel to the CRS grid, as for the maps.
//
// GeoPackage needs a file path (SQLite works on files): WriteGeoPackage
// refuses an existing path, and callers write to a temporary name and
// rename. The other writers take an io.Writer.
//
// # References
//
// Karney, C.F.F. (2011), Transverse Mercator with an accuracy of a few
// nanometers, Journal of Geodesy 85, 475–485, doi:10.1007/s00190-011-0445-3.
//
// IOGP (2019), Geomatics Guidance Note 7-2: Coordinate Conversions and
// Transformations including Formulas, IOGP Publication 373-7-2 (Lambert
// Conic Conformal 1SP and 2SP, Transverse Mercator, geocentric
// conversions, Helmert position vector transformation).
//
// ISO 19162:2019 (= OGC 18-010r7), Geographic information — Well-known
// text representation of coordinate reference systems (WKT2).
//
// OGC (2001), OpenGIS Coordinate Transformation Services, OGC 01-009,
// §7 (WKT1).
//
// NIST (2008), Guide for the Use of the International System of Units,
// Special Publication 811, Appendix B (the US survey foot).
//
// Krüger, L. (1912), Konforme Abbildung des Erdellipsoids in der Ebene,
// Royal Prussian Geodetic Institute, New Series 52, doi:10.2312/GFZ.b103-krueger28.
//
// NGA (2014), The Universal Grids and the Transverse Mercator and Polar
// Stereographic Map Projections, NGA.SIG.0012_2.0.0_UTMUPS.
//
// OGC (2021), OGC GeoPackage Encoding Standard, version 1.3.1, OGC 12-128r18.
//
// OGC (2019), OGC GeoTIFF Standard, version 1.1, OGC 19-008r4; Ritter, N.
// & Ruth, M. (1995), GeoTIFF Format Specification, revision 1.0 (GeoKey
// and coordinate transformation codes).
//
// Adobe (1992), TIFF Revision 6.0.
//
// Butler, H., Daly, M., Doyle, A., Gillies, S., Hagen, S. & Schaub, T.
// (2016), The GeoJSON Format, IETF RFC 7946, doi:10.17487/RFC7946.
//
// Kitware (2010), The VTK User's Guide, 11th ed., chapter "VTK File
// Formats", XML formats: PolyData and Collection (edition and year from
// memory); the same layout is kept in the VTK file-format documentation
// at docs.vtk.org.
//
// Schorlemmer, D., Euchner, F., Kästli, P. & Saul, J. (2011), QuakeML: status
// of the XML-based seismological data exchange format, Annals of Geophysics
// 54(1), 59–65, doi:10.4401/ag-4874 (from memory); the QuakeML 1.2 schemas
// are published at quakeml.org.
package gis
