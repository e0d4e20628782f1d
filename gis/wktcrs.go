package gis

import (
	"math"
	"strings"
)

// ParseWKT reads a projected CRS from its WKT text: WKT1 (OGC 01-009,
// PROJCS, including the GDAL and ESRI spellings) or WKT2 (ISO 19162:2019,
// PROJCRS). It reads the name, the length unit of the axes (which must
// point east and north), the datum and ellipsoid of the base geographic
// CRS, the projection method and its parameters, and the EPSG identifier
// when there is one. A COMPOUNDCRS or COMPD_CS gives its projected part
// and a BOUNDCRS its source CRS (its transformation is not used).
//
// Any projection method is accepted, since placing local coordinates
// needs only the unit; CRS.Projection, and so GeoJSON and QuakeML, work
// for transverse Mercator and Lambert conic conformal (1SP, 2SP). Errors
// are *WKTError with the line and column.
func ParseWKT(text string) (CRS, error) {
	root, err := parseWKTTree(text)
	if err != nil {
		return CRS{}, err
	}
	r := wktReader{src: text}
	n, err := r.unwrap(root)
	if err != nil {
		return CRS{}, err
	}
	var d *crsDef
	switch n.keyword {
	case "PROJCS":
		d, err = r.wkt1(n)
	default: // PROJCRS, PROJECTEDCRS
		d, err = r.wkt2(n)
	}
	if err != nil {
		return CRS{}, err
	}
	d.name, d.epsg, d.wkt = n.name(), n.epsgCode(), compactWKT(text)
	if d.name == "" {
		return CRS{}, r.errorAt(n, "%s has no name", n.keyword)
	}
	return CRS{EPSG: d.epsg, wkt: d}, nil
}

// wktReader interprets a parsed tree; src is kept for error positions.
type wktReader struct{ src string }

func (r wktReader) errorAt(n *wktNode, format string, args ...any) error {
	return wktErrorAt(r.src, n.off, format, args...)
}

// unwrap returns the projected CRS element of root.
func (r wktReader) unwrap(root *wktNode) (*wktNode, error) {
	n := root
	for range maxWKTDepth {
		switch n.keyword {
		case "PROJCS", "PROJCRS", "PROJECTEDCRS":
			return n, nil
		case "COMPOUNDCRS", "COMPD_CS":
			p := n.child("PROJCS", "PROJCRS", "PROJECTEDCRS")
			if p == nil {
				return nil, r.errorAt(n, "%s has no projected part (PROJCS or PROJCRS)", n.keyword)
			}
			n = p
		case "BOUNDCRS":
			src := n.child("SOURCECRS")
			if src == nil || len(src.args) == 0 || src.args[0].kind != argElement {
				return nil, r.errorAt(n, "BOUNDCRS has no SOURCECRS element")
			}
			n = src.args[0].node
		case "GEOGCS", "GEOGCRS", "GEODCRS", "GEOGRAPHICCRS", "GEODETICCRS":
			return nil, r.errorAt(n, "%s is a geographic CRS (degrees); local coordinates in metres need a projected CRS (PROJCS or PROJCRS)", n.keyword)
		default:
			return nil, r.errorAt(n, "%s is not a projected CRS; want PROJCS (WKT1) or PROJCRS (WKT2)", n.keyword)
		}
	}
	return nil, r.errorAt(root, "CRS elements nested too deep")
}

// wktParam is a projection parameter, with the kind of unit it takes.
type wktParam int

const (
	paramLatOrigin wktParam = iota
	paramLonOrigin
	paramScale
	paramFalseEasting
	paramFalseNorthing
	paramStdParallel1
	paramStdParallel2
	numParams
)

func (p wktParam) isAngle() bool {
	return p == paramLatOrigin || p == paramLonOrigin || p == paramStdParallel1 || p == paramStdParallel2
}

func (p wktParam) isLength() bool { return p == paramFalseEasting || p == paramFalseNorthing }

// paramByCode maps EPSG parameter codes to parameters (EPSG dataset:
// 8801/8802 latitude/longitude of natural origin, 8805 scale factor,
// 8806/8807 false easting/northing, 8821/8822 latitude/longitude of false
// origin, 8823/8824 standard parallels, 8826/8827 easting/northing at
// false origin).
var paramByCode = map[int]wktParam{
	8801: paramLatOrigin, 8821: paramLatOrigin, 8802: paramLonOrigin, 8822: paramLonOrigin,
	8805: paramScale, 8806: paramFalseEasting, 8826: paramFalseEasting, 8807: paramFalseNorthing, 8827: paramFalseNorthing,
	8823: paramStdParallel1, 8824: paramStdParallel2,
}

