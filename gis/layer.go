package gis

import (
	"fmt"
	"math"
	"strings"
	"time"

	"github.com/paulmach/orb"
)

// GeometryType is the geometry type of every feature of a layer.
type GeometryType int

// Geometry types, with the orb type each feature must have.
const (
	Point        GeometryType = iota + 1 // orb.Point
	LineString                           // orb.LineString
	Polygon                              // orb.Polygon
	MultiPolygon                         // orb.MultiPolygon
)

// String returns the upper-case OGC name ("LINESTRING"), as GeoPackage's
// gpkg_geometry_columns requires (OGC 12-128r18, Req 31 and Annex G).
func (g GeometryType) String() string {
	switch g {
	case Point:
		return "POINT"
	case LineString:
		return "LINESTRING"
	case Polygon:
		return "POLYGON"
	case MultiPolygon:
		return "MULTIPOLYGON"
	}
	return fmt.Sprintf("GeometryType(%d)", int(g))
}

// accepts reports whether geom has the orb type of g.
func (g GeometryType) accepts(geom orb.Geometry) bool {
	switch geom.(type) {
	case orb.Point:
		return g == Point
	case orb.LineString:
		return g == LineString
	case orb.Polygon:
		return g == Polygon
	case orb.MultiPolygon:
		return g == MultiPolygon
	}
	return false
}

// FieldType is the type of an attribute column.
type FieldType int

// Field types and the Go type of their values (nil is always allowed and
// means NULL / JSON null).
const (
	Integer  FieldType = iota + 1 // int64 (int, int32 accepted); GeoPackage INTEGER
	Int32                         // int32 (int, int64 in range accepted); GeoPackage MEDIUMINT
	Real                          // float64 (float32 accepted; NaN → NULL); GeoPackage REAL
	Text                          // string; GeoPackage TEXT
	Boolean                       // bool; GeoPackage BOOLEAN
	DateTime                      // time.Time, written in UTC; GeoPackage DATETIME
)

// sqlType returns the GeoPackage column type (OGC 12-128r18, table 1).
// MEDIUMINT makes GDAL show a 32-bit Integer instead of Integer64.
func (f FieldType) sqlType() string {
	switch f {
	case Integer:
		return "INTEGER"
	case Int32:
		return "MEDIUMINT"
	case Real:
		return "REAL"
	case Text:
		return "TEXT"
	case Boolean:
		return "BOOLEAN"
	case DateTime:
		return "DATETIME"
	}
	panic(fmt.Sprintf("gis: invalid FieldType %d", int(f)))
}

// String returns the name of the field type.
func (f FieldType) String() string {
	switch f {
	case Integer:
		return "integer"
	case Int32:
		return "int32"
	case Real:
		return "real"
	case Text:
		return "text"
	case Boolean:
		return "boolean"
	case DateTime:
		return "datetime"
	}
	return fmt.Sprintf("FieldType(%d)", int(f))
}

// Field is an attribute column.
type Field struct {
	Name string
	Type FieldType
}

// Feature is one geometry with its attribute values.
type Feature struct {
	// Geometry in local East-North coordinates, m; nil for none. Polygon
	// rings must be closed (first point equal to the last) with at least
	// four points; their winding is normalised on output.
	Geometry orb.Geometry
	// Values, one per layer field, in field order.
	Values []any
}

// Layer is a named collection of features of one geometry type.
type Layer struct {
	// Name is the table / collection name: ASCII letters, digits and
	// underscores, starting with a letter, at most maxNameLen characters.
	Name        string
	Description string
	Geometry    GeometryType
	Fields      []Field
	Features    []Feature
}

// maxNameLen is the longest accepted layer or field name; common practice,
// no source (short names survive every GIS and shapefile-free workflow).
const maxNameLen = 63

// reservedColumns are the column names the GeoPackage writer uses itself.
var reservedColumns = map[string]bool{"fid": true, "geom": true}

// reservedPrefixes of table names belong to GeoPackage, SQLite and the
// R-tree extension (OGC 12-128r18, Req 13 and §2.1.3.1.1; SQLite docs).
var reservedPrefixes = []string{"gpkg_", "sqlite_", "rtree_"}

// validName reports whether s is an identifier [A-Za-z][A-Za-z0-9_]*.
func validName(s string) bool {
	if s == "" || len(s) > maxNameLen {
		return false
	}
	for i, r := range s {
		switch {
		case r >= 'a' && r <= 'z', r >= 'A' && r <= 'Z':
		case i > 0 && (r >= '0' && r <= '9' || r == '_'):
		default:
			return false
		}
	}
	return true
}

