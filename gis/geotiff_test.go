package gis

import (
	"bytes"
	"encoding/binary"
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"os"
	"strconv"
	"strings"
	"testing"

	"slipfront/internal/numtest"
)

// tiffTag is a decoded IFD entry (test-only reader of the files written
// here: little endian, one IFD).
type tiffTag struct {
	typ   uint16
	count uint32
	data  []byte // the value bytes, in line or out of line
}

func readTIFFTags(b []byte) (map[uint16]tiffTag, []uint16, error) {
	if len(b) < 8 || string(b[:2]) != "II" || binary.LittleEndian.Uint16(b[2:]) != 42 {
		return nil, nil, errors.New("not a little-endian classic TIFF")
	}
	off := binary.LittleEndian.Uint32(b[4:])
	if int(off)+2 > len(b) {
		return nil, nil, errors.New("IFD offset out of range")
	}
	n := int(binary.LittleEndian.Uint16(b[off:]))
	tags := map[uint16]tiffTag{}
	var order []uint16
	size := map[uint16]int{typeASCII: 1, typeShort: 2, typeLong: 4, typeDouble: 8}
	for k := range n {
		e := b[int(off)+2+12*k:]
		tag, typ, count := binary.LittleEndian.Uint16(e), binary.LittleEndian.Uint16(e[2:]), binary.LittleEndian.Uint32(e[4:])
		length := size[typ] * int(count)
		if length == 0 {
			return nil, nil, fmt.Errorf("tag %d: unexpected type %d", tag, typ)
		}
		data := e[8 : 8+min(length, 4)]
		if length > 4 {
			p := int(binary.LittleEndian.Uint32(e[8:]))
			if p%2 != 0 || p+length > len(b) {
				return nil, nil, fmt.Errorf("tag %d: bad offset %d", tag, p)
			}
			data = b[p : p+length]
		}
		tags[tag] = tiffTag{typ, count, data[:length]}
		order = append(order, tag)
	}
	return tags, order, nil
}

func (t tiffTag) uint(i int) uint32 {
	if t.typ == typeShort {
		return uint32(binary.LittleEndian.Uint16(t.data[2*i:]))
	}
	return binary.LittleEndian.Uint32(t.data[4*i:])
}

func (t tiffTag) float(i int) float64 {
	return math.Float64frombits(binary.LittleEndian.Uint64(t.data[8*i:]))
}

// sampleRaster returns a raster whose cell (i, j) holds 100·j + i, with
// cell (0, 0) set to NoData.
func sampleRaster(cols, rows int) Raster {
	r := Raster{Grid: Grid{Cols: cols, Rows: rows, CellSize: 10, XMin: -200, YMin: -100}, NoData: -9999}
	r.Data = make([]float32, cols*rows)
	for j := range rows {
		for i := range cols {
			r.Data[j*cols+i] = float32(100*j + i)
		}
	}
	r.Data[0] = r.NoData
	return r
}

func writeTIFFBytes(t *testing.T, pl Placement, r Raster) []byte {
	t.Helper()
	var buf bytes.Buffer
	if err := WriteGeoTIFF(&buf, pl, r); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes()
}

func TestGeoTIFFTags(t *testing.T) {
	r := sampleRaster(7, 4)
	b := writeTIFFBytes(t, samplePlacement, r)
	tags, order, err := readTIFFTags(b)
	if err != nil {
		t.Fatal(err)
	}
	for k := 1; k < len(order); k++ {
		if order[k] <= order[k-1] {
			t.Errorf("tags not sorted: %v", order) // TIFF 6.0 §2
		}
	}
	wantUint := map[uint16]uint32{
		tagImageWidth: 7, tagImageLength: 4, tagBitsPerSample: 32, tagCompression: 1,
		tagSamplesPerPixel: 1, tagSampleFormat: sampleFormatIEEE, tagRowsPerStrip: 4,
	}
	for tag, want := range wantUint {
		if got := tags[tag].uint(0); got != want {
			t.Errorf("tag %d = %d, want %d", tag, got, want)
		}
	}
	// Upper-left corner: local (−200, −100 + 4·10) plus the placement.
	tp := tags[tagModelTiepoint]
	numtest.Abs(t, "tiepoint X", tp.float(3), 600000-200, 0)
	numtest.Abs(t, "tiepoint Y", tp.float(4), 3500000-60, 0)
	ps := tags[tagModelPixelScale]
	numtest.Abs(t, "pixel scale x", ps.float(0), 10, 0)
	numtest.Abs(t, "pixel scale y (positive for north-up)", ps.float(1), 10, 0)
	gk := tags[tagGeoKeyDirectory]
	var keys []uint32
	for i := range int(gk.count) {
		keys = append(keys, gk.uint(i))
	}
	wantKeys := []uint32{1, 1, 1, 3, 1024, 0, 1, 1, 1025, 0, 1, 1, 3072, 0, 1, 32614}
	if fmt.Sprint(keys) != fmt.Sprint(wantKeys) {
		t.Errorf("GeoKeyDirectory %v, want %v", keys, wantKeys)
	}
	if got := string(tags[tagGDALNoData].data); got != "-9999\x00" {
		t.Errorf("GDAL_NODATA %q", got)
	}
	// File row 0 is the north row: the first pixel is grid cell (0, 3).
	off := tags[tagStripOffsets].uint(0)
	first := math.Float32frombits(binary.LittleEndian.Uint32(b[off:]))
	last := math.Float32frombits(binary.LittleEndian.Uint32(b[len(b)-4:]))
	numtest.Abs(t, "first pixel (north-west cell)", float64(first), 300, 0)
	numtest.Abs(t, "last pixel (south-east cell)", float64(last), 6, 0)
	if len(b) != int(off)+7*4*4 {
		t.Errorf("file length %d, want pixel data to end the file at %d", len(b), int(off)+7*4*4)
	}
}

