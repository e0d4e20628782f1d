package report_test

import (
	"bytes"
	"fmt"
	"image/png"
	"io"
	"math"

	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/report"
)

// A run's quick-look map: the caller converts its results (traces with
// first-slip times, wells, clusters, events, stimulated outline) into the
// picture's plain types. All names and numbers here are invented.
func ExampleMap_WritePNG() {
	m := &report.Map{
		Title:   "Demo scenario — stimulated traces",
		Extent:  report.Extent{MinEast: -500, MaxEast: 500, MinNorth: -300, MaxNorth: 300},
		CRSNote: "Local frame: undefined Cartesian CRS",
		Colour:  report.ColourScale{Label: "First slip time", Unit: "h", NoValue: "Never slipped"},
		Traces: []report.Trace{
			{A: report.Point{East: -200, North: -50}, B: report.Point{East: -100, North: 40}, Value: 0.5},
			{A: report.Point{East: 50, North: -80}, B: report.Point{East: 150, North: 20}, Value: 2.5},
			{A: report.Point{East: 300, North: 150}, B: report.Point{East: 420, North: 230}, Value: math.NaN()},
		},
		Wells:    []report.Well{{Name: "Well A", Path: []report.Point{{East: -400, North: 0}, {East: 400, North: 0}}}},
		Clusters: []report.Cluster{{At: report.Point{East: -150}, Stage: "Stage 1"}, {At: report.Point{East: 100}, Stage: "Stage 2"}},
		Events:   []report.Event{{At: report.Point{East: -140, North: 10}, Magnitude: -1.2}},
		Outline: []report.Polygon{{{
			{East: -250, North: -100}, {East: 200, North: -100}, {East: 200, North: 80}, {East: -250, North: 80},
		}}},
	}
	var buf bytes.Buffer
	if err := m.WritePNG(&buf, report.Size{Width: 800, Height: 600}); err != nil {
		fmt.Println(err)
		return
	}
	cfg, err := png.DecodeConfig(&buf)
	fmt.Println(cfg.Width, cfg.Height, err)
	// Output: 800 600 <nil>
}

// Growth of the stimulated area with stage boundaries and a pressure
// panel. Times are seconds, areas m², pressures Pa.
func ExampleGrowth_WritePNG() {
	g := &report.Growth{
		Title:    "Demo scenario — stimulated area",
		Time:     []float64{0, 1800, 3600, 5400, 7200},
		Area:     []float64{0, 2.1e4, 3.0e4, 3.0e4, 4.4e4},
		Pressure: []float64{38e6, 44e6, 45e6, 41e6, 45e6},
		Stages:   []report.StageMark{{Name: "Stage 1", Start: 0}, {Name: "Stage 2", Start: 5400}},
	}
	fmt.Println(g.WritePNG(io.Discard, report.Size{}))

	g.Time[2] = 100 // Times must not decrease.
	fmt.Println(g.WritePNG(io.Discard, report.Size{}))
	// Output:
	// <nil>
	// report: growth Time[2] = 100 s is before Time[1] = 1800 s: times must not decrease
}

// A batch's percentile fan for one sweep value. The batch states its
// percentile convention; the chart prints it.
func ExampleFan_WritePNG() {
	f := &report.Fan{
		Title:      "Demo batch — 5 cP",
		Convention: "P10/P50/P90 = 10th/50th/90th percentile of 20 realizations, ascending",
		Time:       []float64{0, 3600, 7200},
		P10:        []float64{0, 1.0e4, 1.6e4},
		P50:        []float64{0, 1.8e4, 2.6e4},
		P90:        []float64{0, 2.9e4, 4.1e4},
		Mean:       []float64{0, 1.9e4, 2.7e4},
	}
	fmt.Println(f.WritePNG(io.Discard, report.Size{Width: 640, Height: 480}))
	// Output: <nil>
}

// A comparison across sweep values with P10–P90 bars.
func ExampleComparison_WritePNG() {
	c := &report.Comparison{
		Title:      "Demo batch — final stimulated area",
		Convention: "P10/P50/P90 = 10th/50th/90th percentile of 20 realizations, ascending",
		Sweep:      "Fluid viscosity",
		Categories: []string{"1 cP", "5 cP", "20 cP"},
		P10:        []float64{3.0e4, 2.2e4, 1.1e4},
		P50:        []float64{4.4e4, 3.1e4, 1.9e4},
		P90:        []float64{6.0e4, 4.5e4, 2.8e4},
	}
	fmt.Println(c.WritePNG(io.Discard, report.Size{Width: 640, Height: 480}))

	c.P90[2] = 1.5e4 // Below its P50.
	fmt.Println(c.WritePNG(io.Discard, report.Size{Width: 640, Height: 480}))
	// Output:
	// <nil>
	// report: comparison percentiles of "20 cP": P10 = 11000, P50 = 19000, P90 = 15000: need P10 ≤ P50 ≤ P90
}

