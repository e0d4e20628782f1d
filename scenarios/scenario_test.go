package scenarios

import (
	"encoding/json"
	"errors"
	"math"
	"strings"
	"testing"
	"testing/fstest"

	"slipfront/internal/numtest"
)

// minimal is a small valid scenario; tests change single lines of it.
const minimal = `name = "minimal"
seed = 7
[domain]
x_min = "-500 m"
x_max = "500 m"
y_min = "-500 m"
y_max = "500 m"
[layer]
depth = "2000 m"
thickness = "20 m"
[stress]
sv_gradient = "25 kPa/m"
shmax_gradient = "26 kPa/m"
shmin_gradient = "18 kPa/m"
pore_pressure_gradient = "10 kPa/m"
shmax_azimuth = "N90E"
[[sets]]
name = "one"
[sets.orientation]
kappa = 10
[[sets]]
name = "two"
[sets.orientation]
distribution = "uniform"
[[wells]]
name = "A"
path = [["-400 m", "0 m", "2000 m"], ["400 m", "0 m", "2000 m"]]
[[wells.stages]]
name = "1"
clusters = ["700 m", "720 m"]
[[wells.stages]]
name = "2"
clusters = ["500 m"]
[fluids.water]
viscosity = "1 cP"
[schedule]
fluid = "water"
volume = "100 m3"
`

func parseText(t *testing.T, src string, overrides ...string) (*Scenario, error) {
	t.Helper()
	ov, err := ParseOverrides(overrides)
	if err != nil {
		return nil, err
	}
	files := fstest.MapFS{"faults.csv": {Data: []byte(knownCSV)}, "crs.prj": {Data: []byte(crsWKT)},
		"bad.prj": {Data: []byte("PROJCS[\"x\",\n  GEOGCS[\"y\"")}}
	return Parse("test.toml", []byte(src), files, ov...)
}

// crsWKT is a made-up transverse Mercator CRS in US survey feet on NAD83,
// as projinfo writes WKT1 (PROJ 9.1.1).
const crsWKT = `PROJCS["Local TM (ftUS)",
    GEOGCS["NAD83",
        DATUM["North_American_Datum_1983",
            SPHEROID["GRS 1980",6378137,298.257222101]],
        PRIMEM["Greenwich",0],
        UNIT["degree",0.0174532925199433]],
    PROJECTION["Transverse_Mercator"],
    PARAMETER["latitude_of_origin",31],
    PARAMETER["central_meridian",-103.5],
    PARAMETER["scale_factor",0.9999],
    PARAMETER["false_easting",656166.666666667],
    PARAMETER["false_northing",0],
    UNIT["US survey foot",0.304800609601219],
    AXIS["Easting",EAST],
    AXIS["Northing",NORTH]]
`

const knownCSV = "name,center_x_m,center_y_m,center_depth_m,dip_deg,dip_direction_deg,length_m,height_m\nF1,0,0,2000,80,90,300,100\n"

// TestCRSWKT: a WKT file is read relative to the scenario, kept on one
// line in the resolved scenario (so a run folder needs no other file),
// and the origin may be written in US survey feet.
func TestCRSWKT(t *testing.T) {
	src := strings.Replace(minimal, `y_max = "500 m"`, "y_max = \"500 m\"\ncrs_wkt = \"crs.prj\"\norigin_easting = \"656166.667 ftUS\"", 1)
	s, err := parseText(t, src)
	if err != nil {
		t.Fatal(err)
	}
	d := s.Domain
	if d.CRS != "" || d.CRSWKT != "crs.prj" || strings.Contains(d.CRSDefinition, "\n") || !strings.HasPrefix(d.CRSDefinition, `PROJCS["Local TM (ftUS)",GEOGCS[`) {
		t.Errorf("domain %+v", d)
	}
	if d.CRSSpec() != d.CRSDefinition {
		t.Errorf("CRSSpec %q", d.CRSSpec())
	}
	// 656166.667 ftUS × 1200/3937 m (NIST SP 811 B.8).
	numtest.Abs(t, "origin easting, m", d.OriginEasting, 656166.667*1200/3937, 1e-9)
	base, err := parseText(t, minimal)
	if err != nil {
		t.Fatal(err)
	}
	if base.Digest == s.Digest || base.Domain.CRSSpec() != "" {
		t.Errorf("the CRS does not enter the digest, or a scenario without one has a CRS %q", base.Domain.CRSSpec())
	}
	// Scenarios without crs_wkt keep their digest: the new fields are
	// left out of the canonical JSON when empty.
	b, err := json.Marshal(base)
	if err != nil {
		t.Fatal(err)
	}
	if strings.Contains(string(b), "CRSWKT") || strings.Contains(string(b), "CRSDefinition") {
		t.Errorf("empty CRS WKT fields in the canonical JSON: %s", b)
	}
}

