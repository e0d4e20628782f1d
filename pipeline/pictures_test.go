package pipeline

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"image"
	"image/color"
	"image/png"
	"io"
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"sync"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/batch"
	"slipfront/dfn"
	"slipfront/internal/badinput"
	"slipfront/internal/numtest"
	"slipfront/mechanics"
	"slipfront/report"
	"slipfront/sim"
)

var (
	sharedRunOnce sync.Once
	sharedRunDir  string
	sharedRunErr  error
)

// sharedRun returns the small zipper pad run of runFolder, simulated once for
// the tests that only read its folder, read back with LoadRun.
func sharedRun(t *testing.T) (string, *Run) {
	t.Helper()
	sharedRunOnce.Do(func() {
		var tmp string
		if tmp, sharedRunErr = os.MkdirTemp("", "slipfront-pipeline-run-"); sharedRunErr != nil {
			return
		}
		sharedRunDir = filepath.Join(tmp, "run")
		s := loadExample(t, "zipper-pad", smallPad...)
		_, sharedRunErr = Simulate(context.Background(), s, SimulateOptions{Out: Folder{Dir: sharedRunDir}})
	})
	if sharedRunErr != nil {
		t.Fatal(sharedRunErr)
	}
	r, err := LoadRun(sharedRunDir, math.NaN())
	if err != nil {
		t.Fatal(err)
	}
	return sharedRunDir, r
}

func TestMain(m *testing.M) {
	code := m.Run()
	if sharedRunDir != "" {
		os.RemoveAll(filepath.Dir(sharedRunDir))
	}
	os.Exit(code)
}

// The slip-share chart's line for all fractures is the screening's own
// curve, and each set's line meets the screening's per-set shares at the
// reported increases: the chart counts what the screening counts.
func TestSlipSharesMatchScreening(t *testing.T) {
	s := loadExample(t, "zipper-pad")
	_, sc, _, err := screen(s)
	if err != nil {
		t.Fatal(err)
	}
	c := slipShares(s, sc)
	if len(c.Series) != len(sc.Sets)+1 || len(sc.Curve) < 2 {
		t.Fatalf("%d series for %d sets, curve of %d points", len(c.Series), len(sc.Sets), len(sc.Curve))
	}
	all := c.Series[len(c.Series)-1]
	// Relative round-off of two running sums of about 10³ trace lengths
	// in different orders: 10³ ulps is ample.
	const sumTol = 1e3 * 0x1p-52
	for i, cp := range sc.Curve {
		if all.Fractures[i] != cp.FractureShare {
			t.Errorf("Δp %g MPa: fracture share %g, screening %g", cp.Increase/1e6, all.Fractures[i], cp.FractureShare)
		}
		numtest.Abs(t, fmt.Sprintf("trace-length share at %g MPa", cp.Increase/1e6), all.TraceLength[i], cp.TraceLengthShare, sumTol)
	}
	matched := 0
	for j, dp := range sc.Increases {
		i := slices.Index(all.Increase, dp)
		if i < 0 {
			continue
		}
		for k, sh := range sc.Sets {
			if got := c.Series[k].Fractures[i]; got != sh.FractureShare[j] {
				t.Errorf("set %s at %g MPa: share %g, screening %g", sh.Name, dp/1e6, got, sh.FractureShare[j])
			}
			matched++
		}
	}
	if matched == 0 {
		t.Error("no reported increase lies on the curve: nothing compared")
	}
}

// The diffusivity of the front is e³/(12μ)/(e·c_f + ∂e/∂p) with the
// closure law of Willis-Richards, Watanabe & Takahashi (1996): e =
// e0/(1 + 9σn′/σn,ref), ∂e/∂p = 9e0/σn,ref/(1 + 9σn′/σn,ref)², written
// out here for the single fracture of the example.
func TestDiffusivity(t *testing.T) {
	s := loadExample(t, "single-fracture")
	net, err := dfn.Generate(s, 0)
	if err != nil {
		t.Fatal(err)
	}
	if len(net.Fractures) != 1 || len(net.Traces) == 0 {
		t.Fatalf("%d fractures, %d traces: want the one fracture crossing the layer", len(net.Fractures), len(net.Traces))
	}
	st, err := mechanics.StressFromScenario(s.Stress, s.Layer.Depth)
	if err != nil {
		t.Fatal(err)
	}
	eff := st.Resolve(net.Fractures[0].Normal).SigmaN - st.PorePressure()
	rock := s.Rock
	f := 1 + 9*eff/rock.ClosureStress
	e, dedp := rock.ZeroStressAperture/f, 9*rock.ZeroStressAperture/rock.ClosureStress/(f*f)
	fluid := s.Fluids[s.PumpingOrder()[0].Fluid]
	want := e * e * e / (12 * fluid.Viscosity * (e*fluid.Compressibility + dedp))
	got, desc, err := (&Run{Scenario: s, Network: net}).Diffusivity()
	if err != nil {
		t.Fatal(err)
	}
	// The same formula evaluated in another order: a few ulps.
	numtest.Rel(t, "D", got, want, 1e-14)
	if !bytes.Contains([]byte(desc), []byte(fmt.Sprintf("%.3g m²/s", want))) {
		t.Errorf("description %q does not state D = %.3g m²/s", desc, want)
	}
}

