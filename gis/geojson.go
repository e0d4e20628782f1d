package gis

import (
	"bufio"
	"encoding/json"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"time"

	"github.com/paulmach/orb"
)

// Default and limits of the GeoJSON coordinate precision, decimals of a
// degree. 7 decimals are about 1 cm on the ground (1e-7° × 111 km/°), as
// GDAL's RFC7946=YES writer uses by default (COORDINATE_PRECISION, GDAL 3.6).
const (
	DefaultGeoJSONPrecision = 7
	maxGeoJSONPrecision     = 12 // 1e-12° ≈ 0.1 µm, beyond any use
)

// GeoJSONOptions adjusts WriteGeoJSON. The zero value is ready.
type GeoJSONOptions struct {
	// Precision is the number of decimals of a degree, 1..12; 0 means
	// DefaultGeoJSONPrecision.
	Precision int
	// BBox adds a bbox member to the collection and to every feature.
	BBox bool
}

// WriteGeoJSON writes layer l as one RFC 7946 FeatureCollection in WGS 84
// longitude and latitude (degrees), converting local coordinates through
// pl. It returns an error wrapping ErrNoGeographic when pl's CRS cannot
// be converted (see CRS.Projection).
//
// Following RFC 7946: no "crs" member (§4), positions are [longitude,
// latitude] (§3.1.1), polygon exteriors are counter-clockwise and holes
// clockwise (§3.1.6). The collection carries the layer name as a "name"
// foreign member (§6.1), as GDAL does. Field values become properties:
// DATETIME as RFC 3339 strings in UTC, NULL and NaN as null. A nil or
// empty geometry is written as "geometry": null (§3.2).
//
// Geometries are not split at the antimeridian (§3.1.9); a map area that
// crosses ±180° longitude gives coordinates that jump by 360°.
func WriteGeoJSON(w io.Writer, pl Placement, l Layer, opt *GeoJSONOptions) error {
	prec := DefaultGeoJSONPrecision
	var o GeoJSONOptions
	if opt != nil {
		o = *opt
	}
	if o.Precision != 0 {
		if o.Precision < 1 || o.Precision > maxGeoJSONPrecision {
			return fmt.Errorf("gis: GeoJSON precision %d: must be 1..%d decimals of a degree", o.Precision, maxGeoJSONPrecision)
		}
		prec = o.Precision
	}
	if err := validateLayers([]Layer{l}); err != nil {
		return err
	}
	geo, err := pl.Geographic()
	if err != nil {
		return fmt.Errorf("gis: GeoJSON layer %q: %w", l.Name, err)
	}
	geoms := make([]orb.Geometry, len(l.Features))
	var all orb.Bound
	hasAll := false
	for i, ft := range l.Features {
		if ft.Geometry == nil || isEmpty(ft.Geometry) {
			continue
		}
		geoms[i] = mapGeometry(ft.Geometry, geo.LonLat)
		b, _ := bounds(geoms[i])
		if hasAll {
			all = all.Union(b)
		} else {
			all, hasAll = b, true
		}
	}
	gw := geojsonWriter{w: bufio.NewWriter(w), prec: prec}
	gw.str(`{"type":"FeatureCollection","name":`)
	gw.json(l.Name)
	if o.BBox && hasAll {
		gw.str(`,"bbox":`)
		gw.bbox(all)
	}
	gw.str(`,"features":[`)
	for i, ft := range l.Features {
		if i > 0 {
			gw.str(",")
		}
		gw.str("\n")
		gw.feature(l.Fields, ft.Values, geoms[i], o.BBox)
	}
	gw.str("\n]}\n")
	if gw.err != nil {
		return gw.err
	}
	return gw.w.Flush()
}

// geojsonWriter writes GeoJSON text with a sticky error.
type geojsonWriter struct {
	w    *bufio.Writer
	prec int // decimals of a degree
	buf  []byte
	err  error
}

func (g *geojsonWriter) str(s string) {
	if g.err == nil {
		_, g.err = g.w.WriteString(s)
	}
}

func (g *geojsonWriter) json(v any) {
	b, err := json.Marshal(v)
	if err != nil {
		panic("gis: marshalling a normalised value: " + err.Error())
	}
	if g.err == nil {
		_, g.err = g.w.Write(b)
	}
}

// num writes v with at most prec decimals and no trailing zeros.
func (g *geojsonWriter) num(v float64) {
	g.buf = strconv.AppendFloat(g.buf[:0], v, 'f', g.prec, 64)
	s := strings.TrimRight(string(g.buf), "0")
	s = strings.TrimSuffix(s, ".")
	if s == "-0" {
		s = "0"
	}
	g.str(s)
}

func (g *geojsonWriter) feature(fields []Field, values []any, geom orb.Geometry, withBBox bool) {
	g.str(`{"type":"Feature","properties":{`)
	for j, f := range fields {
		if j > 0 {
			g.str(",")
		}
		g.json(f.Name)
		g.str(":")
		v, err := normalizeValue(f.Type, values[j])
		if err != nil {
			panic("gis: value changed after validation: " + err.Error())
		}
		if t, ok := v.(time.Time); ok {
			v = t.Format(time.RFC3339Nano)
		}
		g.json(v)
	}
	g.str(`},"geometry":`)
	if geom == nil {
		g.str("null}")
		return
	}
	g.geometry(geom)
	if withBBox {
		b, _ := bounds(geom)
		g.str(`,"bbox":`)
		g.bbox(b)
	}
	g.str("}")
}

func (g *geojsonWriter) bbox(b orb.Bound) {
	g.str("[")
	g.num(b.Min[0])
	g.str(",")
	g.num(b.Min[1])
	g.str(",")
	g.num(b.Max[0])
	g.str(",")
	g.num(b.Max[1])
	g.str("]")
}

func (g *geojsonWriter) geometry(geom orb.Geometry) {
	g.str(`{"type":"` + geom.GeoJSONType() + `","coordinates":`)
	switch geom := geom.(type) {
	case orb.Point:
		g.position(geom)
	case orb.LineString:
		g.positions(geom)
	case orb.Polygon:
		g.polygon(geom)
	case orb.MultiPolygon:
		g.str("[")
		for i, p := range geom {
			if i > 0 {
				g.str(",")
			}
			g.polygon(p)
		}
		g.str("]")
	default:
		panic(fmt.Sprintf("gis: unsupported geometry %T", geom))
	}
	g.str("}")
}

func (g *geojsonWriter) position(p orb.Point) {
	if math.IsNaN(p[0]) || math.IsNaN(p[1]) {
		panic("gis: NaN position after validation")
	}
	g.str("[")
	g.num(p[0])
	g.str(",")
	g.num(p[1])
	g.str("]")
}

func (g *geojsonWriter) positions(ps []orb.Point) {
	g.str("[")
	for i, p := range ps {
		if i > 0 {
			g.str(",")
		}
		g.position(p)
	}
	g.str("]")
}

func (g *geojsonWriter) polygon(p orb.Polygon) {
	g.str("[")
	for i, r := range p {
		if i > 0 {
			g.str(",")
		}
		g.positions(r)
	}
	g.str("]")
}