func TestMinimal(t *testing.T) {
	s, err := parseText(t, minimal)
	if err != nil {
		t.Fatal(err)
	}
	// Defaults and conversions (each value's unit factor is tested in
	// units_test.go).
	numtest.Rel(t, "layer depth", s.Layer.Depth, 2000, 1e-15)
	numtest.Rel(t, "SHmax azimuth", s.Stress.SHmaxAzimuth, math.Pi/2, 1e-15)
	numtest.Rel(t, "default shear modulus", s.Rock.ShearModulus, 15e9, 1e-15)
	numtest.Rel(t, "default compressibility", s.Fluids["water"].Compressibility, 4.5e-10, 1e-15)
	if s.Sets[1].Orientation.Distribution != "uniform" || s.Sets[0].Size.Distribution != "power_law" {
		t.Errorf("set defaults not applied: %+v", s.Sets)
	}
	if s.Seed != 7 || len(s.Wells[0].Stages) != 2 || len(s.Wells[0].Stages[0].Clusters) != 2 {
		t.Errorf("decoded %+v", s)
	}
	if len(s.Digest) != 64 {
		t.Errorf("digest %q", s.Digest)
	}
}

// TestDepletionTable: without a [depletion] table the scenario holds no
// production and its canonical content (so its digest) has no trace of the
// table; with one, the defaults apply and an override can shorten the
// production to nothing.
func TestDepletionTable(t *testing.T) {
	s, err := parseText(t, minimal)
	if err != nil {
		t.Fatal(err)
	}
	b, err := json.Marshal(s)
	if err != nil {
		t.Fatal(err)
	}
	if s.Depletion.Active() || strings.Contains(string(b), "Depletion") {
		t.Errorf("no [depletion] table, yet active %v or in the canonical content: %s", s.Depletion.Active(), b)
	}
	withTable := strings.Replace(minimal, "[fluids.water]",
		"[matrix]\npermeability = \"100 nD\"\n[depletion]\nwells = [\"A\"]\nbottomhole_pressure = \"10 MPa\"\nduration = \"2 yr\"\n[fluids.water]", 1)
	d, err := parseText(t, withTable)
	if err != nil {
		t.Fatal(err)
	}
	if !d.Depletion.Active() || d.Digest == s.Digest {
		t.Errorf("a [depletion] table: active %v, digest changed %v", d.Depletion.Active(), d.Digest != s.Digest)
	}
	numtest.Rel(t, "duration", d.Depletion.Duration, 2*365.25*86400, 1e-15)
	numtest.Rel(t, "matrix permeability (100 nD)", d.Matrix.Permeability, 9.869233e-20, 1e-15)
	numtest.Rel(t, "default matrix porosity", d.Matrix.Porosity, 0.06, 1e-15)
	if g := d.DepletionGrid(); g.CellSize != 10 || g.Cols != 100 || g.Rows != 100 {
		t.Errorf("depletion grid %+v, want 100 × 100 cells of 10 m over the 1 km map", g)
	}
	none, err := parseText(t, withTable, "depletion.duration=0 s")
	if err != nil {
		t.Fatal(err)
	}
	if none.Depletion.Active() {
		t.Error("zero production time is active")
	}
}

