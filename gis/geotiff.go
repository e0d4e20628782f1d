package gis

import (
	"bufio"
	"encoding/binary"
	"encoding/xml"
	"fmt"
	"io"
	"math"
	"slices"
	"strconv"
	"strings"

	"github.com/paulmach/orb"
)

// Raster is a single-band float32 raster on a Grid.
type Raster struct {
	Grid
	// Data holds one value per cell in grid order (index j·Cols + i, row
	// j = 0 the SOUTH row), in the raster's unit.
	Data []float32
	// NoData marks cells without a value; NaN is allowed.
	NoData float32
	// Description names the band's quantity (e.g. "first_slip_time_s")
	// and Unit is its unit (e.g. "s"); either may be empty. A GeoTIFF
	// carries them in GDAL's metadata tag.
	Description, Unit string
}

// TIFF 6.0 constants (Adobe 1992, TIFF Revision 6.0, §2 and §8).
const (
	tiffByteOrderLE = "II"
	tiffMagic       = 42
	tiffHeaderLen   = 8
	tiffEntryLen    = 12

	typeASCII  = 2
	typeShort  = 3
	typeLong   = 4
	typeDouble = 12
)

// TIFF and GeoTIFF tags (TIFF 6.0 §8 and appendix A; OGC 19-008r4, §7;
// GDAL_NODATA from GDAL's GTiff driver documentation).
const (
	tagImageWidth       = 256
	tagImageLength      = 257
	tagBitsPerSample    = 258
	tagCompression      = 259
	tagPhotometric      = 262
	tagStripOffsets     = 273
	tagSamplesPerPixel  = 277
	tagRowsPerStrip     = 278
	tagStripByteCounts  = 279
	tagPlanarConfig     = 284
	tagSampleFormat     = 339
	tagModelPixelScale  = 33550
	tagModelTiepoint    = 33922
	tagGeoKeyDirectory  = 34735
	tagGeoDoubleParams  = 34736
	tagGeoASCIIParams   = 34737
	tagGDALMetadata     = 42112
	tagGDALNoData       = 42113
	compressionNone     = 1
	photometricBlackIs0 = 1
	planarChunky        = 1
	sampleFormatIEEE    = 3
)

// tiffStripBytes is the target size of one strip, bytes. Strips of a few
// tens of KiB let readers fetch part of a raster; common practice, no
// source.
const tiffStripBytes = 64 << 10

// WriteGeoTIFF writes r as a single-band float32 GeoTIFF (OGC GeoTIFF 1.1,
// OGC 19-008r4) in pl's CRS: a classic little-endian TIFF with one
// uncompressed image in strips, SampleFormat 3 (IEEE float),
// ModelPixelScale (CellSize, CellSize, 0) and ModelTiepoint at the
// upper-left corner of the north-west cell (RasterPixelIsArea), both in
// the CRS unit (a 10 m cell is 32.8 ftUS in a US survey foot CRS), the
// GeoKeys of the CRS (see geoKeys), GDAL's GDAL_NODATA tag and, when the
// raster has a Description or Unit, GDAL's GDAL_METADATA tag with the
// band's description and unit type (see gdalMetadata).
//
// The file stores the NORTH row first: file row r holds grid row
// Rows−1−r.
//
// An EPSG code is written as ProjectedCSType, and so is the EPSG
// identifier of a WKT CRS. A WKT CRS without one is written as a
// user-defined projected CRS: its name in GTCitation, its projection
// method and parameters, unit and ellipsoid in GeoKeys; that needs an
// implemented projection method and the Greenwich prime meridian.
//
// For the undefined CRS ProjectedCSType is 32767 (user-defined) with
// ProjLinearUnits = metre and no projection keys. GDAL 3.6 then reports
// an engineering CRS, ENGCRS["unnamed", … LENGTHUNIT["metre",1 …]], with
// the geotransform in local coordinates plus the placement offset.
func WriteGeoTIFF(w io.Writer, pl Placement, r Raster) error {
	if err := r.validate(len(r.Data)); err != nil {
		return err
	}
	def, toCRS, err := pl.resolve()
	if err != nil {
		return fmt.Errorf("gis: GeoTIFF: %w", err)
	}
	gk, err := geoKeys(def)
	if err != nil {
		return fmt.Errorf("gis: GeoTIFF in %s: %w", pl.CRS.label(), err)
	}
	unit := Metre
	if def != nil {
		unit = def.unit
	}
	// Header, IFD and strip tables stay below 1 MiB (at most 65536 strips
	// of 8 table bytes each).
	pixelBytes := uint64(r.Cols) * uint64(r.Rows) * 4
	if pixelBytes+(1<<20) > math.MaxUint32 {
		return fmt.Errorf("gis: GeoTIFF of %d×%d cells needs %d bytes, over the 4 GiB of classic TIFF", r.Cols, r.Rows, pixelBytes)
	}
	bw := bufio.NewWriter(w)
	if _, err := bw.Write(tiffHead(r, toCRS, unit, gk)); err != nil {
		return err
	}
	row := make([]byte, 4*r.Cols)
	for fr := 0; fr < r.Rows; fr++ {
		j := r.Rows - 1 - fr
		for i, v := range r.Data[j*r.Cols : (j+1)*r.Cols] {
			binary.LittleEndian.PutUint32(row[4*i:], math.Float32bits(v))
		}
		if _, err := bw.Write(row); err != nil {
			return err
		}
	}
	return bw.Flush()
}