func TestGeoTIFFStrips(t *testing.T) {
	r := sampleRaster(500, 70) // 2000 B per row, 32 rows per 64 KiB strip: 3 strips
	b := writeTIFFBytes(t, samplePlacement, r)
	tags, _, err := readTIFFTags(b)
	if err != nil {
		t.Fatal(err)
	}
	rps := tags[tagRowsPerStrip].uint(0)
	so, sc := tags[tagStripOffsets], tags[tagStripByteCounts]
	if rps != 32 || so.count != 3 || sc.count != 3 {
		t.Fatalf("rows per strip %d, %d offsets, %d counts; want 32, 3, 3", rps, so.count, sc.count)
	}
	var total uint32
	for s := range 3 {
		if so.uint(s) != so.uint(0)+total {
			t.Errorf("strip %d at %d, want contiguous %d", s, so.uint(s), so.uint(0)+total)
		}
		total += sc.uint(s)
	}
	if total != 500*70*4 || int(so.uint(0)+total) != len(b) {
		t.Errorf("strip bytes %d, file %d", total, len(b))
	}
}

func TestGeoTIFFBadInput(t *testing.T) {
	good := sampleRaster(3, 2)
	cases := []struct {
		name   string
		edit   func(*Raster, *Placement)
		substr string
	}{
		{"no columns", func(r *Raster, _ *Placement) { r.Cols = 0 }, "at least 1×1"},
		{"short data", func(r *Raster, _ *Placement) { r.Data = r.Data[:5] }, "has 5 values"},
		{"zero cell", func(r *Raster, _ *Placement) { r.CellSize = 0 }, "cell size"},
		{"NaN cell", func(r *Raster, _ *Placement) { r.CellSize = math.NaN() }, "cell size"},
		{"infinite corner", func(r *Raster, _ *Placement) { r.XMin = math.Inf(-1) }, "corner"},
		{"unknown code", func(_ *Raster, p *Placement) { p.CRS = CRS{EPSG: 102100} }, "not a projected CRS this program can place"},
		{"code too large", func(_ *Raster, p *Placement) {
			p.CRS = mustWKT(t, "tm-ftus-nad83.wkt1.prj")
			w := *p.CRS.wkt
			w.epsg = 40000
			p.CRS.wkt = &w
		}, "ProjectedCSTypeGeoKey"},
		{"no GeoTIFF encoding", func(_ *Raster, p *Placement) {
			p.CRS = mustWKT(t, "2056.wkt2.prj")
			w := *p.CRS.wkt
			w.epsg = 0
			p.CRS.wkt = &w
		}, "Hotine"},
	}
	for _, c := range cases {
		r, pl := good, samplePlacement
		r.Data = append([]float32(nil), good.Data...)
		c.edit(&r, &pl)
		var buf bytes.Buffer
		err := WriteGeoTIFF(&buf, pl, r)
		if err == nil || !strings.Contains(err.Error(), c.substr) {
			t.Errorf("%s: error %v, want one containing %q", c.name, err, c.substr)
		}
	}
}

