package report

import (
	"bytes"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/spatial/r3"
	"gonum.org/v1/gonum/stat/distuv"

	"slipfront/internal/numtest"
	"slipfront/internal/orient"
)

const deg = math.Pi / 180

// demoStereonet returns an invented fracture population: two Fisher-like
// clusters of poles and a few scattered planes, coloured by a made-up
// slip tendency, with an Andersonian normal-faulting stress state (Sv
// vertical, SHmax at 75°).
func demoStereonet(n int) *Stereonet {
	rng := rand.New(rand.NewPCG(3, 4))
	net := &Stereonet{
		Title:     "Demo scenario — fracture poles by slip tendency",
		Note:      fmt.Sprintf("%d fractures (invented)", n),
		Colour:    ColourScale{Label: "Slip tendency", Min: 0, Max: 0.8},
		Graticule: true,
		Axes: []StressAxis{
			{Name: "S1 (Sv)", Axis: r3.Vec{Z: 1}},
			{Name: "S2 (SHmax)", Axis: r3.Vec{X: math.Sin(75 * deg), Y: math.Cos(75 * deg)}},
			{Name: "S3 (Shmin)", Axis: r3.Vec{X: math.Sin(165 * deg), Y: math.Cos(165 * deg)}},
		},
	}
	for i := range n {
		dipDir, dip := 165*deg, 65*deg
		if i%2 == 1 {
			dipDir = 345 * deg
		}
		p := NetPlane{
			Dip:          math.Min(math.Pi/2, math.Abs(dip+0.12*rng.NormFloat64())),
			DipDirection: orient.Azimuth(dipDir + 0.15*rng.NormFloat64()),
		}
		p.Value = 0.8 * math.Sin(p.Dip) * math.Abs(math.Cos(p.DipDirection-165*deg))
		if i%10 == 0 {
			p.Value = math.NaN()
		}
		net.Planes = append(net.Planes, p)
	}
	return net
}

// TestEqualArea: poles of known planes land at r = √2·sin(θ/2) on a
// unit-radius net, θ = 90° − plunge (polar Lambert azimuthal equal-area
// projection; Snyder 1987, USGS PP 1395, Lambert azimuthal equal-area, ρ = 2R·sin(c/2) with
// R = 1/√2; the lower-hemisphere pole of a plane has trend = dip direction
// + 180° and plunge = 90° − dip: Allmendinger, Cardozo & Fisher 2012).
func TestEqualArea(t *testing.T) {
	for _, tc := range []struct {
		name         string
		dip, dipDir  float64 // degrees
		wantX, wantY float64
	}{
		// Horizontal plane: vertical pole at the centre.
		{"horizontal", 0, 0, 0, 0},
		// Vertical plane dipping east: horizontal pole to the west, on
		// the rim (θ = 90°, r = √2·sin 45° = 1).
		{"vertical east", 90, 90, -1, 0},
		// Dip 60° to the south: pole plunges 30° north, θ = 60°,
		// r = √2·sin 30° = 1/√2.
		{"60 south", 60, 180, 0, 1 / math.Sqrt2},
		// Dip 30° to the north-east: pole plunges 60° south-west,
		// θ = 30°, r = √2·sin 15°; x = y = r·sin 225° = −r/√2 = −sin 15°.
		{"30 north-east", 30, 45, -math.Sin(15 * deg), -math.Sin(15 * deg)},
	} {
		x, y := netPole(NetPlane{Dip: tc.dip * deg, DipDirection: tc.dipDir * deg})
		// projTol: a few float64 round-offs of numbers of size 1.
		const projTol = 1e-12
		numtest.Abs(t, tc.name+" x", x, tc.wantX, projTol)
		numtest.Abs(t, tc.name+" y", y, tc.wantY, projTol)
	}
}