func TestExamplesParse(t *testing.T) {
	names := Examples()
	if len(names) == 0 || !strings.Contains(strings.Join(names, " "), "zipper-pad") {
		t.Fatalf("examples %v, want demo among them", names)
	}
	for _, name := range names {
		s, err := LoadExample(name)
		if err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		if len(s.PumpingOrder()) == 0 {
			t.Errorf("%s: no stages to pump", name)
		}
	}
	demo, err := LoadExample("zipper-pad")
	if err != nil {
		t.Fatal(err)
	}
	if len(demo.Wells) != 2 || len(demo.Sets) != 2 || len(demo.KnownFractures.Fractures) != 1 {
		t.Errorf("demo has %d wells, %d sets, %d known fractures; the README describes 2, 2, 1",
			len(demo.Wells), len(demo.Sets), len(demo.KnownFractures.Fractures))
	}
}

func TestTemplateParses(t *testing.T) {
	s, err := Parse("template.toml", []byte(Template()), fstest.MapFS{})
	if err != nil {
		t.Fatalf("template does not parse: %v", err)
	}
	// Every default in the template equals the decoder's default.
	d, err := parseText(t, minimal)
	if err != nil {
		t.Fatal(err)
	}
	if s.Rock != d.Rock || s.Numerics != d.Numerics {
		t.Errorf("template defaults differ from decoder defaults:\n%+v\n%+v", s.Rock, d.Rock)
	}
}

