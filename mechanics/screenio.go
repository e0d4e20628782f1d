package mechanics

import (
	"bufio"
	"encoding/json"
	"io"
	"math"
	"strconv"
	"strings"

	"slipfront/internal/csvw"
	"slipfront/internal/orient"
)

// Fixed decimals of the screening outputs, so that the files are
// byte-for-byte reproducible.
const (
	mpaDecimals    = 6 // stresses and pressures in MPa: 1 Pa
	ratioDecimals  = 6 // tendencies, shares, friction, stress ratios
	degDecimals    = 3 // angles in degrees
	metreDecimals  = 3 // lengths, m, and areas, m²
	percentDecimal = 1 // percentages in the summary
)

const (
	toMPa = 1e-6
	toDeg = 180 / math.Pi
)

// appendFixed appends v with prec decimals, writing a value that rounds
// to zero as "0.000…" rather than "-0.000…".
func appendFixed(b []byte, v float64, prec int) []byte {
	start := len(b)
	b = strconv.AppendFloat(b, v, 'f', prec, 64)
	if b[start] == '-' {
		for _, c := range b[start+1:] {
			if c != '0' && c != '.' {
				return b
			}
		}
		b = append(b[:start], b[start+1:]...)
	}
	return b
}

// fixed returns v with prec decimals (see appendFixed).
func fixed(v float64, prec int) string { return string(appendFixed(nil, v, prec)) }

// number returns v with prec decimals as a JSON number.
func number(v float64, prec int) json.Number { return json.Number(fixed(v, prec)) }

// rakeDegrees returns the rake in degrees, in (−180, 180] as printed: a
// rake that would print as −180.000 (pure right-lateral slip) prints as
// 180.000.
func rakeDegrees(rake float64) float64 {
	d := rake * toDeg
	if d < -180+0.5*math.Pow10(-degDecimals) {
		d += 360
	}
	return d
}

// ScreenTable describes the per-fracture screening table (screen.csv) for
// csv-metadata.json (package csvw); its URL is left to the folder's owner.
var ScreenTable = csvw.Table{
	Title: "screen",
	Description: "Pre-injection screening: the in-situ stress (after production before the stimulation, the depleted stress and pore " +
		"pressure at the fracture's centre) resolved on every fracture, its slip tendency and the pore-pressure increase at which it " +
		"slips (Mohr-Coulomb, total stresses held fixed). Stresses compression-positive, in MPa.",
	Columns: []csvw.Column{
		{Title: "fracture_id", Datatype: csvw.Integer, Description: "index of the fracture in the network (fracture_id of fractures.csv)"},
		{Title: "set", Datatype: csvw.Integer, Description: "index of the fracture's set in the scenario; -1 for mapped fractures"},
		{Title: "dip_deg", Datatype: csvw.Double, Unit: "deg", Description: "dip, 0 to 90"},
		{Title: "dip_direction_deg", Datatype: csvw.Double, Unit: "deg", Description: "dip direction, clockwise from north, 0 to 360"},
		{Title: "sigma_n_MPa", Datatype: csvw.Double, Unit: "MPa", Description: "total normal stress on the plane, compression positive"},
		{Title: "tau_MPa", Datatype: csvw.Double, Unit: "MPa", Description: "shear stress on the plane"},
		{Title: "slip_tendency", Datatype: csvw.Double, Description: "effective slip tendency tau / (sigma_n - pore pressure)"},
		{Title: "dilation_tendency", Datatype: csvw.Double, Description: "(S1 - sigma_n) / (S1 - S3)"},
		{Title: "critical_dp_MPa", Datatype: csvw.Double, Unit: "MPa", Description: "pore-pressure increase at which the plane slips; <= 0 when it is critical already"},
		{Title: "rake_deg", Datatype: csvw.Double, Unit: "deg", Description: "rake of the hanging-wall slip direction, (-180, 180]"},
		{Title: "area_m2", Datatype: csvw.Double, Unit: "m2", Description: "area of one face of the fracture"},
		{Title: "trace_length_m", Datatype: csvw.Double, Unit: "m", Description: "length of the fracture's trace on the layer mid-plane"},
		{Title: "slip_tendency_total", Datatype: csvw.Double, Description: "slip tendency with total stress tau / sigma_n (Morris et al. 1996)"},
		{Title: "set_name", Datatype: csvw.String, Description: "name of the fracture's set"},
	},
}

