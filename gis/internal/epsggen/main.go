// Command epsggen writes the table of projected CRSs that package gis
// converts (epsg_table.go) and the PROJ reference points that test it
// (testdata/epsg_cs2cs.txt), from PROJ's own database and its cs2cs.
//
// It selects every non-deprecated projected CRS of the EPSG dataset whose
// base geographic CRS is WGS 84 (EPSG:4326), NAD83 (4269), NAD83(HARN)
// (4152), NAD83(NSRS2007) (4759), NAD83(2011) (6318), NAD83(CSRS) (4617)
// or NAD27 (4267), whose conversion is transverse Mercator (EPSG method
// 9807) or Lambert conic conformal with one (9801) or two (9802) standard
// parallels, and whose axes are easting then northing in metres, feet or
// US survey feet. That covers UTM on these datums and the US State Plane
// zones (SPCS83 and SPCS27) in every unit the dataset has.
//
// Usage, from the gis folder (proj-bin installed):
//
//	go run ./internal/epsggen -db /usr/share/proj/proj.db
//
// Angles stored in sexagesimal DMS (EPSG unit 9110) are converted to
// degrees the way PROJ does: the value is printed with 12 decimals and
// read as DDD.MMSSssssssss.
package main

import (
	"bufio"
	"bytes"
	"database/sql"
	"flag"
	"fmt"
	"go/format"
	"log"
	"math"
	"os"
	"os/exec"
	"strconv"
	"strings"

	_ "modernc.org/sqlite"
)

// bases maps the EPSG code of each base geographic CRS to the identifier
// of its entry in gis (epsg.go).
var bases = map[int]string{
	4326: "baseWGS84", 4269: "baseNAD83", 4152: "baseNAD83HARN", 4759: "baseNAD83NSRS2007",
	6318: "baseNAD83_2011", 4617: "baseNAD83CSRS", 4267: "baseNAD27",
}

// units maps EPSG length unit codes to the identifiers of gis.
var units = map[int]string{9001: "Metre", 9002: "Foot", 9003: "USSurveyFoot"}

// unitMetres is the length of each unit, m: the metre; the international
// foot, 0.3048 m exactly; the US survey foot, 1200/3937 m exactly (EPSG
// dataset, units 9001–9003).
var unitMetres = map[int]float64{9001: 1, 9002: 0.3048, 9003: 1200.0 / 3937}

var methods = map[int]string{9807: "MethodTransverseMercator", 9801: "MethodLambertConic1SP", 9802: "MethodLambertConic2SP"}

// row is one selected projected CRS.
type row struct {
	code, base, method, unit       int
	name                           string
	lat0, lon0, k0, lat1, lat2     float64 // degrees; k0 unitless
	fe, fn                         float64 // CRS unit
	south, north, west, east       float64 // area of use, degrees
	hasLat0, hasLon0, hasK0, hasSP bool
}

func main() {
	db := flag.String("db", "/usr/share/proj/proj.db", "PROJ database")
	table := flag.String("table", "epsg_table.go", "Go table to write")
	points := flag.String("points", "testdata/epsg_cs2cs.txt", "cs2cs reference points to write")
	flag.Parse()
	conn, err := sql.Open("sqlite", "file:"+*db+"?mode=ro")
	if err != nil {
		log.Fatal(err)
	}
	defer conn.Close()
	version := metadata(conn)
	rows := selectRows(conn)
	if err := writeTable(*table, version, rows); err != nil {
		log.Fatal(err)
	}
	if err := writePoints(*points, version, rows); err != nil {
		log.Fatal(err)
	}
	log.Printf("%d CRSs", len(rows))
}

// metadata returns "PROJ x.y.z, EPSG dataset vN".
func metadata(db *sql.DB) string {
	get := func(k string) string {
		var v string
		if err := db.QueryRow(`SELECT value FROM metadata WHERE key = ?`, k).Scan(&v); err != nil {
			log.Fatal(err)
		}
		return v
	}
	return fmt.Sprintf("PROJ %s database, EPSG dataset %s (%s)", get("PROJ.VERSION"), get("EPSG.VERSION"), get("EPSG.DATE"))
}

