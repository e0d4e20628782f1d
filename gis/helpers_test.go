package gis

import (
	"bytes"
	"encoding/binary"
	"errors"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/paulmach/orb"
	"github.com/paulmach/orb/encoding/wkb"
)

// needTool returns the path of an external program, or skips the test
// when it is not installed (CI installs gdal-bin, proj-bin and
// libxml2-utils, so these tests run there).
func needTool(t *testing.T, name string) string {
	t.Helper()
	p, err := exec.LookPath(name)
	if err != nil {
		t.Skipf("%s not installed", name)
	}
	return p
}

// debianPython is Debian's interpreter, which has python3-gdal's
// osgeo_utils (another python3 first on PATH may lack it).
const debianPython = "/usr/bin/python3"

// needGDALPython skips the test unless Debian's python3 with the GDAL
// bindings is present.
func needGDALPython(t *testing.T) {
	t.Helper()
	if _, err := os.Stat(debianPython); err != nil {
		t.Skip("/usr/bin/python3 not installed")
	}
	if err := exec.Command(debianPython, "-c", "import osgeo.ogr, osgeo_utils").Run(); err != nil {
		t.Skip("python3-gdal not installed")
	}
}

// runTool runs a program and returns its stdout; the test fails when the
// program fails or writes anything to stderr (GDAL reports format problems
// as warnings on stderr, e.g. "Warning 1: GPKG: bad application_id").
func runTool(t *testing.T, env []string, name string, args ...string) string {
	t.Helper()
	cmd := exec.Command(name, args...)
	var stdout, stderr bytes.Buffer
	cmd.Stdout, cmd.Stderr = &stdout, &stderr
	cmd.Env = append(os.Environ(), env...)
	if err := cmd.Run(); err != nil {
		t.Fatalf("%s %s: %v\nstdout:\n%s\nstderr:\n%s", name, strings.Join(args, " "), err, stdout.String(), stderr.String())
	}
	if stderr.Len() > 0 {
		t.Errorf("%s %s wrote to stderr:\n%s", name, strings.Join(args, " "), stderr.String())
	}
	return stdout.String()
}

// testTime is a fixed time stamp for deterministic files.
var testTime = time.Date(2030, 1, 2, 3, 4, 5, 600e6, time.UTC)

// samplePlacement is a place in UTM zone 14N (EPSG:32614).
var samplePlacement = Placement{CRS: CRS{EPSG: 32614}, Easting: 600000, Northing: 3500000}

// sampleLayers returns one layer of each geometry type with fields of
// every type, plus an empty layer.
func sampleLayers() []Layer {
	square := func(x0, y0, s float64) orb.Ring {
		// Clockwise on purpose: the writers must rewind it.
		return orb.Ring{{x0, y0}, {x0, y0 + s}, {x0 + s, y0 + s}, {x0 + s, y0}, {x0, y0}}
	}
	return []Layer{
		{
			Name: "events", Description: "points", Geometry: Point,
			Fields: []Field{{"stage", Int32}, {"magnitude", Real}, {"time", DateTime}, {"label", Text}, {"kept", Boolean}, {"count", Integer}},
			Features: []Feature{
				{Geometry: orb.Point{10, 20}, Values: []any{int32(1), -1.5, testTime, "a", true, int64(1) << 40}},
				{Geometry: orb.Point{-30, 40.5}, Values: []any{2, math.NaN(), nil, "b \"quoted\"", false, 7}},
			},
		},
		{
			Name: "traces", Description: "lines", Geometry: LineString,
			Fields: []Field{{"slip_m", Real}},
			Features: []Feature{
				{Geometry: orb.LineString{{-100, -50}, {100, 60}}, Values: []any{1e-3}},
				{Geometry: orb.LineString{{0, 0}, {5, 5}, {10, -3}}, Values: []any{0.0}},
				{Geometry: nil, Values: []any{nil}},
			},
		},
		{
			Name: "areas", Geometry: Polygon,
			Fields: []Field{{"area_m2", Real}},
			Features: []Feature{
				{Geometry: orb.Polygon{square(0, 0, 100), square(10, 10, 20)}, Values: []any{100.0*100 - 20*20}},
			},
		},
		{
			Name: "outlines", Geometry: MultiPolygon,
			Fields: []Field{{"level", Real}},
			Features: []Feature{
				{Geometry: orb.MultiPolygon{{square(0, 0, 10)}, {square(20, 0, 10)}}, Values: []any{0.5}},
				{Geometry: orb.MultiPolygon{}, Values: []any{0.9}},
			},
		},
		{Name: "empty_layer", Geometry: LineString, Fields: []Field{{"x", Text}}},
	}
}