// ringSectorBins counts points of a unit-radius net in K rings of equal
// area (r² in [k/K, (k+1)/K)) times S sectors of equal angle.
func ringSectorBins(xs, ys []float64, rings, sectors int) []float64 {
	counts := make([]float64, rings*sectors)
	for i := range xs {
		r2 := xs[i]*xs[i] + ys[i]*ys[i]
		k := min(int(r2*float64(rings)), rings-1)
		a := orient.Azimuth(math.Atan2(xs[i], ys[i]))
		s := min(int(a/(2*math.Pi)*float64(sectors)), sectors-1)
		counts[k*sectors+s]++
	}
	return counts
}

// pearson returns Pearson's chi-square statistic of counts against a
// uniform expectation.
func pearson(counts []float64) float64 {
	var total float64
	for _, c := range counts {
		total += c
	}
	e := total / float64(len(counts))
	var x2 float64
	for _, c := range counts {
		x2 += (c - e) * (c - e) / e
	}
	return x2
}

// TestEqualAreaUniform projects lines drawn uniformly on the lower
// hemisphere: an equal-area projection fills equal-area cells of the net
// equally, so Pearson's chi-square statistic over 5 equal-area rings × 8
// sectors must stay below the 0.999 quantile of χ² with 39 degrees of
// freedom (Pearson 1900, Philosophical Magazine 50(302), 157–175). The
// same test rejects the equal-angle (stereographic, r = tan(θ/2))
// projection, which crowds the rim: the test can fail.
func TestEqualAreaUniform(t *testing.T) {
	const n, rings, sectors = 20000, 5, 8
	rng := rand.New(rand.NewPCG(1, 2))
	xs, ys := make([]float64, n), make([]float64, n)
	sx, sy := make([]float64, n), make([]float64, n)
	for i := range n {
		// Uniform on the sphere: a normalised Gaussian vector (Muller
		// 1959, Communications of the ACM 2(4), 19–20).
		v := r3.Unit(r3.Vec{X: rng.NormFloat64(), Y: rng.NormFloat64(), Z: rng.NormFloat64()})
		trend, plunge := orient.TrendAndPlunge(v)
		xs[i], ys[i] = equalArea(trend, plunge)
		theta := math.Pi/2 - plunge
		r := math.Tan(theta / 2)
		sx[i], sy[i] = r*math.Sin(trend), r*math.Cos(trend)
	}
	limit := distuv.ChiSquared{K: rings*sectors - 1}.Quantile(0.999)
	if x2 := pearson(ringSectorBins(xs, ys, rings, sectors)); x2 > limit {
		t.Errorf("equal-area χ² = %.1f over %d cells, above the 0.999 quantile %.1f", x2, rings*sectors, limit)
	}
	if x2 := pearson(ringSectorBins(sx, sy, rings, sectors)); x2 <= limit {
		t.Errorf("equal-angle χ² = %.1f is not above %.1f: the test cannot tell the projections apart", x2, limit)
	}
}

// TestStereonetPoles draws three isolated poles at the bottom, middle and
// top of the colour range and one without a value, and checks the pixel
// at each pole's projected centre.
func TestStereonetPoles(t *testing.T) {
	n := &Stereonet{
		Colour: ColourScale{Label: "Slip tendency", Min: 0, Max: 1},
		Planes: []NetPlane{
			{Dip: 50 * deg, DipDirection: 30 * deg, Value: 0},
			{Dip: 70 * deg, DipDirection: 150 * deg, Value: 0.5},
			{Dip: 20 * deg, DipDirection: 260 * deg, Value: 1},
			{Dip: 85 * deg, DipDirection: 330 * deg, Value: math.NaN()},
		},
	}
	pg, f, err := n.render(DefaultSize)
	if err != nil {
		t.Fatal(err)
	}
	img := decodeImage(t, pg)
	// colourTol: 8-bit rounding; the 3.6 pt (8 px) pole fully covers its
	// centre pixel.
	const colourTol = 2
	for i, p := range n.Planes {
		want := greyNoValue
		if !math.IsNaN(p.Value) {
			want = Viridis(p.Value)
		}
		x, y := f.pixel(netPole(p))
		if got := nrgbaAt(img, int(x), int(y)); !near(got, want, colourTol) {
			t.Errorf("pole %d (value %g) at pixel (%.0f, %.0f) = %v, want %v", i, p.Value, x, y, got, want)
		}
	}
}