// paramByName maps names, lower case with only letters and digits kept,
// to parameters: the WKT1 names of OGC 01-009 and GDAL, ESRI's, and the
// EPSG names WKT2 uses.
var paramByName = map[string]wktParam{
	"latitudeoforigin": paramLatOrigin, "latitudeofnaturalorigin": paramLatOrigin, "latitudeoffalseorigin": paramLatOrigin,
	"centralmeridian": paramLonOrigin, "longitudeofnaturalorigin": paramLonOrigin, "longitudeoffalseorigin": paramLonOrigin,
	"longitudeoforigin": paramLonOrigin, "scalefactor": paramScale, "scalefactoratnaturalorigin": paramScale,
	"falseeasting": paramFalseEasting, "eastingatfalseorigin": paramFalseEasting,
	"falsenorthing": paramFalseNorthing, "northingatfalseorigin": paramFalseNorthing,
	"standardparallel1": paramStdParallel1, "latitudeof1ststandardparallel": paramStdParallel1,
	"standardparallel2": paramStdParallel2, "latitudeof2ndstandardparallel": paramStdParallel2,
}

// methodByName maps normalised method names to methods; "lambert
// conformal conic" without a suffix (ESRI) is decided by its parameters.
var methodByName = map[string]Method{
	"transversemercator": MethodTransverseMercator, "gausskruger": MethodTransverseMercator,
	"lambertconformalconic1sp": MethodLambertConic1SP, "lambertconicconformal1sp": MethodLambertConic1SP,
	"lambertconformalconic2sp": MethodLambertConic2SP, "lambertconicconformal2sp": MethodLambertConic2SP,
}

const esriLambert = "lambertconformalconic"

// methodOf returns the method named name with EPSG code code (0 if
// none), 0 when it is not implemented; the code decides when there is
// one. esri reports ESRI's "Lambert_Conformal_Conic", which the
// parameters decide.
func methodOf(name string, code int) (m Method, esri bool) {
	if code != 0 {
		if _, ok := paramsOf[Method(code)]; ok {
			return Method(code), false
		}
		return 0, false
	}
	n := normName(name)
	return methodByName[n], n == esriLambert
}

// normName keeps the lower-case letters and digits of s.
func normName(s string) string {
	var b strings.Builder
	for _, c := range strings.ToLower(s) {
		if c >= 'a' && c <= 'z' || c >= '0' && c <= '9' {
			b.WriteRune(c)
		}
	}
	return b.String()
}

// wktParams collects parameter values in degrees, metres or unitless.
type wktParams struct {
	v   [numParams]float64
	set [numParams]bool
}

// add stores parameter p of node n; unknown parameters of an
// implemented method are errors.
func (r wktReader) add(ps *wktParams, n *wktNode, known bool, convert func(wktParam) (float64, error)) error {
	p, ok := paramByCode[n.epsgCode()]
	if !ok {
		p, ok = paramByName[normName(n.name())]
	}
	if !ok {
		if known {
			return r.errorAt(n, "parameter %q is not one of the method's (latitude/longitude of origin, scale factor, false easting/northing, standard parallels)", n.name())
		}
		return nil
	}
	v, err := convert(p)
	if err != nil {
		return err
	}
	ps.v[p], ps.set[p] = v, true
	return nil
}

// conversion builds the projection from method name and parameters.
func (r wktReader) conversion(n *wktNode, methodName string, code int, ps *wktParams) (Conversion, error) {
	m, esri := methodOf(methodName, code)
	if esri {
		m = MethodLambertConic1SP
		if ps.set[paramStdParallel2] {
			m = MethodLambertConic2SP
		} else if !ps.set[paramLatOrigin] && ps.set[paramStdParallel1] {
			ps.v[paramLatOrigin], ps.set[paramLatOrigin] = ps.v[paramStdParallel1], true
		}
		if m == MethodLambertConic1SP { // ESRI repeats the latitude of origin as Standard_Parallel_1
			ps.v[paramStdParallel1], ps.set[paramStdParallel1] = 0, false
		}
	}
	if m == 0 {
		return Conversion{}, nil
	}
	if m == MethodLambertConic2SP && ps.set[paramScale] && ps.v[paramScale] == 1 {
		ps.set[paramScale] = false // ESRI writes Scale_Factor 1 for 2SP
	}
	for p := range numParams {
		if ps.set[p] && !paramsOf[m][p] {
			return Conversion{}, r.errorAt(n, "%v takes no %s", m, paramNames[p])
		}
	}
	if m == MethodLambertConic2SP && !(ps.set[paramStdParallel1] && ps.set[paramStdParallel2]) {
		return Conversion{}, r.errorAt(n, "%v needs both standard parallels", m)
	}
	cv := Conversion{Method: m, LatOrigin: ps.v[paramLatOrigin], LonOrigin: ps.v[paramLonOrigin], Scale: 1,
		StdParallel1: ps.v[paramStdParallel1], StdParallel2: ps.v[paramStdParallel2],
		FalseEasting: ps.v[paramFalseEasting], FalseNorthing: ps.v[paramFalseNorthing]}
	if ps.set[paramScale] {
		cv.Scale = ps.v[paramScale]
	}
	return cv, nil
}