// gpkgHeader is a decoded GeoPackageBinary header.
type gpkgHeader struct {
	flags    byte
	srsID    int32
	envelope []float64 // as stored: minx, maxx, miny, maxy
	wkb      []byte
}

// decodeGPKGHeader decodes a little-endian GeoPackageBinary blob with an
// envelope code of 0 or 1 (test helper; OGC 12-128r18 §2.1.3.1.1).
func decodeGPKGHeader(b []byte) (gpkgHeader, error) {
	if len(b) < gpHeaderLen || b[0] != 'G' || b[1] != 'P' || b[2] != 0 {
		return gpkgHeader{}, errors.New("bad magic or version")
	}
	h := gpkgHeader{flags: b[3]}
	if h.flags&1 != 1 {
		return h, errors.New("header is not little endian")
	}
	h.srsID = int32(binary.LittleEndian.Uint32(b[4:8]))
	rest := b[8:]
	switch code := (h.flags >> 1) & 7; code {
	case 0:
	case 1:
		if len(rest) < 32 {
			return h, errors.New("short envelope")
		}
		for i := range 4 {
			h.envelope = append(h.envelope, math.Float64frombits(binary.LittleEndian.Uint64(rest[8*i:])))
		}
		rest = rest[32:]
	default:
		return h, fmt.Errorf("unexpected envelope code %d", code)
	}
	h.wkb = rest
	return h, nil
}

// decodeGPKGGeometry returns the geometry of a blob.
func decodeGPKGGeometry(b []byte) (gpkgHeader, orb.Geometry, error) {
	h, err := decodeGPKGHeader(b)
	if err != nil {
		return h, nil, err
	}
	g, err := wkb.Unmarshal(h.wkb)
	return h, g, err
}

// tempPath returns a path in a fresh temporary directory.
func tempPath(t *testing.T, name string) string {
	return filepath.Join(t.TempDir(), name)
}

// execWithStdin runs a program with stdin and returns its stdout; the test
// fails when the program fails or writes to stderr.
func execWithStdin(t *testing.T, stdin, name string, args ...string) string {
	t.Helper()
	cmd := exec.Command(name, args...)
	var stdout, stderr bytes.Buffer
	cmd.Stdin = strings.NewReader(stdin)
	cmd.Stdout, cmd.Stderr = &stdout, &stderr
	if err := cmd.Run(); err != nil {
		t.Fatalf("%s %s: %v\n%s", name, strings.Join(args, " "), err, stderr.String())
	}
	if stderr.Len() > 0 {
		t.Errorf("%s %s wrote to stderr:\n%s", name, strings.Join(args, " "), stderr.String())
	}
	return stdout.String()
}

// runToolAllowStderr runs a program that reports success on stderr (such
// as xmllint's "validates") and fails the test on a non-zero exit.
func runToolAllowStderr(t *testing.T, name string, args ...string) {
	t.Helper()
	out, err := exec.Command(name, args...).CombinedOutput()
	if err != nil {
		t.Errorf("%s %s: %v\n%s", name, strings.Join(args, " "), err, out)
	}
}