// TestBadValues: every kind of bad value gives file:line: key = value: rule.
func TestBadValues(t *testing.T) {
	tests := []struct {
		name     string
		old, new string
		want     string
	}{
		{"negative kappa", "kappa = 10", "kappa = -3", "test.toml:20: sets[0].orientation.kappa = -3: must be within (0, 1e6]"},
		{"dip above 90", "kappa = 10", `dip = "95 deg"`, `test.toml:20: sets[0].orientation.dip = "95 deg": must be within [0, 90] deg`},
		{"unknown unit", `thickness = "20 m"`, `thickness = "20 furlongs"`, `test.toml:10: layer.thickness = "20 furlongs": unknown unit "furlongs"`},
		{"no unit", `thickness = "20 m"`, `thickness = 20`, `test.toml:10: layer.thickness = 20: needs a unit`},
		{"unknown key", "kappa = 10", "kapa = 10", `test.toml:20: sets[0].orientation.kapa: unknown key (did you mean "kappa"?)`},
		{"unknown table", "[layer]", "[layr]", `test.toml:8: layr: unknown key (did you mean "layer"?)`},
		{"missing key", `depth = "2000 m"`, ``, `test.toml:8: layer.depth: required key is missing (e.g. "2600 m")`},
		{"bad word", `name = "two"`, "name = \"two\"\nshape = \"disk\"", `test.toml:23: sets[1].shape = "disk": must be one of disc, rectangle (did you mean "disc"?)`},
		{"inverted size", "kappa = 10", "kappa = 10\n[sets.size]\nmin = \"50 m\"\nmax = \"10 m\"", `test.toml:23: sets[0].size.max = "10 m": must exceed sets[0].size.min = 50 m`},
		{"negative size", "kappa = 10", "kappa = 10\n[sets.size]\nmin = \"-5 m\"", `test.toml:22: sets[0].size.min = "-5 m": must be within [0.01, 100000] m`},
		{"shmax below shmin", `shmax_gradient = "26 kPa/m"`, `shmax_gradient = "16 kPa/m"`, `test.toml:13: stress.shmax_gradient = "16 kPa/m": must be at least stress.shmin_gradient`},
		{"poisson", "[[sets]]\nname = \"one\"", "[rock]\npoisson_ratio = 0.5\n[[sets]]\nname = \"one\"", "test.toml:18: rock.poisson_ratio = 0.5: must be within (0, 0.5)"},
		{"friction", "[[sets]]\nname = \"one\"", "[rock]\nfriction_static = 0\n[[sets]]\nname = \"one\"", "test.toml:18: rock.friction_static = 0: must be within (0, 2]"},
		{"unknown fluid", `fluid = "water"`, `fluid = "watr"`, `test.toml:37: schedule.fluid = "watr": no such fluid; fluids: water (did you mean "water"?)`},
		{"no volume", `volume = "100 m3"`, ``, "wells[0].stages[0].volume: stage A:1 has no volume and no duration"},
		{"cluster off the path", `clusters = ["500 m"]`, `clusters = ["900 m"]`, `test.toml:33: wells[0].stages[1].clusters[0] = "900 m": must lie on the well path`},
		{"unknown stage in list", `volume = "100 m3"`, "volume = \"100 m3\"\norder = \"list\"\nsequence = [\"A:1\", \"A:7\"]", `schedule.sequence[1] = "A:7": well "A" has no stage "7"`},
		{"output interval", `volume = "100 m3"`, "volume = \"100 m3\"\n[numerics]\noutput_interval = \"100 d\"", `numerics.output_interval = "100 d": is longer than the whole schedule`},
		{"bad crs", `y_max = "500 m"`, "y_max = \"500 m\"\ncrs = \"UTM14\"", `test.toml:8: domain.crs = "UTM14": must be "EPSG:<code>"`},
		{"unknown EPSG code", `y_max = "500 m"`, "y_max = \"500 m\"\ncrs = \"EPSG:999999\"", `test.toml:8: domain.crs = "EPSG:999999": not a projected CRS this program can place; supported are EPSG:32601–32660`},
		{"geographic crs", `y_max = "500 m"`, "y_max = \"500 m\"\ncrs = \"EPSG:4326\"", `test.toml:8: domain.crs = "EPSG:4326": CRS "EPSG:4326" is geographic (degrees); local coordinates in metres need a projected CRS`},
		{"crs twice", `y_max = "500 m"`, "y_max = \"500 m\"\ncrs = \"EPSG:32614\"\ncrs_wkt = \"crs.prj\"", `test.toml:9: domain.crs_wkt = "crs.prj": give the CRS once: domain.crs = "EPSG:32614" is set too`},
		{"bad WKT", `y_max = "500 m"`, "y_max = \"500 m\"\ncrs_wkt = \"bad.prj\"", `test.toml:8: domain.crs_wkt = "bad.prj": bad.prj:2:13: GEOGCS is not closed`},
		{"missing WKT", `y_max = "500 m"`, "y_max = \"500 m\"\ncrs_wkt = \"none.prj\"", `test.toml:8: domain.crs_wkt = "none.prj": cannot open`},
		{"bad start", `volume = "100 m3"`, "volume = \"100 m3\"\nstart = \"May 6\"", `schedule.start = "May 6": must be an RFC 3339 UTC time`},
		{"syntax", `name = "one"`, `name = "one`, "test.toml:18: TOML syntax"},
		{"cap below the pore pressure", `volume = "100 m3"`, "volume = \"100 m3\"\npressure_cap = \"15 MPa\"", `schedule.pressure_cap = "15 MPa": must exceed the initial pore pressure, 20 MPa`},
		{"injection pressure below the pore pressure", `volume = "100 m3"`, "volume = \"100 m3\"\ncontrol = \"pressure\"\ninjection_pressure = \"19 MPa\"", `schedule.injection_pressure = "19 MPa": must exceed the initial pore pressure`},
		{"repeated path point", `path = [["-400 m", "0 m", "2000 m"], ["400 m", "0 m", "2000 m"]]`, `path = [["-400 m", "0 m", "2000 m"], ["-400 m", "0 m", "2100 m"], ["400 m", "0 m", "2000 m"]]`, `wells[0].path[1]`},
		{"huge domain", `x_max = "500 m"`, `x_max = "1e300 m"`, `domain.x_max = "1e300 m": must be within [-1e7, 1e7] m`},
		{"too many outputs", `volume = "100 m3"`, "volume = \"100 m3\"\n[numerics]\noutput_interval = \"1 ms\"", "numerics.output_interval = \"1 ms\": gives"},
		{"repeated set name", `name = "two"`, `name = "one"`, `test.toml:22: sets[1].name = "one": repeats the name of sets[0]`},
		{"repeated stage name", `name = "2"`, `name = "1"`, `test.toml:32: wells[0].stages[1].name = "1": repeats the name of wells[0].stages[0]`},
		{"unknown known-fracture file", `[fluids.water]`, "[known_fractures]\nfile = \"missing.csv\"\n[fluids.water]", `known_fractures.file = "missing.csv": cannot open`},
		// Reproducers of unsafe input (each once accepted, then failed late or misread).
		{"space inside a unit", `depth = "2000 m"`, `depth = "2000 m m"`, `test.toml:9: layer.depth = "2000 m m": the unit "m m" has a space inside`},
		{"prefix apart from its unit", `depth = "2000 m"`, `depth = "2 k m"`, `layer.depth = "2 k m": the unit "k m" has a space inside`},
		{"no well", "[[wells]]\nname = \"A\"\npath = [[\"-400 m\", \"0 m\", \"2000 m\"], [\"400 m\", \"0 m\", \"2000 m\"]]\n[[wells.stages]]\nname = \"1\"\nclusters = [\"700 m\", \"720 m\"]\n[[wells.stages]]\nname = \"2\"\nclusters = [\"500 m\"]\n", "", "wells: the scenario needs at least one well"},
		{"well without stages", "[[wells.stages]]\nname = \"1\"\nclusters = [\"700 m\", \"720 m\"]\n[[wells.stages]]\nname = \"2\"\nclusters = [\"500 m\"]\n", "", "wells[0].stages: the well needs at least one stage"},
		{"well above the layer", `path = [["-400 m", "0 m", "2000 m"], ["400 m", "0 m", "2000 m"]]`, `path = [["-400 m", "0 m", "100 m"], ["400 m", "0 m", "100 m"]]`, "wells[0].path[0] = [-400 m 0 m 100 m]: depth 100 m lies outside the layer (1990 m to 2010 m true vertical depth)"},
		{"well outside the map", `path = [["-400 m", "0 m", "2000 m"], ["400 m", "0 m", "2000 m"]]`, `path = [["-400 m", "0 m", "2000 m"], ["900 m", "0 m", "2000 m"]]`, "wells[0].path[1] = [900 m 0 m 2000 m]: lies outside the map area x -500 m … 500 m, y -500 m … 500 m"},
		{"depth beyond any well", `depth = "2000 m"`, `depth = "1e308 m"`, `test.toml:9: layer.depth = "1e308 m": must be within [10, 15000] m`},
		{"absurd rate", `volume = "100 m3"`, "volume = \"100 m3\"\nrate = \"1e300 m3/s\"", `schedule.rate = "1e300 m3/s": must be within (0, 10] m3/s`},
		{"absurd modulus", "[[sets]]\nname = \"one\"", "[rock]\nshear_modulus = \"1e-300 Pa\"\n[[sets]]\nname = \"one\"", `rock.shear_modulus = "1e-300 Pa": must be within [100, 200000] MPa`},
		{"tiny time step", `volume = "100 m3"`, "volume = \"100 m3\"\n[numerics]\ntime_step_initial = \"1e-6 s\"\ntime_step_min = \"1e-6 s\"\ntime_step_max = \"1e-6 s\"", `numerics.time_step_max = "1e-6 s": needs at least`},
		{"depletion of an unknown well", `[fluids.water]`, "[depletion]\nwells = [\"B\"]\nbottomhole_pressure = \"10 MPa\"\nduration = \"1 yr\"\n[fluids.water]", `depletion.wells[0] = "B": no well is named "B"; wells: "A"`},
		{"depletion well twice", `[fluids.water]`, "[depletion]\nwells = [\"A\", \"A\"]\nbottomhole_pressure = \"10 MPa\"\nduration = \"1 yr\"\n[fluids.water]", `depletion.wells[1] = "A": names well "A" twice`},
		{"depletion above the pore pressure", `[fluids.water]`, "[depletion]\nwells = [\"A\"]\nbottomhole_pressure = \"25 MPa\"\nduration = \"1 yr\"\n[fluids.water]", `depletion.bottomhole_pressure = "25 MPa": must not exceed the initial pore pressure 20 MPa`},
		{"depletion without a time", `[fluids.water]`, "[depletion]\nwells = [\"A\"]\nbottomhole_pressure = \"10 MPa\"\n[fluids.water]", `depletion.duration: required key is missing (e.g. "2 yr")`},
		{"later period above the pore pressure", `[fluids.water]`, "[depletion]\nwells = [\"A\"]\nbottomhole_pressure = \"10 MPa\"\nduration = \"1 yr\"\n[[depletion.periods]]\nduration = \"1 yr\"\nbottomhole_pressure = \"21 MPa\"\n[fluids.water]", `depletion.periods[0].bottomhole_pressure = "21 MPa": must not exceed the initial pore pressure 20 MPa`},
		{"fewer steps than periods", `[fluids.water]`, "[depletion]\nwells = [\"A\"]\nbottomhole_pressure = \"10 MPa\"\nduration = \"1 yr\"\ntime_steps = 1\n[[depletion.periods]]\nduration = \"1 yr\"\nbottomhole_pressure = \"12 MPa\"\n[fluids.water]", `depletion.time_steps = 1: must be at least the number of production periods, 2`},
		{"depletion without a matrix", `[fluids.water]`, "[depletion]\nwells = [\"A\"]\nbottomhole_pressure = \"10 MPa\"\nduration = \"1 yr\"\n[fluids.water]", `depletion.wells = [A]: production needs a [matrix] table`},
		{"matrix and Carter leak-off", `viscosity = "1 cP"`, "viscosity = \"1 cP\"\nleakoff_coefficient = \"1e-5 m/s^0.5\"\n[matrix]\npermeability = \"100 nD\"", `fluids.water.leakoff_coefficient = "1e-5 m/s^0.5": must be 0 with a [matrix] table`},
		{"discharge coefficient above 1", `volume = "100 m3"`, "volume = \"100 m3\"\nperforations = 6\ndischarge_coefficient = 1.5", `schedule.discharge_coefficient = 1.5: must be within (0, 1]`},
		{"negative perforations", `clusters = ["500 m"]`, "clusters = [\"500 m\"]\nperforations = -2", `wells[0].stages[1].perforations = -2: must be within [0, 1000]`},
		{"perforation in metres by mistake", `volume = "100 m3"`, "volume = \"100 m3\"\nperforations = 6\nperforation_diameter = \"0.4 m\"", `schedule.perforation_diameter = "0.4 m": must be within [0.001, 0.1] m`},
		{"initial slot longer than the path", `name = "A"`, "name = \"A\"\nconduit_half_length = \"20 m\"\ngrowth = \"on\"\ninitial_half_length = \"30 m\"", `wells[0].initial_half_length = "30 m": must not exceed wells[0].conduit_half_length = 20 m`},
		{"toughness without its unit", "[[sets]]\nname = \"one\"", "[rock]\nfracture_toughness = 1\n[[sets]]\nname = \"one\"", `rock.fracture_toughness = 1: needs a unit`},
		{"rate magnitudes inverted", `[fluids.water]`, "[seismicity_rate]\nbackground_rate_per_km2_yr = 10\nmin_magnitude = 1\nmax_magnitude = 0\n[fluids.water]", `seismicity_rate.max_magnitude = 0: must exceed seismicity_rate.min_magnitude = 1`},
		{"stressing rate without a unit", `[fluids.water]`, "[seismicity_rate]\nbackground_rate_per_km2_yr = 10\nbackground_stressing_rate = 0.001\n[fluids.water]", `seismicity_rate.background_stressing_rate = 0.001: needs a unit`},
		{"depletion grid too fine", `[fluids.water]`, "[depletion]\nwells = [\"A\"]\nbottomhole_pressure = \"10 MPa\"\nduration = \"1 yr\"\ncell_size = \"0.5 m\"\n[fluids.water]", `depletion.cell_size = "0.5 m": gives 2000 × 2000 depletion cells over the domain; at most 1048576 allowed`},
		{"long value cut short", `name = "two"`, `name = "two"` + "\nshape = \"" + strings.Repeat("x", 5000) + "\"", `sets[1].shape = "` + strings.Repeat("x", 60) + `"…: must be one of`},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if !strings.Contains(minimal, tc.old) {
				t.Fatalf("test bug: %q not in minimal", tc.old)
			}
			_, err := parseText(t, strings.Replace(minimal, tc.old, tc.new, 1))
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Errorf("error:\n%v\nwant it to contain:\n%s", err, tc.want)
			}
		})
	}
}