// CurveTable describes the slip-versus-pressure curve (slip-vs-dp.csv).
var CurveTable = csvw.Table{
	Title:       "slip versus pressure",
	Description: "Shares of the fractures that slip at each pore-pressure increase, total stresses held fixed.",
	Columns: []csvw.Column{
		{Title: "pressure_increase_MPa", Datatype: csvw.Double, Unit: "MPa", Description: "pore-pressure increase above the initial pore pressure"},
		{Title: "slipping_area_m2", Datatype: csvw.Double, Unit: "m2", Description: "area of the fractures whose critical_dp_MPa is at most the increase"},
		{Title: "area_share", Datatype: csvw.Double, Description: "slipping area over the total fracture area, 0 to 1"},
		{Title: "fracture_share", Datatype: csvw.Double, Description: "share of the fractures that slip, 0 to 1"},
		{Title: "trace_length_share", Datatype: csvw.Double, Description: "share of the trace length that slips, 0 to 1"},
	},
}

// Header lines of the two tables.
var (
	ScreenCSVHeader = strings.Join(ScreenTable.Header(), ",")
	CurveCSVHeader  = strings.Join(CurveTable.Header(), ",")
)

// WriteCSV writes the per-fracture table (screen.csv): one row per plane
// in input order under ScreenCSVHeader. slip_tendency is the effective
// form τ/(σn − p); slip_tendency_total is τ/σn; set_name is the name of
// the plane's set (ScreenOptions.SetNames).
func (sc *Screening) WriteCSV(w io.Writer) error {
	cw := csvw.NewWriter(w, &ScreenTable)
	names := make(map[int]string, len(sc.Sets))
	for _, sh := range sc.Sets {
		names[sh.Set] = sh.Name
	}
	row := make([]string, len(ScreenTable.Columns))
	for i := range sc.Planes {
		r := &sc.Planes[i]
		row[0] = strconv.Itoa(r.ID)
		row[1] = strconv.Itoa(r.Set)
		for k, f := range [...]struct {
			v    float64
			prec int
		}{
			{r.Dip * toDeg, degDecimals},
			{r.DipDirection * toDeg, degDecimals},
			{r.SigmaN * toMPa, mpaDecimals},
			{r.Tau * toMPa, mpaDecimals},
			{r.SlipTendency, ratioDecimals},
			{r.DilationTendency, ratioDecimals},
			{r.CriticalIncrease * toMPa, mpaDecimals},
			{rakeDegrees(r.Rake), degDecimals},
			{r.Area, metreDecimals},
			{r.TraceLength, metreDecimals},
			{r.TotalSlipTendency, ratioDecimals},
		} {
			row[2+k] = fixed(f.v, f.prec)
		}
		row[13] = names[r.Set]
		cw.Write(row)
	}
	return cw.Flush()
}

// WriteCurveCSV writes the slip-versus-pressure curve (slip-vs-dp.csv)
// under CurveCSVHeader: for each pore-pressure increase, the area and the
// shares of area, count and trace length of the fractures that slip.
func (sc *Screening) WriteCurveCSV(w io.Writer) error {
	bw := bufio.NewWriter(w)
	bw.WriteString(CurveCSVHeader)
	bw.WriteByte('\n')
	var b []byte
	for _, p := range sc.Curve {
		b = b[:0]
		b = appendFixed(b, p.Increase*toMPa, mpaDecimals)
		b = append(b, ',')
		b = appendFixed(b, p.SlippingArea, metreDecimals)
		for _, v := range [...]float64{p.AreaShare, p.FractureShare, p.TraceLengthShare} {
			b = append(b, ',')
			b = appendFixed(b, v, ratioDecimals)
		}
		b = append(b, '\n')
		if _, err := bw.Write(b); err != nil {
			return err
		}
	}
	return bw.Flush()
}

// screenJSON is the layout of screen.json.
type screenJSON struct {
	Caution              string            `json:"caution"`
	StressTensorMPa      [3][3]json.Number `json:"stress_tensor_MPa"`
	StressConvention     string            `json:"stress_convention"`
	PrincipalStresses    []principalJSON   `json:"principal_stresses"`
	Regime               string            `json:"regime,omitempty"`
	PorePressureMPa      json.Number       `json:"pore_pressure_MPa"`
	Friction             json.Number       `json:"friction"`
	CohesionMPa          json.Number       `json:"cohesion_MPa"`
	FrictionalLimit      limitJSON         `json:"frictional_limit"`
	SlipTendency         string            `json:"slip_tendency"`
	Assumption           string            `json:"assumption"`
	PressureIncreasesMPa []json.Number     `json:"pressure_increases_MPa"`
	Sets                 []sharesJSON      `json:"sets"`
	Total                sharesJSON        `json:"total"`
	CurveStepMPa         json.Number       `json:"curve_step_MPa"`
}