// paramsOf lists the parameters each method takes (IOGP Guidance Note
// 7-2: methods 9807, 9801, 9802).
var paramsOf = map[Method][numParams]bool{
	MethodTransverseMercator: {paramLatOrigin: true, paramLonOrigin: true, paramScale: true, paramFalseEasting: true, paramFalseNorthing: true},
	MethodLambertConic1SP:    {paramLatOrigin: true, paramLonOrigin: true, paramScale: true, paramFalseEasting: true, paramFalseNorthing: true},
	MethodLambertConic2SP: {paramLatOrigin: true, paramLonOrigin: true, paramStdParallel1: true, paramStdParallel2: true,
		paramFalseEasting: true, paramFalseNorthing: true},
}

var paramNames = [numParams]string{"latitude of origin", "longitude of origin", "scale factor", "false easting", "false northing",
	"first standard parallel", "second standard parallel"}

// unit reads UNIT/LENGTHUNIT/ANGLEUNIT/SCALEUNIT[name, factor]: the
// factor to metres, radians or unity.
func (r wktReader) unit(n *wktNode) (string, float64, error) {
	f, ok := n.number(1)
	if !ok || !(f > 0) {
		return "", 0, r.errorAt(n, "%s needs a name and a conversion factor > 0", n.keyword)
	}
	return n.name(), f, nil
}

// degree is the angle unit in radians. WKT prints it as
// 0.0174532925199433 (15 digits); a factor within knownUnitTol of it is
// taken as exactly π/180, so that degrees read back as printed.
const degree = math.Pi / 180

func canonicalAngle(f float64) float64 {
	if math.Abs(f-degree) <= knownUnitTol*degree {
		return degree
	}
	return f
}

// axes checks that the axes, if given, point east and north.
func (r wktReader) axes(n *wktNode) error {
	axes := n.children("AXIS")
	if cs := n.child("CS"); cs != nil && len(axes) == 0 {
		return r.errorAt(cs, "CS has no AXIS elements")
	}
	if len(axes) == 0 {
		return nil // WKT1 default: easting, northing
	}
	dirs := make([]string, len(axes))
	for i, a := range axes {
		if len(a.args) > 1 && a.args[1].kind == argWord {
			dirs[i] = strings.ToLower(a.args[1].text)
		}
	}
	if len(dirs) != 2 || !(dirs[0] == "east" && dirs[1] == "north" || dirs[0] == "north" && dirs[1] == "east") {
		return r.errorAt(axes[0], "axes %q: only two axes pointing east and north are supported", dirs)
	}
	return nil
}

// datumTies maps EPSG datum codes to their relation to WGS 84 (EPSG
// dataset: 6326 WGS 84; 6269 NAD83, 6152 NAD83(HARN), 6759
// NAD83(NSRS2007), 1116 NAD83(2011), 6140 NAD83(CSRS)).
var datumTies = map[int]wgs84Tie{6326: tieExact, 6269: tieMetre, 6152: tieMetre, 6759: tieMetre, 1116: tieMetre, 6140: tieMetre}

// datumNameTies maps normalised datum names (EPSG, GDAL WKT1 and ESRI
// spellings) to their relation to WGS 84.
var datumNameTies = map[string]wgs84Tie{
	"wgs84": tieExact, "wgs1984": tieExact, "dwgs1984": tieExact, "worldgeodeticsystem1984": tieExact,
	"worldgeodeticsystem1984ensemble": tieExact,
	"nad83":                           tieMetre, "northamericandatum1983": tieMetre, "dnorthamerican1983": tieMetre,
	"nad83highaccuracyreferencenetwork": tieMetre, "nad83harn": tieMetre, "dnorthamerican1983harn": tieMetre,
	"nad83nationalspatialreferencesystem2007": tieMetre, "nad83nationalspatialreferencesystem2011": tieMetre,
	"nad83canadianspatialreferencesystem": tieMetre, "nad83csrs": tieMetre,
}