// Every event lies at or after the start of its stage, and its distance
// is the three-dimensional distance from the nearest cluster of its stage
// on the layer mid-plane.
func TestDistanceTime(t *testing.T) {
	_, r := sharedRun(t)
	withStages(t, r)
	dt, err := r.DistanceTimePicture()
	if err != nil {
		t.Fatal(err)
	}
	events := r.Result.Events
	if len(events) == 0 || len(dt.Events) != len(events) {
		t.Fatalf("%d points for %d events", len(dt.Events), len(events))
	}
	// Event times are written with 3 decimals (sim.WriteEvents).
	const timeTol = 5e-4
	for i, e := range dt.Events {
		if e.Time < -timeTol || e.Distance < 0 {
			t.Fatalf("event %d: %g s after its stage's start, %g m: want both ≥ 0", i, e.Time, e.Distance)
		}
	}
	e := events[len(events)-1]
	ps := r.Scenario.PumpingOrder()[e.Stage]
	want := math.Inf(1)
	for _, d := range r.Scenario.Wells[ps.Well].Stages[ps.Stage].Clusters {
		p := sim.PointAlong(r.Network.Wells[ps.Well].Path, d)
		want = math.Min(want, math.Sqrt((p.X-e.X)*(p.X-e.X)+(p.Y-e.Y)*(p.Y-e.Y)+(e.Depth-r.Scenario.Layer.Depth)*(e.Depth-r.Scenario.Layer.Depth)))
	}
	numtest.Rel(t, "distance of the last event", dt.Events[len(events)-1].Distance, want, 1e-12)
	numtest.Abs(t, "time of the last event since its stage", dt.Events[len(events)-1].Time, e.Time-r.Result.Stages[e.Stage].Start, 1e-9)
}

// withStages adds the stage summaries of the shared run folder to r, as
// the report does.
func withStages(t *testing.T, r *Run) {
	t.Helper()
	if err := readFile(filepath.Join(sharedRunDir, SummaryFile), func(f io.Reader) (err error) {
		sum, err := sim.ReadSummary(f, SummaryFile)
		r.Result.Stages = sum.Stages
		return err
	}); err != nil {
		t.Fatal(err)
	}
}

// seriesBlue is the colour of the cumulative counts on the
// magnitude–frequency chart (Okabe & Ito 2008 blue).
var seriesBlue = color.NRGBA{0, 114, 178, 255}

// The run's magnitude–frequency picture shows its catalogue: one blue
// marker per magnitude bin from the smallest to the largest magnitude,
// equally spaced across, at heights linear in log₁₀N(≥ M) of the
// catalogue (the chart's logarithmic count axis).
func TestMagnitudeFrequencyShowsCatalogue(t *testing.T) {
	_, r := sharedRun(t)
	mf, err := r.MagnitudeFrequencyPicture()
	if err != nil {
		t.Fatal(err)
	}
	var b bytes.Buffer
	if err := mf.WritePNG(&b, report.Size{}); err != nil {
		t.Fatal(err)
	}
	img, err := png.Decode(&b)
	if err != nil {
		t.Fatal(err)
	}
	// The catalogue's cumulative counts, binned as magnitudes are read
	// at the bin width (a magnitude within 10⁻⁹ bins of an edge counts
	// in the bin above it).
	var counts []float64
	k0, k1 := math.Inf(1), math.Inf(-1)
	for _, e := range r.Result.Events {
		k := math.Floor(e.Magnitude/mechanics.CatalogueBin + 1e-9)
		k0, k1 = math.Min(k0, k), math.Max(k1, k)
	}
	for k := k0; k <= k1; k++ {
		n := 0
		for _, e := range r.Result.Events {
			if math.Floor(e.Magnitude/mechanics.CatalogueBin+1e-9) >= k {
				n++
			}
		}
		counts = append(counts, float64(n))
	}
	// A marker crossed by the Gutenberg–Richter or the Mc line falls
	// apart in pieces: join the pieces within a marker's diameter (3.5 pt
	// radius at 160 dpi: 15.6 px).
	blobs := joinBlobs(colourBlobs(img, seriesBlue), 16)
	// One more blob: the marker in the key, below the chart.
	if len(blobs) != len(counts)+1 {
		t.Fatalf("%d blue markers, want %d bins + 1 in the key", len(blobs), len(counts))
	}
	slices.SortFunc(blobs, func(a, b blob) int { return int(math.Copysign(1, a.y-b.y)) })
	markers := blobs[:len(counts)] // The key marker is the lowest.
	slices.SortFunc(markers, func(a, b blob) int { return int(math.Copysign(1, a.x-b.x)) })
	// Centroids of anti-aliased discs: within a pixel.
	const pixelTol = 1.5
	step := (markers[len(markers)-1].x - markers[0].x) / float64(len(markers)-1)
	n0, n1 := math.Log10(counts[0]), math.Log10(counts[len(counts)-1])
	if n0 == n1 {
		t.Fatal("every bin has the same count: the heights cannot be checked")
	}
	perDecade := (markers[len(markers)-1].y - markers[0].y) / (n1 - n0)
	for i, m := range markers {
		numtest.Abs(t, fmt.Sprintf("marker %d across", i), m.x, markers[0].x+float64(i)*step, pixelTol)
		numtest.Abs(t, fmt.Sprintf("marker %d height (N = %g)", i, counts[i]), m.y, markers[0].y+perDecade*(math.Log10(counts[i])-n0), pixelTol)
	}
}

