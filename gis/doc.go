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
// Local coordinates, cell sizes, eastings, northings and depths are in
// metres; longitudes and latitudes in degrees (WGS 84); times in seconds
// after a UTC start time; areas in square metres.
//
// # Conventions
//
// Local coordinates are East-North metres. A Placement maps local (x, y)
// to CRS (x + Easting, y + Northing); the local axes are parallel to the
// CRS grid (no rotation, no scale). The zero CRS is an undefined local
// Cartesian frame: GeoPackage writes srs_id −1, GeoTIFF a user-defined
// projected CRS in metres, and GeoJSON and QuakeML, which need longitude
// and latitude, refuse it.
//
// Longitude and latitude come from a pure-Go transverse Mercator (Krüger
// series to order n⁶, Karney 2011) for WGS 84 / UTM (EPSG:32601–32660
// north, 32701–32760 south) and NAD83 / UTM (EPSG:26901–26923, on the
// GRS80 ellipsoid). NAD83 latitudes and longitudes are reported as WGS 84:
// the datums differ by about 1–2 m in North America (from memory), which
// this package ignores. Other EPSG codes are still written by code into
// GeoPackage (organization EPSG, definition "undefined") and GeoTIFF
// (ProjectedCSTypeGeoKey), which GIS software resolves itself.
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
// (local East and North plus the Placement's offsets, m) and z is the
// elevation relative to the depth datum, m, positive up (z = −depth), so
// that a 3-D viewer shows depth downwards without flipping an axis.
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
// Krüger, L. (1912), Konforme Abbildung des Erdellipsoids in der Ebene,
// Royal Prussian Geodetic Institute, New Series 52, doi:10.2312/GFZ.b103-krueger28.
//
// NGA (2014), The Universal Grids and the Transverse Mercator and Polar
// Stereographic Map Projections, NGA.SIG.0012_2.0.0_UTMUPS.
//
// OGC (2021), OGC GeoPackage Encoding Standard, version 1.3.1, OGC 12-128r18.
//
// OGC (2019), OGC GeoTIFF Standard, version 1.1, OGC 19-008r4.
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
