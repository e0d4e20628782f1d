package gis

import (
	"encoding/binary"
	"fmt"
	"math"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/encoding/wkb"
)

// GeoPackageBinary header constants (OGC 12-128r18, §2.1.3.1.1 and
// Annex: GeoPackageBinaryHeader).
const (
	gpMagic0         = 0x47 // 'G'
	gpMagic1         = 0x50 // 'P'
	gpVersion        = 0    // version 1 of the encoding
	gpFlagLittle     = 0x01 // bit 0: header byte order, 1 = little endian
	gpEnvelopeXY     = 1    // envelope code 1: [minx, maxx, miny, maxy]
	gpEnvelopeShift  = 1    // envelope code in bits 1–3
	gpHeaderLen      = 8    // magic, version, flags, srs_id
	gpEnvelopeXYSize = 32   // four float64
)

// encodeGPKGGeometry returns the GeoPackageBinary blob of g (already in
// CRS coordinates): an 8-byte header (magic "GP", version 0, flags, srs_id
// int32), an envelope minx, maxx, miny, maxy for every geometry but a
// point, then ISO WKB (little endian, 2-D).
//
// Empty geometries are not encoded (the writer stores NULL): GDAL 3.6's
// validate_gpkg reads the empty flag from bit 3 instead of bit 4 and
// rejects (Req 152) even the blob GDAL itself writes for an empty
// geometry, 47 50 00 11 … (checked with ogr2ogr 3.6.2). It panics on an
// empty geometry (a programmer bug).
func encodeGPKGGeometry(g orb.Geometry, srsID int32) ([]byte, error) {
	flags := byte(gpFlagLittle)
	b, hasPoints := bounds(g)
	if !hasPoints {
		panic("gis: encodeGPKGGeometry of an empty geometry")
	}
	withEnvelope := g.GeoJSONType() != "Point"
	if withEnvelope {
		flags |= gpEnvelopeXY << gpEnvelopeShift
	}
	body, err := wkb.Marshal(g, binary.LittleEndian)
	if err != nil {
		return nil, fmt.Errorf("gis: encoding WKB: %w", err)
	}
	n := gpHeaderLen + len(body)
	if withEnvelope {
		n += gpEnvelopeXYSize
	}
	buf := make([]byte, 0, n)
	buf = append(buf, gpMagic0, gpMagic1, gpVersion, flags)
	buf = binary.LittleEndian.AppendUint32(buf, uint32(srsID))
	if withEnvelope {
		// Envelope order minx, maxx, miny, maxy (OGC 12-128r18,
		// GeoPackageBinaryHeader) — not the usual minx, miny, maxx, maxy.
		for _, v := range [4]float64{b.Min[0], b.Max[0], b.Min[1], b.Max[1]} {
			buf = binary.LittleEndian.AppendUint64(buf, math.Float64bits(v))
		}
	}
	return append(buf, body...), nil
}