// validate checks the layer's name, fields and features.
func (l *Layer) validate() error {
	if !validName(l.Name) {
		return fmt.Errorf("gis: layer name %q: want a letter followed by letters, digits or underscores, at most %d characters", l.Name, maxNameLen)
	}
	lower := strings.ToLower(l.Name)
	for _, p := range reservedPrefixes {
		if strings.HasPrefix(lower, p) {
			return fmt.Errorf("gis: layer name %q: the prefix %q is reserved", l.Name, p)
		}
	}
	if l.Geometry < Point || l.Geometry > MultiPolygon {
		return fmt.Errorf("gis: layer %q: invalid geometry type %d", l.Name, int(l.Geometry))
	}
	seen := map[string]bool{}
	for _, f := range l.Fields {
		key := strings.ToLower(f.Name)
		switch {
		case !validName(f.Name):
			return fmt.Errorf("gis: layer %q: field name %q: want a letter followed by letters, digits or underscores, at most %d characters", l.Name, f.Name, maxNameLen)
		case reservedColumns[key]:
			return fmt.Errorf("gis: layer %q: field name %q is reserved", l.Name, f.Name)
		case seen[key]:
			return fmt.Errorf("gis: layer %q: field name %q is repeated (names are case-insensitive)", l.Name, f.Name)
		case f.Type < Integer || f.Type > DateTime:
			return fmt.Errorf("gis: layer %q: field %q: invalid field type %d", l.Name, f.Name, int(f.Type))
		}
		seen[key] = true
	}
	for i, ft := range l.Features {
		if err := l.validateFeature(ft); err != nil {
			return fmt.Errorf("gis: layer %q: feature %d: %w", l.Name, i, err)
		}
	}
	return nil
}

func (l *Layer) validateFeature(ft Feature) error {
	if len(ft.Values) != len(l.Fields) {
		return fmt.Errorf("%d values for %d fields", len(ft.Values), len(l.Fields))
	}
	for j, v := range ft.Values {
		if _, err := normalizeValue(l.Fields[j].Type, v); err != nil {
			return fmt.Errorf("field %q: %w", l.Fields[j].Name, err)
		}
	}
	if ft.Geometry == nil {
		return nil
	}
	if !l.Geometry.accepts(ft.Geometry) {
		return fmt.Errorf("geometry is %T, the layer holds %v", ft.Geometry, l.Geometry)
	}
	return validateGeometry(ft.Geometry)
}

// validateGeometry checks finite coordinates, line lengths and closed rings.
func validateGeometry(g orb.Geometry) error {
	switch g := g.(type) {
	case orb.Point:
		return finitePoints([]orb.Point{g})
	case orb.LineString:
		if len(g) < 2 {
			return fmt.Errorf("line string has %d points, want at least 2", len(g))
		}
		return finitePoints(g)
	case orb.Polygon:
		return validatePolygon(g)
	case orb.MultiPolygon:
		for _, p := range g {
			if err := validatePolygon(p); err != nil {
				return err
			}
		}
	}
	return nil
}

func validatePolygon(p orb.Polygon) error {
	if len(p) == 0 {
		return fmt.Errorf("polygon has no rings")
	}
	for i, r := range p {
		if len(r) < 4 {
			return fmt.Errorf("ring %d has %d points, want at least 4", i, len(r))
		}
		if r[0] != r[len(r)-1] {
			return fmt.Errorf("ring %d is not closed: first point %v, last %v", i, r[0], r[len(r)-1])
		}
		if err := finitePoints(r); err != nil {
			return err
		}
	}
	return nil
}

func finitePoints(ps []orb.Point) error {
	for _, p := range ps {
		if math.IsNaN(p[0]) || math.IsInf(p[0], 0) || math.IsNaN(p[1]) || math.IsInf(p[1], 0) {
			return fmt.Errorf("coordinate %v is not finite", p)
		}
	}
	return nil
}

// normalizeValue converts v to the canonical Go type of field type t:
// int64, float64, string, bool or time.Time (UTC); nil stays nil, and a
// NaN real becomes nil.
func normalizeValue(t FieldType, v any) (any, error) {
	if v == nil {
		return nil, nil
	}
	switch t {
	case Integer:
		switch x := v.(type) {
		case int64:
			return x, nil
		case int:
			return int64(x), nil
		case int32:
			return int64(x), nil
		}
	case Int32:
		switch x := v.(type) {
		case int32:
			return int64(x), nil
		case int:
			if x < math.MinInt32 || x > math.MaxInt32 {
				return nil, fmt.Errorf("value %d outside the int32 range", x)
			}
			return int64(x), nil
		case int64:
			if x < math.MinInt32 || x > math.MaxInt32 {
				return nil, fmt.Errorf("value %d outside the int32 range", x)
			}
			return x, nil
		}
	case Real:
		var f float64
		switch x := v.(type) {
		case float64:
			f = x
		case float32:
			f = float64(x)
		default:
			return nil, fmt.Errorf("value %v (%T) is not a real", v, v)
		}
		if math.IsNaN(f) {
			return nil, nil
		}
		if math.IsInf(f, 0) {
			return nil, fmt.Errorf("value %v is not finite", f)
		}
		return f, nil
	case Text:
		if s, ok := v.(string); ok {
			return s, nil
		}
	case Boolean:
		if b, ok := v.(bool); ok {
			return b, nil
		}
	case DateTime:
		if tm, ok := v.(time.Time); ok {
			return tm.UTC(), nil
		}
	}
	return nil, fmt.Errorf("value %v (%T) does not fit a %v field", v, v, t)
}

// validateLayers validates each layer and checks that names are unique.
func validateLayers(layers []Layer) error {
	seen := map[string]bool{}
	for i := range layers {
		if err := layers[i].validate(); err != nil {
			return err
		}
		key := strings.ToLower(layers[i].Name)
		if seen[key] {
			return fmt.Errorf("gis: layer name %q is repeated (names are case-insensitive)", layers[i].Name)
		}
		seen[key] = true
	}
	return nil
}