// blob is a connected set of pixels of one colour: its centroid and its
// number of pixels.
type blob struct{ x, y, n float64 }

// joinBlobs joins blobs whose centroids lie closer than d pixels.
func joinBlobs(bs []blob, d float64) []blob {
	var out []blob
	for _, b := range bs {
		joined := false
		for i, o := range out {
			if math.Hypot(o.x-b.x, o.y-b.y) < d {
				n := o.n + b.n
				out[i] = blob{(o.x*o.n + b.x*b.n) / n, (o.y*o.n + b.y*b.n) / n, n}
				joined = true
				break
			}
		}
		if !joined {
			out = append(out, b)
		}
	}
	return out
}

// colourBlobs returns the 4-connected components of the pixels of exactly
// colour c.
func colourBlobs(img image.Image, c color.NRGBA) []blob {
	bounds := img.Bounds()
	w, h := bounds.Dx(), bounds.Dy()
	is := func(x, y int) bool {
		return color.NRGBAModel.Convert(img.At(bounds.Min.X+x, bounds.Min.Y+y)) == c
	}
	seen := make([]bool, w*h)
	var out []blob
	for y := range h {
		for x := range w {
			if seen[y*w+x] || !is(x, y) {
				continue
			}
			var sx, sy, n float64
			stack := [][2]int{{x, y}}
			seen[y*w+x] = true
			for len(stack) > 0 {
				p := stack[len(stack)-1]
				stack = stack[:len(stack)-1]
				sx, sy, n = sx+float64(p[0]), sy+float64(p[1]), n+1
				for _, d := range [4][2]int{{1, 0}, {-1, 0}, {0, 1}, {0, -1}} {
					q := [2]int{p[0] + d[0], p[1] + d[1]}
					if q[0] >= 0 && q[0] < w && q[1] >= 0 && q[1] < h && !seen[q[1]*w+q[0]] && is(q[0], q[1]) {
						seen[q[1]*w+q[0]] = true
						stack = append(stack, q)
					}
				}
			}
			out = append(out, blob{sx / n, sy / n, n})
		}
	}
	return out
}

// The map shows the conduits as conduits (not as traces) and the SHmax
// azimuth of the scenario.
func TestMapConduitsAndSHmax(t *testing.T) {
	_, r := sharedRun(t)
	m, err := r.MapPicture()
	if err != nil {
		t.Fatal(err)
	}
	conduits := 0
	for _, el := range r.Result.Elements {
		if el.Set == sim.ConduitSet {
			conduits++
		}
	}
	if conduits == 0 || len(m.Conduits) != conduits || len(m.Traces) != len(r.Result.Elements)-conduits {
		t.Errorf("%d conduits and %d traces drawn; the run has %d conduit elements of %d", len(m.Conduits), len(m.Traces), conduits, len(r.Result.Elements))
	}
	if m.SHmax == nil || *m.SHmax != r.Scenario.Stress.SHmaxAzimuth {
		t.Errorf("SHmax arrow %v, want the scenario's azimuth %g rad", m.SHmax, r.Scenario.Stress.SHmaxAzimuth)
	}
}