func TestAllErrorsAtOnce(t *testing.T) {
	src := strings.Replace(minimal, "kappa = 10", "kappa = -1\ndip = \"100 deg\"", 1)
	_, err := parseText(t, src)
	var errs Errors
	if !errors.As(err, &errs) || len(errs) != 2 {
		t.Fatalf("want 2 errors, got %v", err)
	}
}

func TestOverrides(t *testing.T) {
	s, err := parseText(t, minimal, "fluids.water.viscosity=20cP", "sets[0].orientation.kappa=15",
		"numerics.cell_size = 5 m", "schedule.rate=80 bbl/min", "seed=9", `wells[0].stages[1].clusters=["480 m", "510 m"]`)
	if err != nil {
		t.Fatal(err)
	}
	numtest.Rel(t, "viscosity", s.Fluids["water"].Viscosity, 0.02, 1e-15)
	numtest.Rel(t, "kappa", s.Sets[0].Orientation.Kappa, 15, 1e-15)
	numtest.Rel(t, "cell size", s.Numerics.CellSize, 5, 1e-15)
	numtest.Rel(t, "rate", s.Schedule.Rate, 0.21198305990400002, 1e-12) // NIST SP 811 barrel
	if s.Seed != 9 {
		t.Errorf("seed %d", s.Seed)
	}
	if c := s.Wells[0].Stages[1].Clusters; len(c) != 2 || c[1] != 510 {
		t.Errorf("list override: clusters %v", c)
	}
	base, err := parseText(t, minimal)
	if err != nil {
		t.Fatal(err)
	}
	if base.Digest == s.Digest {
		t.Error("overrides did not change the digest")
	}
}