// Fracture poles on a lower-hemisphere equal-area net, coloured by
// critical pressure increase, with the principal stress axes of a
// normal-faulting state (Sv vertical, SHmax towards N75°E). Angles are
// radians; the caller converts Δp_c to the unit it names (MPa).
func ExampleStereonet_WritePNG() {
	deg := math.Pi / 180
	net := &report.Stereonet{
		Title:  "Demo scenario — poles by critical pressure increase",
		Colour: report.ColourScale{Label: "Δp_c", Unit: "MPa"},
		Planes: []report.NetPlane{
			{Dip: 65 * deg, DipDirection: 165 * deg, Value: 2.5},
			{Dip: 70 * deg, DipDirection: 345 * deg, Value: 4.0},
			{Dip: 30 * deg, DipDirection: 80 * deg, Value: math.NaN()}, // No value: grey.
		},
		Axes: []report.StressAxis{
			{Name: "S1 (Sv)", Axis: r3.Vec{Z: 1}},
			{Name: "S2 (SHmax)", Axis: r3.Vec{X: math.Sin(75 * deg), Y: math.Cos(75 * deg)}},
			{Name: "S3 (Shmin)", Axis: r3.Vec{X: math.Sin(165 * deg), Y: math.Cos(165 * deg)}},
		},
		Graticule: true,
	}
	fmt.Println(net.WritePNG(io.Discard, report.Size{Width: 800, Height: 600}))
	// Output: <nil>
}

// The Mohr diagram of an effective stress state (σ′ = σ − p, Pa) with two
// fractures, the envelope τ = c + μσn′ and the envelope after a 5 MPa
// pressure increase.
func ExampleMohr_WritePNG() {
	m := &report.Mohr{
		Principal: [3]float64{42e6, 30e6, 21e6},
		Friction:  0.6,
		Increase:  5e6,
		Points:    []report.MohrPoint{{SigmaN: 28e6, Tau: 9e6, Group: 0}, {SigmaN: 35e6, Tau: 5e6, Group: 1}},
		Groups:    []string{"Set A", "Set B"},
	}
	fmt.Println(m.WritePNG(io.Discard, report.Size{Width: 800, Height: 600}))
	m.Principal[1] = 50e6 // σ2′ above σ1′.
	fmt.Println(m.WritePNG(io.Discard, report.Size{}))
	// Output:
	// <nil>
	// report: Mohr Principal = (4.2e+07, 5e+07, 2.1e+07) Pa: need finite σ1′ ≥ σ2′ ≥ σ3′
}

// Event distance from the injection point against time with the
// triggering front r = √(4πDt) for a diffusivity chosen by the caller.
func ExampleDistanceTime_WritePNG() {
	d := &report.DistanceTime{
		Title:         "Demo scenario — r–t plot",
		Diffusivities: []float64{0.3}, // m²/s
		Events: []report.DistanceEvent{
			{Time: 600, Distance: 20, Magnitude: -1.8},
			{Time: 3600, Distance: 95, Magnitude: -1.1},
		},
	}
	fmt.Println(d.WritePNG(io.Discard, report.Size{Width: 640, Height: 480}))
	// Output: <nil>
}

// Magnitude–frequency with a b-value, its error and Mc estimated
// elsewhere (the chart draws them, it does not fit them).
func ExampleMagnitudeFrequency_WritePNG() {
	m := &report.MagnitudeFrequency{
		Magnitudes:   []float64{-1.9, -1.6, -1.5, -1.5, -1.3, -1.2, -0.8, -0.2},
		BValue:       1.1,
		BError:       0.3,
		Completeness: -1.6,
	}
	fmt.Println(m.WritePNG(io.Discard, report.Size{Width: 640, Height: 480}))
	// Output: <nil>
}

// A batch case's stimulation probability on a 3 × 2 grid of 50 m cells
// with the 50 % contour around the cells at or above it.
func ExampleProbabilityMap_WritePNG() {
	m := &report.ProbabilityMap{
		Title:       "Demo batch — stimulation probability",
		Grid:        report.MapGrid{Cols: 3, Rows: 2, CellSize: 50, XMin: -75, YMin: -50},
		Probability: []float64{0, 0.6, 0.1, 0.2, 0.9, 0}, // South row first.
		Contours: []report.Contour{{Label: "50 %", Polygons: []report.Polygon{{{
			{East: -25, North: -50}, {East: 25, North: -50}, {East: 25, North: 50}, {East: -25, North: 50},
		}}}}},
	}
	fmt.Println(m.WritePNG(io.Discard, report.Size{Width: 640, Height: 480}))
	// Output: <nil>
}

// Per-realization ratios of the final stimulated area of a case to the
// reference case's in the same realization.
func ExampleRatioDistribution_WritePNG() {
	r := &report.RatioDistribution{
		Quantity:  "Final stimulated area",
		Reference: "1 cP",
		Cases:     []report.RatioSeries{{Label: "20 cP", Ratios: []float64{0.42, 0.55, 0.61, 0.7, 0.93}}},
	}
	fmt.Println(r.WritePNG(io.Discard, report.Size{Width: 640, Height: 480}))
	// Output: <nil>
}
