package gis_test

import (
	"bytes"
	"context"
	"fmt"
	"log"
	"math"
	"os"
	"path/filepath"
	"strings"
	"time"

	"github.com/paulmach/orb"
	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/gis"
	"slipfront/internal/orient"
)

func ExampleParseCRS() {
	crs, err := gis.ParseCRS("EPSG:32614")
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println(crs, "is", crs.Name())
	_, err = gis.ParseCRS("EPSG:2056") // an oblique Mercator
	fmt.Println(err != nil)
	// Output:
	// EPSG:32614 is WGS 84 / UTM zone 14N
	// true
}

func ExamplePlacement_ToCRS() {
	// NAD83 / Texas Central (ftUS): the origin is given in metres (SI);
	// map coordinates come out in US survey feet.
	const ftUS = 1200.0 / 3937
	pl := gis.Placement{CRS: gis.CRS{EPSG: 2277}, Easting: 2300000 * ftUS, Northing: 10000000 * ftUS}
	q := pl.ToCRS(orb.Point{100, 0}) // 100 m east of the origin
	fmt.Printf("%s: E %.3f, N %.3f %s\n", pl.CRS.Name(), q[0], q[1], pl.CRS.Unit().Name)
	// Output: NAD83 / Texas Central (ftUS): E 2300328.083, N 10000000.000 US survey foot
}

func ExampleParseWKT() {
	crs, err := gis.ParseWKT(`PROJCS["Local TM (ftUS)",
	  GEOGCS["NAD83",DATUM["North_American_Datum_1983",SPHEROID["GRS 1980",6378137,298.257222101]],
	    PRIMEM["Greenwich",0],UNIT["degree",0.0174532925199433]],
	  PROJECTION["Transverse_Mercator"],
	  PARAMETER["latitude_of_origin",31],PARAMETER["central_meridian",-103.5],PARAMETER["scale_factor",0.9999],
	  PARAMETER["false_easting",656166.667],PARAMETER["false_northing",0],
	  UNIT["US survey foot",0.304800609601219]]`)
	if err != nil {
		log.Fatal(err)
	}
	pl := gis.Placement{CRS: crs, Easting: 200000, Northing: 0}
	geo, err := pl.Geographic()
	if err != nil {
		log.Fatal(err)
	}
	ll := geo.LonLat(orb.Point{0, 0}) // the natural origin
	fmt.Printf("%s in %s: lon %.6f, lat %.6f\n", crs.Name(), crs.Unit().Name, ll[0], ll[1])
	// Output: Local TM (ftUS) in US survey foot: lon -103.500000, lat 31.000000
}

func ExamplePlacement_Geographic() {
	pl := gis.Placement{CRS: gis.CRS{EPSG: 32614}, Easting: 500000, Northing: 3500000}
	geo, err := pl.Geographic()
	if err != nil {
		log.Fatal(err)
	}
	ll := geo.LonLat(orb.Point{0, 0})
	// PROJ's cs2cs gives -99.0000000000 31.6351862200 for this point.
	fmt.Printf("lon %.7f, lat %.7f\n", ll[0], ll[1])

	_, err = gis.Placement{CRS: gis.CRS{EPSG: 26714}}.Geographic() // NAD27: no datum shift here
	fmt.Println(err != nil)
	// Output:
	// lon -99.0000000, lat 31.6351862
	// true
}

func ExampleOutline() {
	// A 3×3 block of 10 m cells with its centre cell missing.
	g := gis.Grid{Cols: 3, Rows: 3, CellSize: 10}
	mask := []bool{
		true, true, true, // south row
		true, false, true,
		true, true, true, // north row
	}
	mp, err := gis.Outline(g, mask)
	if err != nil {
		log.Fatal(err)
	}
	fmt.Println(len(mp), "polygon with", len(mp[0])-1, "hole")
	fmt.Println("exterior:", mp[0][0])
	fmt.Println("hole:", mp[0][1])
	// Output:
	// 1 polygon with 1 hole
	// exterior: [[0 0] [30 0] [30 30] [0 30] [0 0]]
	// hole: [[10 10] [10 20] [20 20] [20 10] [10 10]]
}

func ExampleWriteGeoJSON() {
	pl := gis.Placement{CRS: gis.CRS{EPSG: 32614}, Easting: 500000, Northing: 3500000}
	layer := gis.Layer{
		Name:     "wells",
		Geometry: gis.Point,
		Fields:   []gis.Field{{Name: "name", Type: gis.Text}},
		Features: []gis.Feature{{Geometry: orb.Point{0, 0}, Values: []any{"W-1"}}},
	}
	if err := gis.WriteGeoJSON(os.Stdout, pl, layer, nil); err != nil {
		log.Fatal(err)
	}
	// Output:
	// {"type":"FeatureCollection","name":"wells","features":[
	// {"type":"Feature","properties":{"name":"W-1"},"geometry":{"type":"Point","coordinates":[-99,31.6351862]}}
	// ]}
}