func selectRows(db *sql.DB) []row {
	var codes []string
	for c := range bases {
		codes = append(codes, "'"+strconv.Itoa(c)+"'")
	}
	q := `SELECT p.code, p.name, p.geodetic_crs_code, c.method_code, p.coordinate_system_code,
	  c.param1_code, c.param1_value, c.param1_uom_code, c.param2_code, c.param2_value, c.param2_uom_code,
	  c.param3_code, c.param3_value, c.param3_uom_code, c.param4_code, c.param4_value, c.param4_uom_code,
	  c.param5_code, c.param5_value, c.param5_uom_code, c.param6_code, c.param6_value, c.param6_uom_code,
	  c.param7_code, c.param7_value, c.param7_uom_code
	  FROM projected_crs p JOIN conversion_table c
	    ON c.auth_name = p.conversion_auth_name AND c.code = p.conversion_code
	  WHERE p.auth_name = 'EPSG' AND p.deprecated = 0 AND c.deprecated = 0
	    AND p.geodetic_crs_auth_name = 'EPSG' AND p.geodetic_crs_code IN (` + strings.Join(codes, ",") + `)
	    AND c.method_auth_name = 'EPSG' AND c.method_code IN ('9801', '9802', '9807')
	  ORDER BY CAST(p.code AS INTEGER)`
	rs, err := db.Query(q)
	if err != nil {
		log.Fatal(err)
	}
	defer rs.Close()
	var out []row
	type rawRow struct {
		code, base, method, cs int
		name                   string
		params                 [7]struct {
			code  sql.NullInt64
			value sql.NullFloat64
			uom   sql.NullInt64
		}
	}
	var raws []rawRow
	for rs.Next() {
		var r rawRow
		dst := []any{&r.code, &r.name, &r.base, &r.method, &r.cs}
		for i := range r.params {
			dst = append(dst, &r.params[i].code, &r.params[i].value, &r.params[i].uom)
		}
		if err := rs.Scan(dst...); err != nil {
			log.Fatal(err)
		}
		raws = append(raws, r)
	}
	if err := rs.Err(); err != nil {
		log.Fatal(err)
	}
	skipped := 0
	for _, r := range raws {
		unit, ok := eastNorthUnit(db, r.cs)
		if !ok {
			skipped++
			continue
		}
		o := row{code: r.code, base: r.base, method: r.method, unit: unit, name: r.name, k0: 1}
		for _, p := range r.params {
			if !p.code.Valid {
				continue
			}
			v := p.value.Float64
			switch uom := int(p.uom.Int64); uom {
			case 9102, 9201:
			case 9110:
				v = dmsToDegrees(v)
			case 9001, 9002, 9003:
				v = v * unitMetres[uom] / unitMetres[unit]
			default:
				log.Fatalf("EPSG:%d: parameter %d in unit %d", r.code, p.code.Int64, uom)
			}
			switch p.code.Int64 {
			case 8801, 8821:
				o.lat0, o.hasLat0 = v, true
			case 8802, 8822:
				o.lon0, o.hasLon0 = v, true
			case 8805:
				o.k0, o.hasK0 = v, true
			case 8806, 8826:
				o.fe = v
			case 8807, 8827:
				o.fn = v
			case 8823:
				o.lat1, o.hasSP = v, true
			case 8824:
				o.lat2 = v
			default:
				log.Fatalf("EPSG:%d: unexpected parameter %d", r.code, p.code.Int64)
			}
		}
		if !o.hasLat0 || !o.hasLon0 || (r.method != 9802) != o.hasK0 || (r.method == 9802) != o.hasSP {
			log.Fatalf("EPSG:%d: incomplete parameters for method %d", r.code, r.method)
		}
		o.south, o.north, o.west, o.east = extent(db, r.code)
		out = append(out, o)
	}
	log.Printf("skipped %d CRSs whose axes are not easting, northing in m, ft or ftUS", skipped)
	return out
}

// eastNorthUnit returns the EPSG unit of a 2-D coordinate system whose
// first axis points east and second north in one unit of unitMetres.
func eastNorthUnit(db *sql.DB, cs int) (int, bool) {
	rs, err := db.Query(`SELECT orientation, uom_code FROM axis
	  WHERE coordinate_system_auth_name = 'EPSG' AND coordinate_system_code = ? ORDER BY coordinate_system_order`, strconv.Itoa(cs))
	if err != nil {
		log.Fatal(err)
	}
	defer rs.Close()
	var dirs []string
	var uoms []int
	for rs.Next() {
		var d string
		var u int
		if err := rs.Scan(&d, &u); err != nil {
			log.Fatal(err)
		}
		dirs, uoms = append(dirs, d), append(uoms, u)
	}
	if len(dirs) != 2 || dirs[0] != "east" || dirs[1] != "north" || uoms[0] != uoms[1] {
		return 0, false
	}
	_, ok := unitMetres[uoms[0]]
	return uoms[0], ok
}

// extent returns the area of use of a CRS (the first one listed), degrees.
func extent(db *sql.DB, code int) (s, n, w, e float64) {
	err := db.QueryRow(`SELECT x.south_lat, x.north_lat, x.west_lon, x.east_lon FROM usage u
	  JOIN extent x ON x.auth_name = u.extent_auth_name AND x.code = u.extent_code
	  WHERE u.object_table_name = 'projected_crs' AND u.object_auth_name = 'EPSG' AND u.object_code = ?
	  ORDER BY CAST(x.code AS INTEGER) LIMIT 1`, strconv.Itoa(code)).Scan(&s, &n, &w, &e)
	if err != nil {
		log.Fatalf("EPSG:%d: extent: %v", code, err)
	}
	return s, n, w, e
}