// tiffEntry is one IFD entry with its value bytes (little endian).
type tiffEntry struct {
	tag, typ uint16
	count    uint32
	value    []byte
}

// tiffHead returns the file up to the pixel data: header, IFD and the
// out-of-line values. Pixel data follows immediately, strip after strip.
// toCRS places local points, in unit.
func tiffHead(r Raster, toCRS func(orb.Point) orb.Point, unit LinearUnit, gk geoKeyDirectory) []byte {
	rowBytes := uint32(4 * r.Cols)
	rowsPerStrip := max(1, tiffStripBytes/int(rowBytes))
	rowsPerStrip = min(rowsPerStrip, r.Rows)
	nStrips := (r.Rows + rowsPerStrip - 1) / rowsPerStrip

	ul := toCRS(orb.Point{r.XMin, r.YMin + float64(r.Rows)*r.CellSize})
	pixel := r.CellSize / unit.Metres
	nodata := strconv.FormatFloat(float64(r.NoData), 'g', -1, 32)
	if math.IsNaN(float64(r.NoData)) {
		nodata = "nan"
	}
	entries := []tiffEntry{
		longEntry(tagImageWidth, uint32(r.Cols)),
		longEntry(tagImageLength, uint32(r.Rows)),
		shortEntry(tagBitsPerSample, 32),
		shortEntry(tagCompression, compressionNone),
		shortEntry(tagPhotometric, photometricBlackIs0),
		{tag: tagStripOffsets, typ: typeLong, count: uint32(nStrips)}, // filled below
		shortEntry(tagSamplesPerPixel, 1),
		longEntry(tagRowsPerStrip, uint32(rowsPerStrip)),
		{tag: tagStripByteCounts, typ: typeLong, count: uint32(nStrips)},
		shortEntry(tagPlanarConfig, planarChunky),
		shortEntry(tagSampleFormat, sampleFormatIEEE),
		doubleEntry(tagModelPixelScale, pixel, pixel, 0),
		doubleEntry(tagModelTiepoint, 0, 0, 0, ul[0], ul[1], 0),
		shortsEntry(tagGeoKeyDirectory, gk.keys...),
	}
	if len(gk.doubles) > 0 {
		entries = append(entries, doubleEntry(tagGeoDoubleParams, gk.doubles...))
	}
	if gk.ascii != "" {
		entries = append(entries, asciiEntry(tagGeoASCIIParams, gk.ascii))
	}
	if md := gdalMetadata(r.Description, r.Unit); md != "" {
		entries = append(entries, asciiEntry(tagGDALMetadata, md))
	}
	entries = append(entries, asciiEntry(tagGDALNoData, nodata))
	if !slices.IsSortedFunc(entries, func(a, b tiffEntry) int { return int(a.tag) - int(b.tag) }) {
		panic("gis: TIFF entries not sorted by tag") // TIFF 6.0 §2: ascending order
	}
	offsetsEntry := &entries[slices.IndexFunc(entries, func(e tiffEntry) bool { return e.tag == tagStripOffsets })]
	countsEntry := &entries[slices.IndexFunc(entries, func(e tiffEntry) bool { return e.tag == tagStripByteCounts })]
	counts := make([]uint32, nStrips)
	for s := range counts {
		rows := min(rowsPerStrip, r.Rows-s*rowsPerStrip)
		counts[s] = uint32(rows) * rowBytes
	}
	countsEntry.value = uint32sBytes(counts)
	offsetsEntry.value = make([]byte, 4*nStrips) // placeholder of the final size

	// Layout: header, IFD, out-of-line values (word aligned), pixels.
	ifdLen := 2 + tiffEntryLen*len(entries) + 4
	extra := uint32(tiffHeaderLen + ifdLen)
	offsets := make([]uint32, len(entries))
	for k, e := range entries {
		if len(e.value) > 4 {
			extra += extra & 1
			offsets[k] = extra
			extra += uint32(len(e.value))
		}
	}
	extra += extra & 1
	stripOffsets := make([]uint32, nStrips)
	for s := range stripOffsets {
		stripOffsets[s] = extra + uint32(s*rowsPerStrip)*rowBytes
	}
	offsetsEntry.value = uint32sBytes(stripOffsets)

	head := make([]byte, 0, extra)
	head = append(head, tiffByteOrderLE...)
	head = binary.LittleEndian.AppendUint16(head, tiffMagic)
	head = binary.LittleEndian.AppendUint32(head, tiffHeaderLen)
	head = binary.LittleEndian.AppendUint16(head, uint16(len(entries)))
	for k, e := range entries {
		head = binary.LittleEndian.AppendUint16(head, e.tag)
		head = binary.LittleEndian.AppendUint16(head, e.typ)
		head = binary.LittleEndian.AppendUint32(head, e.count)
		if len(e.value) > 4 {
			head = binary.LittleEndian.AppendUint32(head, offsets[k])
		} else {
			var v [4]byte // values of ≤ 4 bytes are left-justified
			copy(v[:], e.value)
			head = append(head, v[:]...)
		}
	}
	head = binary.LittleEndian.AppendUint32(head, 0) // no next IFD
	for _, e := range entries {
		if len(e.value) > 4 {
			if len(head)&1 == 1 {
				head = append(head, 0)
			}
			head = append(head, e.value...)
		}
	}
	if len(head)&1 == 1 {
		head = append(head, 0)
	}
	if uint32(len(head)) != extra {
		panic("gis: TIFF layout size mismatch")
	}
	return head
}