type principalJSON struct {
	Rank      string      `json:"rank"`
	Name      string      `json:"name"`
	ValueMPa  json.Number `json:"value_MPa"`
	TrendDeg  json.Number `json:"trend_deg"`
	PlungeDeg json.Number `json:"plunge_deg"`
}

type limitJSON struct {
	Ratio    json.Number `json:"ratio"`
	Limit    json.Number `json:"limit"`
	Exceeded bool        `json:"exceeded"`
	Warning  string      `json:"warning,omitempty"`
}

type sharesJSON struct {
	Set                *int          `json:"set,omitempty"`
	Name               string        `json:"name"`
	Fractures          int           `json:"fractures"`
	TraceLengthM       json.Number   `json:"trace_length_m"`
	AreaM2             json.Number   `json:"area_m2"`
	ShareOfFractures   []json.Number `json:"share_of_fractures"`
	ShareOfTraceLength []json.Number `json:"share_of_trace_length"`
	ShareOfArea        []json.Number `json:"share_of_area"`
}

// WriteJSON writes the screening summary (screen.json): the stress tensor
// in MPa (East-North-Up, compression positive), the principal stresses,
// pore pressure, friction, cohesion, the frictional-limit check, and per
// set and in total the shares of fractures, trace length and area that
// slip at each pressure increase, with the Caution statement.
func (sc *Screening) WriteJSON(w io.Writer) error {
	s := sc.Stress
	out := screenJSON{
		Caution:          Caution,
		StressConvention: "East-North-Up axes (x east, y north, z up), total stress, compression positive",
		Regime:           s.Regime(),
		PorePressureMPa:  number(s.PorePressure()*toMPa, mpaDecimals),
		Friction:         number(sc.Criterion.Friction, ratioDecimals),
		CohesionMPa:      number(sc.Criterion.Cohesion*toMPa, mpaDecimals),
		FrictionalLimit: limitJSON{
			Ratio:    number(sc.Limit.Ratio, ratioDecimals),
			Limit:    number(sc.Limit.Limit, ratioDecimals),
			Exceeded: sc.Limit.Exceeded,
			Warning:  sc.Limit.Warning,
		},
		SlipTendency: "effective: tau / (sigma_n - pore_pressure); screen.csv also has the total form tau / sigma_n",
		Assumption:   "a fracture slips at a pressure increase dp when critical_dp <= dp; total stresses held fixed (no poroelastic stress path)",
		Total:        sharesToJSON(sc.Total, false),
		CurveStepMPa: number(sc.CurveStep*toMPa, mpaDecimals),
	}
	t := s.Tensor()
	for i := range 3 {
		for j := range 3 {
			out.StressTensorMPa[i][j] = number(t[i][j]*toMPa, mpaDecimals)
		}
	}
	for k, p := range s.Principal() {
		trend, plunge := orient.TrendAndPlunge(p.Axis)
		out.PrincipalStresses = append(out.PrincipalStresses, principalJSON{
			Rank: "S" + strconv.Itoa(k+1), Name: p.Name,
			ValueMPa:  number(p.Value*toMPa, mpaDecimals),
			TrendDeg:  number(trend*toDeg, degDecimals),
			PlungeDeg: number(plunge*toDeg, degDecimals),
		})
	}
	for _, v := range sc.Increases {
		out.PressureIncreasesMPa = append(out.PressureIncreasesMPa, number(v*toMPa, mpaDecimals))
	}
	out.Sets = []sharesJSON{}
	for _, sh := range sc.Sets {
		out.Sets = append(out.Sets, sharesToJSON(sh, true))
	}
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(out)
}

// sharesToJSON converts one Shares; withSet adds the set index.
func sharesToJSON(sh Shares, withSet bool) sharesJSON {
	out := sharesJSON{
		Name:               sh.Name,
		Fractures:          sh.Fractures,
		TraceLengthM:       number(sh.TraceLength, metreDecimals),
		AreaM2:             number(sh.Area, metreDecimals),
		ShareOfFractures:   numbers(sh.FractureShare, ratioDecimals),
		ShareOfTraceLength: numbers(sh.TraceLengthShare, ratioDecimals),
		ShareOfArea:        numbers(sh.AreaShare, ratioDecimals),
	}
	if withSet {
		set := sh.Set
		out.Set = &set
	}
	return out
}

// numbers formats each value with prec decimals.
func numbers(vs []float64, prec int) []json.Number {
	out := make([]json.Number, len(vs))
	for i, v := range vs {
		out[i] = number(v, prec)
	}
	return out
}