// dmsToDegrees converts EPSG sexagesimal DMS (DDD.MMSSsss, unit 9110) to
// degrees as PROJ does: print with 12 decimals, read minutes and seconds
// from the digits.
func dmsToDegrees(v float64) float64 {
	s := strconv.FormatFloat(math.Abs(v), 'f', 12, 64)
	dot := strings.IndexByte(s, '.')
	deg, _ := strconv.ParseFloat(s[:dot], 64)
	min, _ := strconv.ParseFloat(s[dot+1:dot+3], 64)
	sec, _ := strconv.ParseFloat(s[dot+3:], 64)
	sec /= 1e8 // 10 digits, two of them before the decimal point
	d := deg + min/60 + sec/3600
	if v < 0 {
		return -d
	}
	return d
}

func g(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

func writeTable(path, version string, rows []row) error {
	var b bytes.Buffer
	fmt.Fprintf(&b, "// Code generated by internal/epsggen from the %s; DO NOT EDIT.\n\n", version)
	b.WriteString("package gis\n\n")
	fmt.Fprintf(&b, "// epsgSource names the database the table was generated from.\nconst epsgSource = %q\n\n", version)
	b.WriteString("// epsgTable lists the projected CRSs this package converts, sorted by code.\n")
	b.WriteString("// Angles are in degrees, the false easting and northing in the CRS unit.\n")
	b.WriteString("var epsgTable = [...]epsgCRS{\n")
	for _, r := range rows {
		fmt.Fprintf(&b, "\t{%d, %q, %s, %s, %s, %s, %s, %s, %s, %s, %s, %s},\n", r.code, r.name, bases[r.base], units[r.unit], methods[r.method],
			g(r.lat0), g(r.lon0), g(r.k0), g(r.lat1), g(r.lat2), g(r.fe), g(r.fn))
	}
	b.WriteString("}\n")
	src, err := format.Source(b.Bytes())
	if err != nil {
		return err
	}
	return os.WriteFile(path, src, 0o644)
}

// writePoints projects two points of each CRS's area of use with cs2cs:
// the centre and a point 10 % from its west and north edges.
func writePoints(path, version string, rows []row) error {
	var b bytes.Buffer
	cs2csVersion, _ := exec.Command("cs2cs").CombinedOutput()
	first, _, _ := strings.Cut(string(cs2csVersion), "\n")
	fmt.Fprintf(&b, "# generated by internal/epsggen with cs2cs %s and the %s\n", strings.TrimSpace(first), version)
	b.WriteString("# command: cs2cs -f %.10f EPSG:<base geographic CRS> EPSG:<code> (no datum change)\n")
	b.WriteString("# epsg lon_deg lat_deg easting northing (easting and northing in the CRS unit)\n")
	for _, r := range rows {
		width := r.east - r.west
		if width < 0 {
			width += 360 // the area crosses the antimeridian
		}
		pts := [][2]float64{
			{r.west + 0.5*width, r.south + 0.5*(r.north-r.south)},
			{r.west + 0.1*width, r.south + 0.9*(r.north-r.south)},
		}
		var in strings.Builder
		for i := range pts {
			pts[i][0] = math.Round(math.Remainder(pts[i][0], 360)*1e6) / 1e6
			pts[i][1] = math.Round(pts[i][1]*1e6) / 1e6
			fmt.Fprintf(&in, "%s %s\n", g(pts[i][1]), g(pts[i][0])) // EPSG geographic CRSs are latitude first
		}
		cmd := exec.Command("cs2cs", "-f", "%.10f", "EPSG:"+strconv.Itoa(r.base), "EPSG:"+strconv.Itoa(r.code))
		cmd.Stdin = strings.NewReader(in.String())
		out, err := cmd.Output()
		if err != nil {
			return fmt.Errorf("cs2cs EPSG:%d: %v", r.code, err)
		}
		sc := bufio.NewScanner(bytes.NewReader(out))
		for i := 0; sc.Scan(); i++ {
			f := strings.Fields(sc.Text())
			if len(f) < 2 || i >= len(pts) || strings.Contains(sc.Text(), "*") {
				return fmt.Errorf("cs2cs EPSG:%d: unexpected output %q", r.code, sc.Text())
			}
			fmt.Fprintf(&b, "%d %s %s %s %s\n", r.code, g(pts[i][0]), g(pts[i][1]), f[0], f[1])
		}
	}
	return os.WriteFile(path, b.Bytes(), 0o644)
}