func TestOverrideErrors(t *testing.T) {
	tests := []struct{ set, want string }{
		{"sets[0].orientation.kappa=-3", "--set sets[0].orientation.kappa=-3: must be within (0, 1e6]"},
		{"sets[5].orientation.kappa=3", "--set sets[5].orientation.kappa=3: index 5 out of range: the scenario has 2 entries in sets"},
		{"numerics.cel_size=5 m", `--set numerics.cel_size=5 m: unknown key (did you mean "cell_size"?)`},
		{"fluids.water.viscosity=20 cQ", `--set fluids.water.viscosity=20 cQ: unknown unit "cQ"`},
		{"layer=5", "--set layer=5: layer is a table; set one of its keys"},
		{"wells.name=x", "--set wells.name=x: wells is a list of tables; give an index, e.g. wells[0]"},
		{"sets=x", "sets is a list of tables; give an index and a key, e.g. sets[0].name"},
		{`schedule.sequence=["A:1"`, "a list must be written as in TOML"},
		{"kappa", "want key=value"},
		{"sets[x].name=a", "bad key"},
	}
	for _, tc := range tests {
		_, err := parseText(t, minimal, tc.set)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("--set %s: error %v, want it to contain %q", tc.set, err, tc.want)
		}
	}
}

func TestDigestIgnoresSpelling(t *testing.T) {
	a, err := parseText(t, minimal)
	if err != nil {
		t.Fatal(err)
	}
	// Same content: comments, blank lines and an equivalent unit spelling.
	src := "# a comment\n\n" + strings.Replace(minimal, `thickness = "20 m"`, `thickness = "0.02 km"  # same`, 1)
	b, err := parseText(t, src)
	if err != nil {
		t.Fatal(err)
	}
	if a.Digest != b.Digest {
		t.Error("equivalent scenarios have different digests")
	}
}