// TestStereonetAxes: each stress axis glyph is black at the axis's
// projected position, and the net's rim is black at the north point.
func TestStereonetAxes(t *testing.T) {
	n := demoStereonet(0)
	pg, f, err := n.render(DefaultSize)
	if err != nil {
		t.Fatal(err)
	}
	img := decodeImage(t, pg)
	if len(n.Axes) != 3 {
		t.Fatal("the demo needs three axes")
	}
	for _, a := range n.Axes {
		x, y := f.pixel(equalArea(orient.TrendAndPlunge(a.Axis)))
		// A 5.5 pt glyph (12 px): the 3 × 3 block at its centre is black.
		if d := darkest(img, int(x), int(y)); d.R > 10 || d.G > 10 || d.B > 10 {
			t.Errorf("axis %s at pixel (%.0f, %.0f): darkest %v, want black", a.Name, x, y, d)
		}
	}
	x, y := f.pixel(0, 1)
	if d := darkest(img, int(x), int(y)); d.R > 60 {
		t.Errorf("rim at north: darkest %v, want near black", d)
	}
}

func TestStereonetPicture(t *testing.T) {
	img := decodePNG(t, demoStereonet(300), DefaultSize)
	checkPicture(t, img, DefaultSize, minInkedChart, minColoursMap)
	// The graticule's light grey is drawn only with Graticule set. Its
	// 0.4 pt lines (0.9 px) are antialiased: gridTol admits the blend of
	// the line colour with white at the partly covered pixels.
	const gridTol = 30
	noGrid := demoStereonet(300)
	noGrid.Graticule = false
	with, without := countNear(img, colourGrid, gridTol), countNear(decodePNG(t, noGrid, DefaultSize), colourGrid, gridTol)
	if with < without+2000 {
		t.Errorf("graticule pixels: %d with, %d without: want at least 2000 more", with, without)
	}
}

func TestStereonetErrors(t *testing.T) {
	for _, tc := range []struct {
		name string
		n    Stereonet
		want string
	}{
		{"dip above 90", Stereonet{Planes: []NetPlane{{Dip: 2}}}, "Planes[0]: dip 2"},
		{"NaN direction", Stereonet{Planes: []NetPlane{{DipDirection: math.NaN()}}}, "Planes[0]"},
		{"infinite value", Stereonet{Planes: []NetPlane{{Value: math.Inf(1)}}}, "Planes[0].Value"},
		{"zero axis", Stereonet{Axes: []StressAxis{{Name: "S1"}}}, `Axes[0] ("S1")`},
		{"four axes", Stereonet{Axes: make([]StressAxis, 4)}, "at most 3"},
		{"inverted range", Stereonet{Colour: ColourScale{Min: 1, Max: 0}}, "Min < Max"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			checkError(t, func(w *bytes.Buffer) error { return tc.n.WritePNG(w, Size{}) }, tc.want)
		})
	}
}

func TestStereonetDegenerate(t *testing.T) {
	s := Size{Width: 640, Height: 480}
	for _, tc := range []struct {
		name string
		n    Stereonet
	}{
		{"empty", Stereonet{}},
		{"all NaN", Stereonet{Planes: []NetPlane{{Dip: 1, Value: math.NaN()}}}},
		{"one value", Stereonet{Planes: []NetPlane{{Dip: 1, Value: 3}, {Dip: 0.5, Value: 3}}}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			checkPicture(t, decodePNG(t, &tc.n, s), s, minInkedFrame, 4)
		})
	}
}