// The section of a well draws every fracture crossing the layer once,
// with the outline DiscRing or RectangleRing gives.
func TestSections(t *testing.T) {
	_, r := sharedRun(t)
	xs, err := r.SectionPictures()
	if err != nil {
		t.Fatal(err)
	}
	if len(xs) != len(r.Scenario.Wells) {
		t.Fatalf("%d sections for %d wells", len(xs), len(r.Scenario.Wells))
	}
	crossing := map[int]bool{}
	for _, tr := range r.Network.Traces {
		crossing[tr.Fracture] = true
	}
	if got := len(xs[0].Fractures); got != len(crossing) {
		t.Errorf("%d fractures drawn, %d cross the layer", got, len(crossing))
	}
	f := &r.Network.Fractures[r.Network.Traces[0].Fracture]
	ring := fractureRing(f)
	want := f.Shape == dfn.Disc && len(ring) == 32 || f.Shape != dfn.Disc && len(ring) == 4
	if !want {
		t.Errorf("fracture of shape %v has an outline of %d vertices", f.Shape, len(ring))
	}
	for i, p := range ring { // Every vertex lies on the fracture's plane.
		numtest.Abs(t, fmt.Sprintf("vertex %d off the plane, m", i), r3.Dot(r3.Sub(p, f.Centre), f.Normal), 0, 1e-9*f.Size)
	}
}

// A batch folder keeps its base scenario (checked against the manifest's
// digest): its maps show the wells, and say that they cannot without it;
// the page then lists the scenario's inputs.
func TestBatchMapsWells(t *testing.T) {
	out, m := singleFractureBatch(t)
	aggs := readAggregates(t, out)
	wellsOn := func(ps []picture) int {
		maps := 0
		for _, p := range ps {
			switch d := p.draw.(type) {
			case *report.ProbabilityMap:
				maps += len(d.Wells)
			case *report.DifferenceMap:
				maps += len(d.Wells)
			}
		}
		return maps
	}
	ps, notes, err := batchPictures(m, aggs, nil)
	if err != nil {
		t.Fatal(err)
	}
	if wellsOn(ps) != 0 || !slices.ContainsFunc(notes, func(n string) bool { return strings.Contains(n, "no wells") }) {
		t.Errorf("without a scenario: %d wells drawn, notes %q", wellsOn(ps), notes)
	}
	// The batch kept its base scenario: single-fracture with the batch's
	// overrides and no sweep value.
	s := loadExample(t, "single-fracture", singleFractureBatchSets...)
	got, err := batch.ReadScenario(out, m)
	if err != nil || got == nil || got.Digest != s.Digest {
		t.Fatalf("batch scenario %v, error %v; want the base scenario %.12s…", got, err, s.Digest)
	}
	ps, _, err = batchPictures(m, aggs, got)
	if err != nil {
		t.Fatal(err)
	}
	// Two probability maps and one difference map, each with the wells.
	if want := 3 * len(s.Wells); len(s.Wells) == 0 || wellsOn(ps) != want {
		t.Errorf("%d wells drawn on the maps, want %d", wellsOn(ps), want)
	}
	// The GeoPackage gets the wells after the cases' contours, and export
	// writes them on their own (single-fracture has no CRS, so no GeoJSON).
	layers, _, _, err := batchLayers(out, m, aggs)
	if err != nil {
		t.Fatal(err)
	}
	if n := len(layers); n != len(aggs)+1 || layers[n-1].Name != "wells" || len(layers[n-1].Features) != len(s.Wells) {
		t.Errorf("batch layers %d, the last %q with %d features; want %d case layers and the %d wells", n, layers[n-1].Name, len(layers[n-1].Features), len(aggs), len(s.Wells))
	}
	var wells bytes.Buffer
	if _, err := Export(context.Background(), out, ExportOptions{Format: "gpkg", Layer: "wells", Out: StdoutName, Stdout: &wells, Time: math.NaN()}); err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(wells.String(), "SQLite format 3\x00") {
		t.Errorf("export of the batch's wells: %.20q", wells.String())
	}
	rep := t.TempDir()
	if err := WriteReport(context.Background(), out, Folder{Dir: rep}); err != nil {
		t.Fatal(err)
	}
	page, err := os.ReadFile(filepath.Join(rep, ReportPageFile))
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(page), "Resolved scenario") || !strings.Contains(string(page), "<td>schedule.injection_pressure</td><td>43 MPa</td>") {
		t.Error("the batch page does not list the scenario's inputs")
	}
	if err := writeFiles(out, scenarioWriter(loadExample(t, "zipper-pad"))); err != nil {
		t.Fatal(err)
	}
	if _, err := batch.ReadScenario(out, m); !errors.Is(err, badinput.Err) || !strings.Contains(err.Error(), "mixes two scenarios") {
		t.Errorf("another scenario in the batch folder: %v", err)
	}
}