func TestPumpingOrder(t *testing.T) {
	two := minimal + "\n"
	two = strings.Replace(two, "[fluids.water]", `[[wells]]
name = "B"
path = [["-400 m", "100 m", "2000 m"], ["400 m", "100 m", "2000 m"]]
[[wells.stages]]
name = "1"
clusters = ["700 m"]
rate = "1 m3/min"
[fluids.water]`, 1)
	tests := []struct {
		order string
		want  string
	}{
		{"sequential", "A:1 A:2 B:1"},
		{"zipper", "A:1 B:1 A:2"},
		{"list\"\nsequence = [\"B:1\", \"A:2\"]\n#\"", "B:1 A:2"},
	}
	for _, tc := range tests {
		s, err := parseText(t, strings.Replace(two, `volume = "100 m3"`, "volume = \"100 m3\"\norder = \""+tc.order+"\"", 1))
		if err != nil {
			t.Fatalf("%s: %v", tc.order, err)
		}
		var names []string
		for _, p := range s.PumpingOrder() {
			names = append(names, p.Name)
			if p.Name == "B:1" {
				numtest.Rel(t, "stage rate override", p.Rate, 1.0/60, 1e-15)
			}
		}
		if got := strings.Join(names, " "); got != tc.want {
			t.Errorf("order %q: %s, want %s", tc.order, got, tc.want)
		}
	}
}