// tie decides how datum node dn relates to WGS 84: a datum known by EPSG
// code or name first, then a TOWGS84 element (WKT1), then NAD27's refusal.
func tie(d *crsDef, dn *wktNode) {
	if t, ok := datumTies[d.datumEPSG]; ok {
		d.tie = t
		return
	}
	name := normName(d.datumName)
	if t, ok := datumNameTies[name]; ok {
		d.tie = t
		return
	}
	if tw := dn.child("TOWGS84"); tw != nil && (len(tw.args) == 3 || len(tw.args) == 7) {
		v := make([]float64, len(tw.args))
		for i := range tw.args {
			var ok bool
			if v[i], ok = tw.number(i); !ok {
				return
			}
		}
		h := newHelmert(v)
		d.tie, d.helmert = tieHelmert, &h
		return
	}
	if d.datumEPSG == baseNAD27.datumCode || strings.Contains(name, "1927") && strings.Contains(name, "northamerica") {
		d.tieNote = nad27Refusal
	}
}

// ellipsoid reads SPHEROID/ELLIPSOID[name, a, 1/f, LENGTHUNIT?].
func (r wktReader) ellipsoid(dn *wktNode) (Ellipsoid, error) {
	en := dn.child("SPHEROID", "ELLIPSOID")
	if en == nil {
		return Ellipsoid{}, r.errorAt(dn, "%s has no ELLIPSOID (SPHEROID)", dn.keyword)
	}
	a, okA := en.number(1)
	rf, okF := en.number(2)
	if !okA || !okF {
		return Ellipsoid{}, r.errorAt(en, "%s needs a name, a semi-major axis and an inverse flattening", en.keyword)
	}
	if u := en.child("LENGTHUNIT", "UNIT"); u != nil {
		_, f, err := r.unit(u)
		if err != nil {
			return Ellipsoid{}, err
		}
		a *= f
	}
	el := Ellipsoid{SemiMajorAxis: a, InverseFlattening: rf}
	if err := el.validate(); err != nil {
		return Ellipsoid{}, r.errorAt(en, "%v", err)
	}
	return el, nil
}

// base reads the geographic base CRS gn: its name, datum, ellipsoid,
// prime meridian, and its angular unit (radians per unit; degree if none).
func (r wktReader) base(d *crsDef, gn *wktNode, datumKeywords ...string) (angle float64, err error) {
	d.geogName, d.geogEPSG = gn.name(), gn.epsgCode()
	dn := gn.child(datumKeywords...)
	if dn == nil {
		return 0, r.errorAt(gn, "%s has no DATUM", gn.keyword)
	}
	d.datumName, d.datumEPSG = dn.name(), dn.epsgCode()
	if d.el, err = r.ellipsoid(dn); err != nil {
		return 0, err
	}
	tie(d, dn)
	angle = degree
	if u := gn.child("UNIT", "ANGLEUNIT"); u != nil {
		if _, angle, err = r.unit(u); err != nil {
			return 0, err
		}
		angle = canonicalAngle(angle)
	}
	if pm := gn.child("PRIMEM", "PRIMEMERIDIAN"); pm != nil {
		v, ok := pm.number(1)
		if !ok {
			return 0, r.errorAt(pm, "%s needs a name and a longitude", pm.keyword)
		}
		f := angle
		if u := pm.child("ANGLEUNIT", "UNIT"); u != nil {
			if _, f, err = r.unit(u); err != nil {
				return 0, err
			}
			f = canonicalAngle(f)
		}
		d.primeMeridian = v * f / degree
	}
	return angle, nil
}