// gdalMetadata returns the XML of GDAL's GDAL_METADATA TIFF tag (42112)
// with band 0's description and unit type, or "" when both are empty.
// The items are the ones GDAL's GTiff driver writes for a band
// description and unit (GDAL, GTiff driver documentation, "Metadata"):
//
//	<GDALMetadata><Item name="DESCRIPTION" sample="0" role="description">…</Item>
//	<Item name="UNITTYPE" sample="0" role="unittype">…</Item></GDALMetadata>
//
// GDAL escapes an item's value for XML and then the whole document again,
// so the text is escaped twice ("&" is "&amp;amp;"), as gdal_translate
// 3.6 writes it; the tests read it back with gdalinfo.
func gdalMetadata(description, unit string) string {
	if description == "" && unit == "" {
		return ""
	}
	escape := func(s string) string {
		var b strings.Builder
		xml.EscapeText(&b, []byte(s))
		return b.String()
	}
	var b strings.Builder
	b.WriteString("<GDALMetadata>")
	for _, it := range [...]struct{ name, role, value string }{
		{"DESCRIPTION", "description", description},
		{"UNITTYPE", "unittype", unit},
	} {
		if it.value != "" {
			fmt.Fprintf(&b, `<Item name="%s" sample="0" role="%s">%s</Item>`, it.name, it.role, escape(escape(it.value)))
		}
	}
	b.WriteString("</GDALMetadata>")
	return b.String()
}

// asciiEntry stores s with its terminating NUL (TIFF 6.0 §2, type ASCII).
func asciiEntry(tag uint16, s string) tiffEntry {
	return tiffEntry{tag: tag, typ: typeASCII, count: uint32(len(s) + 1), value: append([]byte(s), 0)}
}

func shortEntry(tag uint16, v uint16) tiffEntry {
	return shortsEntry(tag, v)
}

func shortsEntry(tag uint16, vs ...uint16) tiffEntry {
	b := make([]byte, 0, 2*len(vs))
	for _, v := range vs {
		b = binary.LittleEndian.AppendUint16(b, v)
	}
	return tiffEntry{tag: tag, typ: typeShort, count: uint32(len(vs)), value: b}
}

func longEntry(tag uint16, v uint32) tiffEntry {
	return tiffEntry{tag: tag, typ: typeLong, count: 1, value: binary.LittleEndian.AppendUint32(nil, v)}
}

func doubleEntry(tag uint16, vs ...float64) tiffEntry {
	b := make([]byte, 0, 8*len(vs))
	for _, v := range vs {
		b = binary.LittleEndian.AppendUint64(b, math.Float64bits(v))
	}
	return tiffEntry{tag: tag, typ: typeDouble, count: uint32(len(vs)), value: b}
}

func uint32sBytes(vs []uint32) []byte {
	b := make([]byte, 0, 4*len(vs))
	for _, v := range vs {
		b = binary.LittleEndian.AppendUint32(b, v)
	}
	return b
}