func TestReadKnownFractures(t *testing.T) {
	k, err := ReadKnownFractures(strings.NewReader("# comment\n"+knownCSV), "f.csv")
	if err != nil {
		t.Fatal(err)
	}
	if len(k) != 1 || k[0].Name != "F1" || k[0].Line != 3 {
		t.Fatalf("got %+v", k)
	}
	numtest.Rel(t, "dip", k[0].Dip, 80*math.Pi/180, 1e-15)
	bad := []struct{ in, want string }{
		{"", "empty file"},
		{"name,x\n", `f.csv:1: unknown column "x"`},
		{strings.Replace(knownCSV, "80,90", "95,90", 1), "f.csv:2: dip_deg = 95: must be within [0, 90]"},
		{strings.Replace(knownCSV, ",300,", ",-1,", 1), "f.csv:2: length_m = -1: must be > 0"},
		{strings.Replace(knownCSV, ",300,", ",abc,", 1), `f.csv:2: length_m = "abc": not a number`},
		{knownCSV + "F2,1,2\n", "f.csv:3"},
		{"center_x_m,center_y_m,center_depth_m,dip_deg,dip_direction_deg,length_m,height_m\n", `missing column "name"`},
	}
	for _, tc := range bad {
		_, err := ReadKnownFractures(strings.NewReader(tc.in), "f.csv")
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%q: error %v, want %q", tc.in, err, tc.want)
		}
	}
}

func TestKeyLines(t *testing.T) {
	l := scanKeyLines(minimal)
	for key, want := range map[string]int{
		"layer.depth":                 9,
		"sets[1].orientation":         23,
		"wells[0].stages[1].clusters": 33,
		"fluids.water.viscosity":      35,
		"wells[0].path[1][0]":         27, // falls back to the key's line
	} {
		if got := l.lineOf(key); got != want {
			t.Errorf("line of %s = %d, want %d", key, got, want)
		}
	}
}

func FuzzParse(f *testing.F) {
	f.Add([]byte(minimal))
	f.Add([]byte(Template()))
	for _, name := range Examples() {
		src, err := ExampleSource(name)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(src)
	}
	files := fstest.MapFS{"faults.csv": {Data: []byte(knownCSV)}, "crs.prj": {Data: []byte(crsWKT)},
		"bad.prj": {Data: []byte("PROJCS[\"x\",\n  GEOGCS[\"y\"")}}
	f.Fuzz(func(t *testing.T, src []byte) {
		s, err := Parse("fuzz.toml", src, files)
		if err != nil {
			if err.Error() == "" {
				t.Fatal("empty error message")
			}
			return
		}
		again, err := Parse("fuzz.toml", src, files)
		if err != nil || again.Digest != s.Digest {
			t.Fatalf("parsing twice differs: %v", err)
		}
	})
}

func FuzzReadKnownFractures(f *testing.F) {
	f.Add([]byte(knownCSV))
	src, err := examples.ReadFile("examples/zipper-pad-faults.csv")
	if err != nil {
		f.Fatal(err)
	}
	f.Add(src)
	f.Fuzz(func(t *testing.T, data []byte) {
		k, err := ReadKnownFractures(strings.NewReader(string(data)), "fuzz.csv")
		if err != nil {
			return
		}
		for _, x := range k {
			if x.Length <= 0 || x.Height <= 0 || x.Dip < 0 || x.Dip > math.Pi/2 {
				t.Fatalf("accepted an invalid fracture %+v", x)
			}
		}
	})
}

// A key written in the wrong table is found where it belongs.
func TestUnknownKeySuggestsItsTable(t *testing.T) {
	_, err := parseText(t, minimal, "shmax_gradient=16kPa/m")
	if err == nil || !strings.Contains(err.Error(), `did you mean "stress.shmax_gradient"?`) {
		t.Errorf("error %v", err)
	}
	_, err = parseText(t, minimal, "numerics.kappa=3")
	if err == nil || !strings.Contains(err.Error(), `did you mean "sets[0].orientation.kappa"?`) {
		t.Errorf("error %v", err)
	}
}