// gdalInfo is the part of `gdalinfo -json -stats` the tests read
// (the keys GDAL 3.6 prints; the rest is ignored).
type gdalInfo struct {
	Size             []int
	GeoTransform     []float64
	CoordinateSystem struct{ WKT string }
	Stac             map[string]any
	Metadata         map[string]map[string]string
	Bands            []struct {
		Type        string
		NoDataValue any
		// Metadata[""] holds STATISTICS_* with 14 significant digits (the
		// top-level minimum/maximum/mean/stdDev have only 3 decimals).
		Metadata map[string]map[string]string
	}
}

// rasterStats returns min, max, mean and population standard deviation of
// the cells that are not NoData, and their percentage (the statistics GDAL
// reports).
func rasterStats(r Raster) (lo, hi, mean, sd, validPercent float64) {
	lo, hi = math.Inf(1), math.Inf(-1)
	var s, s2 float64
	n := 0
	for _, v := range r.Data {
		if v == r.NoData || math.IsNaN(float64(v)) {
			continue
		}
		x := float64(v)
		lo, hi = math.Min(lo, x), math.Max(hi, x)
		s += x
		n++
	}
	mean = s / float64(n)
	for _, v := range r.Data {
		if v == r.NoData || math.IsNaN(float64(v)) {
			continue
		}
		s2 += (float64(v) - mean) * (float64(v) - mean)
	}
	return lo, hi, mean, math.Sqrt(s2 / float64(n)), 100 * float64(n) / float64(len(r.Data))
}

// TestGeoTIFFGDALInfo checks with gdalinfo that size, geotransform, CRS,
// NoData and statistics match what was written, and that a map point in
// the south-west cell reads that cell's value.
func TestGeoTIFFGDALInfo(t *testing.T) {
	gdalinfo := needTool(t, "gdalinfo")
	rng := rand.New(rand.NewPCG(1, 2))
	big := sampleRaster(300, 250) // several strips
	for k := range big.Data[1:] {
		big.Data[1+k] = float32(rng.NormFloat64())
	}
	nan := sampleRaster(6, 5)
	nan.NoData = float32(math.NaN())
	nan.Data[0] = nan.NoData
	cases := []struct {
		name string
		pl   Placement
		r    Raster
	}{
		{"small", samplePlacement, sampleRaster(7, 4)},
		{"several strips", Placement{CRS: CRS{EPSG: 32733}, Easting: 400000, Northing: 7e6}, big},
		{"NaN nodata", Placement{CRS: CRS{EPSG: 26914}}, nan},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			path := tempPath(t, "m.tif")
			if err := os.WriteFile(path, writeTIFFBytes(t, c.pl, c.r), 0o644); err != nil {
				t.Fatal(err)
			}
			out := runTool(t, []string{"GDAL_PAM_ENABLED=NO"}, gdalinfo, "-json", "-stats", path)
			var info gdalInfo
			if err := json.Unmarshal([]byte(out), &info); err != nil {
				t.Fatalf("%v\n%s", err, out)
			}
			r := c.r
			if fmt.Sprint(info.Size) != fmt.Sprint([]int{r.Cols, r.Rows}) {
				t.Errorf("size %v, want [%d %d]", info.Size, r.Cols, r.Rows)
			}
			ulx := r.XMin + c.pl.Easting
			uly := r.YMin + float64(r.Rows)*r.CellSize + c.pl.Northing
			want := []float64{ulx, r.CellSize, 0, uly, 0, -r.CellSize}
			for k := range want {
				numtest.Abs(t, "geoTransform["+strconv.Itoa(k)+"]", info.GeoTransform[k], want[k], coordTol)
			}
			if epsg, _ := info.Stac["proj:epsg"].(float64); int(epsg) != c.pl.CRS.EPSG {
				t.Errorf("proj:epsg %v, want %d", info.Stac["proj:epsg"], c.pl.CRS.EPSG)
			}
			if info.Metadata[""]["AREA_OR_POINT"] != "Area" {
				t.Errorf("AREA_OR_POINT %q", info.Metadata[""]["AREA_OR_POINT"])
			}
			b := info.Bands[0]
			if b.Type != "Float32" {
				t.Errorf("band type %s", b.Type)
			}
			if math.IsNaN(float64(r.NoData)) {
				if b.NoDataValue != "nan" && b.NoDataValue != "NaN" {
					t.Errorf("noDataValue %v, want nan", b.NoDataValue)
				}
			} else if nd, ok := b.NoDataValue.(float64); !ok || nd != float64(r.NoData) {
				t.Errorf("noDataValue %v, want %v", b.NoDataValue, r.NoData)
			}
			lo, hi, mean, sd, valid := rasterStats(r)
			// statTol: GDAL prints 14 significant digits (5e-14 relative)
			// and accumulates in double; 1e-11 leaves margin for both.
			const statTol = 1e-11
			for _, s := range []struct {
				key  string
				want float64
				tol  float64
			}{
				{"STATISTICS_MINIMUM", lo, statTol},
				{"STATISTICS_MAXIMUM", hi, statTol},
				{"STATISTICS_MEAN", mean, statTol},
				{"STATISTICS_STDDEV", sd, statTol},
				{"STATISTICS_VALID_PERCENT", valid, 0.005}, // printed with 2 decimals
			} {
				got, err := strconv.ParseFloat(b.Metadata[""][s.key], 64)
				if err != nil {
					t.Errorf("%s: %v", s.key, err)
					continue
				}
				numtest.Close(t, s.key, got, s.want, s.tol, s.tol)
			}
			checkLocation(t, path, c.pl, r, 1, 0)
			checkLocation(t, path, c.pl, r, r.Cols-1, r.Rows-1)
		})
	}
}

