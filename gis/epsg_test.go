package gis

import (
	"bufio"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	"slipfront/internal/numtest"
)

// epsgPoint is one line of testdata/epsg_cs2cs.txt: a point of a CRS's
// area of use and its projected coordinates by PROJ's cs2cs.
type epsgPoint struct {
	code              int
	lonDeg, latDeg    float64
	easting, northing float64 // CRS unit
}

// readEPSGPoints reads the reference points internal/epsggen wrote with
// cs2cs (PROJ 9.1.1).
func readEPSGPoints(t *testing.T) []epsgPoint {
	t.Helper()
	f, err := os.Open("testdata/epsg_cs2cs.txt")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var pts []epsgPoint
	sc := bufio.NewScanner(f)
	for sc.Scan() {
		line := sc.Text()
		if strings.HasPrefix(line, "#") {
			continue
		}
		fs := strings.Fields(line)
		if len(fs) != 5 {
			t.Fatalf("epsg_cs2cs.txt: bad line %q", line)
		}
		var v [5]float64
		for i, s := range fs {
			if v[i], err = strconv.ParseFloat(s, 64); err != nil {
				t.Fatalf("epsg_cs2cs.txt: %q: %v", line, err)
			}
		}
		pts = append(pts, epsgPoint{int(v[0]), v[1], v[2], v[3], v[4]})
	}
	if err := sc.Err(); err != nil {
		t.Fatal(err)
	}
	return pts
}

// TestEPSGTableVsCS2CS projects two points of every CRS of the table both
// ways and compares with PROJ's cs2cs: forward within lengthTol (1 mm on
// the ground, whatever the CRS unit), inverse within angleTol.
func TestEPSGTableVsCS2CS(t *testing.T) {
	pts := readEPSGPoints(t)
	if len(pts) != 2*len(epsgTable) {
		t.Fatalf("%d reference points for %d CRSs; want two each", len(pts), len(epsgTable))
	}
	seen := map[int]int{}
	var worstLen, worstAngle float64
	for _, p := range pts {
		seen[p.code]++
		c := CRS{EPSG: p.code}
		proj, err := c.Projection()
		if err != nil {
			t.Fatalf("EPSG:%d: %v", p.code, err)
		}
		u := c.Unit().Metres
		what := "EPSG:" + strconv.Itoa(p.code) + " " + c.Name()
		e, n := proj.Forward(p.lonDeg, p.latDeg)
		de, dn := e-p.easting*u, n-p.northing*u
		worstLen = max(worstLen, math.Abs(de), math.Abs(dn))
		numtest.Abs(t, what+" easting error, m", de, 0, lengthTol)
		numtest.Abs(t, what+" northing error, m", dn, 0, lengthTol)
		lon, lat := proj.Inverse(p.easting*u, p.northing*u)
		dlon, dlat := lonDiff(lon, p.lonDeg), lat-p.latDeg
		worstAngle = max(worstAngle, math.Abs(dlon), math.Abs(dlat))
		numtest.Abs(t, what+" longitude error", dlon, 0, angleTol)
		numtest.Abs(t, what+" latitude error", dlat, 0, angleTol)
	}
	for i := range epsgTable {
		if seen[epsgTable[i].code] != 2 {
			t.Errorf("EPSG:%d has %d reference points, want 2", epsgTable[i].code, seen[epsgTable[i].code])
		}
	}
	t.Logf("largest difference from cs2cs: %.2g m, %.2g°", worstLen, worstAngle)
}