// wkt1 reads PROJCS[name, GEOGCS, PROJECTION, PARAMETER…, UNIT, AXIS…,
// AUTHORITY] (OGC 01-009 §7.2; parameters in the GEOGCS angular unit and
// the PROJCS linear unit).
func (r wktReader) wkt1(n *wktNode) (*crsDef, error) {
	d := &crsDef{}
	gn := n.child("GEOGCS")
	if gn == nil {
		return nil, r.errorAt(n, "PROJCS has no GEOGCS")
	}
	angle, err := r.base(d, gn, "DATUM")
	if err != nil {
		return nil, err
	}
	un := n.child("UNIT")
	if un == nil {
		return nil, r.errorAt(n, "PROJCS has no linear UNIT")
	}
	name, f, err := r.unit(un)
	if err != nil {
		return nil, err
	}
	d.unit = canonicalUnit(name, f)
	if err := r.axes(n); err != nil {
		return nil, err
	}
	pn := n.child("PROJECTION")
	if pn == nil {
		return nil, r.errorAt(n, "PROJCS has no PROJECTION")
	}
	d.methodName = pn.name()
	code := pn.epsgCode()
	var ps wktParams
	m, esri := methodOf(d.methodName, code)
	known := m != 0 || esri
	for _, p := range n.children("PARAMETER") {
		v, ok := p.number(1)
		if !ok {
			return nil, r.errorAt(p, "PARAMETER needs a name and a number")
		}
		err := r.add(&ps, p, known, func(k wktParam) (float64, error) {
			switch {
			case k.isAngle():
				return v * angle / degree, nil
			case k.isLength():
				return v * d.unit.Metres, nil
			}
			return v, nil
		})
		if err != nil {
			return nil, err
		}
	}
	if d.conv, err = r.conversion(pn, d.methodName, code, &ps); err != nil {
		return nil, err
	}
	return d, nil
}

// wkt2 reads PROJCRS[name, BASEGEOGCRS, CONVERSION, CS, AXIS…,
// LENGTHUNIT?, USAGE…, ID] (ISO 19162:2019 §9 and §13). A parameter
// without its own unit takes the base CRS's angular unit or the axes'
// length unit.
func (r wktReader) wkt2(n *wktNode) (*crsDef, error) {
	d := &crsDef{}
	gn := n.child("BASEGEOGCRS", "BASEGEODCRS", "GEOGCRS", "GEODCRS")
	if gn == nil {
		return nil, r.errorAt(n, "%s has no BASEGEOGCRS", n.keyword)
	}
	angle, err := r.base(d, gn, "DATUM", "GEODETICDATUM", "TRF", "ENSEMBLE")
	if err != nil {
		return nil, err
	}
	if err := r.axes(n); err != nil {
		return nil, err
	}
	if d.unit, err = r.axisUnit(n); err != nil {
		return nil, err
	}
	cn := n.child("CONVERSION")
	if cn == nil {
		return nil, r.errorAt(n, "%s has no CONVERSION", n.keyword)
	}
	mn := cn.child("METHOD", "PROJECTION")
	if mn == nil {
		return nil, r.errorAt(cn, "CONVERSION has no METHOD")
	}
	d.methodName = mn.name()
	code := mn.epsgCode()
	m, esri := methodOf(d.methodName, code)
	known := m != 0 || esri
	var ps wktParams
	for _, p := range cn.children("PARAMETER") {
		v, ok := p.number(1)
		if !ok {
			return nil, r.errorAt(p, "PARAMETER needs a name and a number")
		}
		err := r.add(&ps, p, known, func(k wktParam) (float64, error) {
			f := 1.0
			switch {
			case k.isAngle():
				f = angle
			case k.isLength():
				f = d.unit.Metres
			}
			if u := p.child("LENGTHUNIT", "ANGLEUNIT", "SCALEUNIT", "UNIT"); u != nil {
				_, uf, err := r.unit(u)
				if err != nil {
					return 0, err
				}
				f = uf
				if k.isAngle() {
					f = canonicalAngle(f)
				}
			}
			if k.isAngle() {
				return v * f / degree, nil
			}
			return v * f, nil
		})
		if err != nil {
			return nil, err
		}
	}
	if d.conv, err = r.conversion(mn, d.methodName, code, &ps); err != nil {
		return nil, err
	}
	return d, nil
}

// axisUnit returns the length unit of a WKT2 projected CRS: the axes'
// LENGTHUNIT, or the one that follows them.
func (r wktReader) axisUnit(n *wktNode) (LinearUnit, error) {
	var units []*wktNode
	for _, a := range n.children("AXIS") {
		if u := a.child("LENGTHUNIT", "UNIT"); u != nil {
			units = append(units, u)
		}
	}
	if u := n.child("LENGTHUNIT", "UNIT"); u != nil {
		units = append(units, u)
	}
	if len(units) == 0 {
		return LinearUnit{}, r.errorAt(n, "%s has no LENGTHUNIT for its axes", n.keyword)
	}
	var out LinearUnit
	for i, u := range units {
		name, f, err := r.unit(u)
		if err != nil {
			return LinearUnit{}, err
		}
		lu := canonicalUnit(name, f)
		if i > 0 && lu.Metres != out.Metres {
			return LinearUnit{}, r.errorAt(u, "the axes have different units (%g m and %g m)", out.Metres, lu.Metres)
		}
		out = lu
	}
	return out, nil
}