// checkLocation reads cell (i, j) at its centre's map coordinates with
// gdallocationinfo and compares it with the grid value.
func checkLocation(t *testing.T, path string, pl Placement, r Raster, i, j int) {
	t.Helper()
	tool := needTool(t, "gdallocationinfo")
	c := r.corner(i, j)
	p := pl.ToCRS([2]float64{c[0] + r.CellSize/2, c[1] + r.CellSize/2})
	out := runTool(t, nil, tool, "-valonly", "-geoloc", path, strconv.FormatFloat(p[0], 'f', 3, 64), strconv.FormatFloat(p[1], 'f', 3, 64))
	got, err := strconv.ParseFloat(strings.TrimSpace(out), 64)
	if err != nil {
		t.Fatalf("gdallocationinfo printed %q", out)
	}
	// gdallocationinfo prints 15 significant digits; 1e-14 relative.
	numtest.Rel(t, fmt.Sprintf("cell (%d, %d)", i, j), got, float64(r.Data[j*r.Cols+i]), 1e-14)
}

// TestGeoTIFFUndefinedCRS: GDAL 3.6 reads the user-defined ProjectedCSType
// with metre units as an engineering CRS in metres and prints nothing on
// stderr.
func TestGeoTIFFUndefinedCRS(t *testing.T) {
	gdalinfo := needTool(t, "gdalinfo")
	path := tempPath(t, "u.tif")
	if err := os.WriteFile(path, writeTIFFBytes(t, Placement{Easting: 100}, sampleRaster(3, 2)), 0o644); err != nil {
		t.Fatal(err)
	}
	out := runTool(t, []string{"GDAL_PAM_ENABLED=NO"}, gdalinfo, path)
	for _, want := range []string{"ENGCRS[", `LENGTHUNIT["metre",1`, "Origin = (-100.000000000000000,-80.000000000000000)"} {
		if !strings.Contains(out, want) {
			t.Errorf("gdalinfo output lacks %q:\n%s", want, out)
		}
	}
}