func ExampleWriteGeoPackage() {
	dir, err := os.MkdirTemp("", "gis-example")
	if err != nil {
		log.Fatal(err)
	}
	defer os.RemoveAll(dir)
	layers := []gis.Layer{{
		Name:     "traces",
		Geometry: gis.LineString,
		Fields:   []gis.Field{{Name: "slip_m", Type: gis.Real}},
		Features: []gis.Feature{{Geometry: orb.LineString{{-50, 0}, {50, 10}}, Values: []any{0.002}}},
	}}
	pl := gis.Placement{CRS: gis.CRS{EPSG: 32614}, Easting: 500000, Northing: 3500000}
	// Write to a temporary name, then rename: the file appears complete.
	tmp := filepath.Join(dir, "maps.gpkg.tmp")
	if err := gis.WriteGeoPackage(context.Background(), tmp, pl, layers, nil); err != nil {
		log.Fatal(err)
	}
	if err := os.Rename(tmp, filepath.Join(dir, "maps.gpkg")); err != nil {
		log.Fatal(err)
	}
	fmt.Println("written")
	// Output: written
}

func ExampleWriteGeoTIFF() {
	r := gis.Raster{
		Grid:   gis.Grid{Cols: 4, Rows: 3, CellSize: 25, XMin: -50, YMin: -25},
		Data:   make([]float32, 12), // row 0 is the south row
		NoData: -9999,
	}
	var buf bytes.Buffer
	pl := gis.Placement{CRS: gis.CRS{EPSG: 32614}, Easting: 500000, Northing: 3500000}
	if err := gis.WriteGeoTIFF(&buf, pl, r); err != nil {
		log.Fatal(err)
	}
	fmt.Printf("%q, %d bytes\n", buf.Bytes()[:4], buf.Len())
	// Output: "II*\x00", 352 bytes
}

func ExampleWriteQuakeML() {
	pl := gis.Placement{CRS: gis.CRS{EPSG: 32614}, Easting: 500000, Northing: 3500000}
	cat := gis.Catalog{
		ID:     "run-0001",
		Start:  time.Date(2030, 1, 1, 0, 0, 0, 0, time.UTC),
		Events: []gis.Event{{Time: 3.25, Depth: 2500, Magnitude: -1.2}},
	}
	var buf bytes.Buffer
	if err := gis.WriteQuakeML(&buf, pl, cat); err != nil {
		log.Fatal(err)
	}
	for _, line := range strings.Split(buf.String(), "\n") {
		if strings.Contains(line, "<value>") || strings.Contains(line, "<event ") {
			fmt.Println(strings.TrimSpace(line))
		}
	}
	// Output:
	// <event publicID="smi:local/run-0001/event/1">
	// <value>2030-01-01T00:00:03.250000Z</value>
	// <value>31.63518622</value>
	// <value>-99</value>
	// <value>2500</value>
	// <value>-1.2</value>
}

// A fracture disc and a rectangle as VTK polygons with per-fracture
// fields, in the CRS of the placement, z up (z = −depth).
func ExampleWriteVTKPolygons() {
	deg := math.Pi / 180
	strike, downDip := orient.Strike(90*deg), orient.DownDip(60*deg, 90*deg) // dipping 60° east
	polys := gis.VTKPolygons{
		Rings: [][]r3.Vec{
			gis.DiscRing(r3.Vec{X: 0, Y: 0, Z: -2600}, strike, downDip, 30, gis.DefaultDiscVertices),
			gis.RectangleRing(r3.Vec{X: 100, Y: 0, Z: -2600}, strike, downDip, 80, 20),
		},
		Fields: []gis.VTKField{
			{Name: "max_slip_mm", Values: []float64{1.2, 0}},
			{Name: "first_slip_time_s", Values: []float64{5400, math.NaN()}}, // NaN: never slipped
		},
	}
	pl := gis.Placement{CRS: gis.CRS{EPSG: 32614}, Easting: 500000, Northing: 3500000}
	var buf bytes.Buffer
	if err := gis.WriteVTKPolygons(&buf, pl, polys); err != nil {
		log.Fatal(err)
	}
	for _, line := range strings.Split(buf.String(), "\n") {
		if strings.HasPrefix(line, "<Piece") {
			fmt.Println(line)
		}
	}
	// Output:
	// <Piece NumberOfPoints="36" NumberOfVerts="0" NumberOfLines="0" NumberOfStrips="0" NumberOfPolys="2">
}

// A collection of snapshot times for ParaView: each time has the
// fractures (part 0) and the events so far (part 1).
func ExampleWritePVD() {
	err := gis.WritePVD(os.Stdout, []gis.PVDEntry{
		{Time: 0, Part: 0, File: "fractures_0000.vtp"},
		{Time: 0, Part: 1, File: "events_0000.vtp"},
		{Time: 3600, Part: 0, File: "fractures_0001.vtp"},
		{Time: 3600, Part: 1, File: "events_0001.vtp"},
	})
	if err != nil {
		log.Fatal(err)
	}
	// Output:
	// <?xml version="1.0"?>
	// <VTKFile type="Collection" version="0.1" byte_order="LittleEndian">
	// <Collection>
	// <DataSet timestep="0" group="" part="0" file="fractures_0000.vtp"/>
	// <DataSet timestep="0" group="" part="1" file="events_0000.vtp"/>
	// <DataSet timestep="3600" group="" part="0" file="fractures_0001.vtp"/>
	// <DataSet timestep="3600" group="" part="1" file="events_0001.vtp"/>
	// </Collection>
	// </VTKFile>
}