// TestGeoTIFFFeetAndUserDefined: in a US survey foot CRS the pixel
// scale and tiepoint are in ftUS; a WKT CRS without an EPSG code is
// written as user-defined keys, sorted, with its name in GTCitation and
// the parameters in GeoDoubleParams.
func TestGeoTIFFFeetAndUserDefined(t *testing.T) {
	const ftUS = 1200.0 / 3937
	r := sampleRaster(7, 4)
	pl := Placement{CRS: mustWKT(t, "tm-ftus-nad83.wkt1.prj"), Easting: 650000 * ftUS, Northing: 180000 * ftUS}
	tags, _, err := readTIFFTags(writeTIFFBytes(t, pl, r))
	if err != nil {
		t.Fatal(err)
	}
	// The scale is 10 m in ftUS, the tiepoint the origin plus local
	// (−200, −60) m in ftUS; 1e-9 ftUS is float rounding.
	numtest.Abs(t, "pixel scale", tags[tagModelPixelScale].float(0), 10/ftUS, 1e-12)
	numtest.Abs(t, "tiepoint X", tags[tagModelTiepoint].float(3), 650000-200/ftUS, 1e-9)
	numtest.Abs(t, "tiepoint Y", tags[tagModelTiepoint].float(4), 180000-60/ftUS, 1e-9)
	gk := tags[tagGeoKeyDirectory]
	n := int(gk.uint(3))
	keys := map[uint32][3]uint32{}
	for k := range n {
		id := gk.uint(4 + 4*k)
		if k > 0 && id <= gk.uint(4*k) {
			t.Errorf("GeoKey %d after %d: not sorted", id, gk.uint(4*k))
		}
		keys[id] = [3]uint32{gk.uint(5 + 4*k), gk.uint(6 + 4*k), gk.uint(7 + 4*k)}
	}
	for id, want := range map[uint32]uint32{keyProjectedCSType: userDefined, keyProjection: userDefined, keyProjCoordTrans: ctTransverseMercator,
		keyProjLinearUnits: 9003, keyGeographicType: userDefined, keyGeogGeodeticDatum: 6269, keyGeogAngularUnits: 9102} {
		if k, ok := keys[id]; !ok || k[0] != 0 || k[2] != want {
			t.Errorf("GeoKey %d = %v, want value %d", id, k, want)
		}
	}
	doubles := tags[tagGeoDoubleParams]
	for id, want := range map[uint32]float64{keyProjNatOriginLat: 31, keyProjNatOriginLong: -103.5, keyProjScaleAtNatOrigin: 0.9999,
		keyProjFalseEasting: 656166.666666667, keyProjFalseNorthing: 0, keyGeogSemiMajorAxis: 6378137, keyGeogInvFlattening: 298.257222101} {
		k, ok := keys[id]
		if !ok || k[0] != tagGeoDoubleParams || k[1] != 1 {
			t.Errorf("GeoKey %d = %v, want one double", id, k)
			continue
		}
		// The WKT prints 15 significant digits: 1e-9 ftUS at 6.6e5.
		numtest.Abs(t, "GeoKey "+strconv.Itoa(int(id)), doubles.float(int(k[2])), want, 1e-9)
	}
	ascii := string(tags[tagGeoASCIIParams].data)
	if k := keys[keyGTCitation]; k[0] != tagGeoASCIIParams || ascii[k[2]:k[2]+k[1]] != "unknown|" {
		t.Errorf("GTCitation %v in %q", k, ascii)
	}
}

func BenchmarkWriteGeoTIFF1e6(b *testing.B) { benchmarkWriteGeoTIFF(b, 1000) }

// benchmarkWriteGeoTIFF writes an n×n raster to memory.
func benchmarkWriteGeoTIFF(b *testing.B, n int) {
	r := sampleRaster(n, n)
	var buf bytes.Buffer
	for b.Loop() {
		buf.Reset()
		if err := WriteGeoTIFF(&buf, samplePlacement, r); err != nil {
			b.Fatal(err)
		}
	}
	b.SetBytes(int64(4 * n * n))
}

// A band's description and unit go into GDAL's GDAL_METADATA tag, which
// gdalinfo reads back as the band description and unit type; a raster
// without them has no such tag.
func TestGeoTIFFBandMetadata(t *testing.T) {
	r := sampleRaster(7, 4)
	tags, _, err := readTIFFTags(writeTIFFBytes(t, samplePlacement, r))
	if err != nil {
		t.Fatal(err)
	}
	if _, ok := tags[tagGDALMetadata]; ok {
		t.Error("a raster without description or unit has a GDAL_METADATA tag")
	}
	r.Description, r.Unit = "pressure_increase_MPa & <co>", "MPa"
	b := writeTIFFBytes(t, samplePlacement, r)
	if tags, _, err = readTIFFTags(b); err != nil {
		t.Fatal(err)
	}
	want := `<GDALMetadata><Item name="DESCRIPTION" sample="0" role="description">pressure_increase_MPa &amp;amp; &amp;lt;co&amp;gt;</Item>` +
		`<Item name="UNITTYPE" sample="0" role="unittype">MPa</Item></GDALMetadata>` + "\x00"
	if md := tags[tagGDALMetadata]; md.typ != typeASCII || string(md.data) != want {
		t.Errorf("GDAL_METADATA %q (type %d), want %q", md.data, md.typ, want)
	}
	gdalinfo := needTool(t, "gdalinfo")
	path := tempPath(t, "band.tif")
	if err := os.WriteFile(path, b, 0o644); err != nil {
		t.Fatal(err)
	}
	out := runTool(t, []string{"GDAL_PAM_ENABLED=NO"}, gdalinfo, "-json", path)
	var info struct {
		Bands []struct {
			Description string
			Unit        string
		}
	}
	if err := json.Unmarshal([]byte(out), &info); err != nil {
		t.Fatalf("%v\n%s", err, out)
	}
	if len(info.Bands) != 1 || info.Bands[0].Description != "pressure_increase_MPa & <co>" || info.Bands[0].Unit != "MPa" {
		t.Errorf("gdalinfo bands %+v, want the description and unit written", info.Bands)
	}
}
