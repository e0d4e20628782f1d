package pipeline

import (
	"errors"
	"fmt"
	"io"
	"math"
	"slices"

	"gonum.org/v1/gonum/spatial/r2"
	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/dfn"
	"slipfront/gis"
	"slipfront/mechanics"
	"slipfront/report"
	"slipfront/scenarios"
	"slipfront/sim"
)

// picture is one picture file of a folder with its caption on the report
// page: what to read from it.
type picture struct {
	file, caption string
	draw          interface {
		WritePNG(io.Writer, report.Size) error
	}
}

// writePictures writes each picture into dir at the default size.
func writePictures(dir string, ps []picture) error {
	for _, p := range ps {
		if err := writeFiles(dir, namedWriter{p.file, func(w io.Writer) error { return p.draw.WritePNG(w, report.Size{}) }}); err != nil {
			return fmt.Errorf("%s: %w", p.file, err)
		}
	}
	return nil
}

// images are the pictures as a page's images.
func images(ps []picture) []report.Image {
	out := make([]report.Image, len(ps))
	for i, p := range ps {
		out[i] = report.Image{File: p.file, Caption: p.caption}
	}
	return out
}

// writeRunPictures writes the run's pictures into dir and returns them
// with the notes of runPictures.
func writeRunPictures(dir string, r *Run) ([]picture, []string, error) {
	ps, notes, err := r.runPictures()
	if err != nil {
		return nil, nil, err
	}
	return ps, notes, writePictures(dir, ps)
}

// runPictures are the pictures of a run: the map; the growth chart when
// the run has a timeline (a stopped run read back has none); with events
// (ruptures or sub-resolution events), the distance–time chart; with
// ruptures whose catalogue allows a b-value, the magnitude–frequency
// chart; a section along each well. The notes say
// which pictures were left out and why.
func (r *Run) runPictures() (ps []picture, notes []string, err error) {
	m, err := r.MapPicture()
	if err != nil {
		return nil, nil, err
	}
	caption := "Map: where and when the natural fractures slipped (colour: first-slip time; grey: never), " +
		"primary conduits dashed, events as rings sized by magnitude, the stimulated-area outline and the SHmax direction."
	if len(m.SmallEvents) > 0 {
		caption += " Blue dots: the sub-resolution events of the seismicity-rate model."
	}
	if len(m.StressTicks) > 0 {
		caption += " Blue-grey ticks: SHmax as the parent wells' production left it."
	}
	ps = append(ps, picture{MapPictureFile, caption, m})
	if len(r.Result.Timeline) > 0 {
		ps = append(ps, picture{GrowthPictureFile, "Growth: how fast the stimulated area grows in each stage, against the bottom-hole pressure.",
			r.GrowthPicture()})
	}
	if len(r.Result.Events)+len(r.Result.RateEvents) > 0 {
		dt, err := r.DistanceTimePicture()
		if err != nil {
			return nil, nil, err
		}
		caption := "Distance–time: whether the events follow the triggering front of pressure diffusion, r = √(4πDt) " +
			"(Shapiro et al. 1997), with D from the initial apertures and the fluid; events far above it slipped on faster (dilated) " +
			"paths or on fractures pressured by an earlier stage."
		if len(dt.SmallEvents) > 0 {
			caption += " Small blue dots: the sub-resolution events of the seismicity-rate model."
		}
		ps = append(ps, picture{DistanceTimeFile, caption, dt})
	}
	if len(r.Result.Events) == 0 {
		notes = append(notes, "No ruptures: no magnitude–frequency chart.")
		if len(r.Result.RateEvents) == 0 {
			notes = append(notes, "No events: no distance–time chart.")
		}
	} else {
		mf, err := r.MagnitudeFrequencyPicture()
		switch {
		case errors.Is(err, errFewEvents):
			notes = append(notes, "No magnitude–frequency chart: "+err.Error())
		case err != nil:
			return nil, nil, err
		default:
			ps = append(ps, picture{MagnitudeFrequencyFile, "Magnitude–frequency: the size distribution of the synthetic events " +
				"(b-value: the slope above the completeness magnitude Mc).", mf})
		}
	}
	sections, err := r.SectionPictures()
	if err != nil {
		return nil, nil, err
	}
	for w, x := range sections {
		ps = append(ps, picture{sectionPictureFile(w), fmt.Sprintf("Section along well %s: the depth reach of the fractures "+
			"that slipped and of the events, against the layer.", r.Scenario.Wells[w].Name), x})
	}
	return ps, notes, nil
}

// DistanceTimePicture is the event distance from the injection point
// against time since the start of the event's stage, with the triggering
// front of the run's diffusivity (see Diffusivity). The injection point
// of an event is the nearest perforation cluster of its stage, on the
// layer mid-plane; the distance is three-dimensional. A run without stage
// summaries (a stopped run read back) measures from time 0 and the
// nearest cluster of any stage.
func (r *Run) DistanceTimePicture() (*report.DistanceTime, error) {
	d, desc, err := r.Diffusivity()
	if err != nil {
		return nil, err
	}
	s := r.Scenario
	clusters := r.clusterPoints()
	dt := &report.DistanceTime{
		Title:         fmt.Sprintf("%s — event distance from the injection point, realization %d", s.Name, r.Network.Realization),
		Note:          "Time since the start of each event's stage, distance from its nearest cluster. " + desc,
		Diffusivities: []float64{d},
	}
	for _, e := range r.Result.Events {
		dt.Events = append(dt.Events, r.distanceEvent(e, clusters))
	}
	for _, e := range r.Result.RateEvents {
		dt.SmallEvents = append(dt.SmallEvents, r.distanceEvent(e, clusters))
	}
	return dt, nil
}

// distanceEvent places event e on the distance–time chart: time since the
// start of its stage, distance from the nearest cluster of that stage.
func (r *Run) distanceEvent(e sim.Event, clusters map[int][]r3.Vec) report.DistanceEvent {
	start, from := 0.0, clusters[-1]
	if e.Stage >= 0 && e.Stage < len(r.Result.Stages) {
		start, from = r.Result.Stages[e.Stage].Start, clusters[e.Stage]
	}
	dist := math.Inf(1)
	at := r3.Vec{X: e.X, Y: e.Y, Z: -e.Depth}
	for _, c := range from {
		dist = math.Min(dist, r3.Norm(r3.Sub(at, c)))
	}
	return report.DistanceEvent{Time: e.Time - start, Distance: dist, Magnitude: e.Magnitude}
}

// clusterPoints returns the perforation clusters of each stage (by
// pumping-order index) on the layer mid-plane, local ENU metres, and
// under −1 those of every stage.
func (r *Run) clusterPoints() map[int][]r3.Vec {
	s := r.Scenario
	out := map[int][]r3.Vec{}
	for k, ps := range s.PumpingOrder() {
		path := r.Network.Wells[ps.Well].Path
		for _, d := range s.Wells[ps.Well].Stages[ps.Stage].Clusters {
			p := sim.PointAlong(path, d)
			v := r3.Vec{X: p.X, Y: p.Y, Z: -s.Layer.Depth}
			out[k] = append(out[k], v)
			out[-1] = append(out[-1], v)
		}
	}
	return out
}

// Diffusivity returns the hydraulic diffusivity of the natural fractures
// in their initial state, m²/s, and a sentence that states it: the median
// over the fractures crossing the layer of
//
//	D = T/S = e³/(12μ) / (e·c_f + ∂e/∂p),
//
// the cubic-law transmissivity per unit height over the storage per unit
// area of a fracture of aperture e with fluid compressibility c_f and
// normal compliance ∂e/∂p: the coefficients of the pressure-diffusion
// equation that package flow solves (its storage is the fluid's
// compressibility and the fracture's compliance), with e and ∂e/∂p from
// the aperture model (mechanics.ApertureModel.Evaluate) at the initial
// effective normal stress and no slip, and the viscosity and
// compressibility of the first stage's fluid. It ignores the dilation
// that slip adds, so events ahead of the front are expected.
func (r *Run) Diffusivity() (float64, string, error) {
	s := r.Scenario
	stress, err := mechanics.StressFromScenario(s.Stress, s.Layer.Depth)
	if err != nil {
		return 0, "", err
	}
	model, err := mechanics.ApertureFromScenario(s.Rock)
	if err != nil {
		return 0, "", err
	}
	order := s.PumpingOrder()
	if len(order) == 0 {
		return 0, "", fmt.Errorf("pipeline: scenario %s has no stage", s.Name)
	}
	fluidName := order[0].Fluid
	fluid := s.Fluids[fluidName]
	p0 := stress.PorePressure()
	var ds, es []float64
	seen := map[int]bool{}
	for _, t := range r.Network.Traces {
		if seen[t.Fracture] {
			continue
		}
		seen[t.Fracture] = true
		f := &r.Network.Fractures[t.Fracture]
		e, dedp := model.Evaluate(stress.Resolve(f.Normal).SigmaN, p0, 0, mechanics.Patch{Length: t.Length, Height: f.Height})
		ds = append(ds, e*e*e/(12*fluid.Viscosity*(e*fluid.Compressibility+dedp)))
		es = append(es, e)
	}
	if len(ds) == 0 {
		return 0, "", fmt.Errorf("pipeline: no fracture crosses the layer of %s: no diffusivity", s.Name)
	}
	d, e := median(ds), median(es)
	return d, fmt.Sprintf("D = e³/(12μ)/(e·c_f + ∂e/∂p) = %.3g m²/s: median over the fractures, initial aperture (median %.3g mm), %s (μ = %.3g cP).",
		d, e*1e3, fluidName, fluid.Viscosity*1e3), nil
}

// median returns the median of v (the mean of the middle two for an even
// count); v is sorted in place.
func median(v []float64) float64 {
	slices.Sort(v)
	n := len(v)
	if n%2 == 1 {
		return v[n/2]
	}
	return (v[n/2-1] + v[n/2]) / 2
}

// errFewEvents marks a catalogue too small for a b-value.
var errFewEvents = errors.New("too few events")

// bootstrapResamples of the catalogue give the uncertainty of Mc and b
// (mechanics.FitCatalogue) (Woessner & Wiemer 2005, Bulletin of the Seismological Society
// of America 95(2), 684–698: the bootstrap of the catalogue; 200
// resamples is their order of magnitude, from memory).
const bootstrapResamples = 200

// MagnitudeFrequencyPicture is the magnitude–frequency chart of the run's
// catalogue with Mc by maximum curvature (Wiemer & Wyss 2000, +0.2 of
// Woessner & Wiemer 2005; mechanics.MaxCurvatureCompleteness) and the
// b-value by maximum likelihood (Aki 1965; mechanics.BValue, magnitudes
// taken as continuous) with Shi & Bolt's (1982) standard error; the note
// adds the bootstrap standard deviations of Mc and b. It returns an error
// matching errFewEvents when fewer than two events reach Mc.
func (r *Run) MagnitudeFrequencyPicture() (*report.MagnitudeFrequency, error) {
	mags := make([]float64, len(r.Result.Events))
	for i, e := range r.Result.Events {
		mags[i] = e.Magnitude
	}
	mc, b, err := catalogueFit(mags)
	if err != nil {
		return nil, err
	}
	rng := dfn.Stream(r.Scenario.Seed, r.Network.Realization, 0, "magnitude bootstrap")
	var mcs, bs []float64
	sample := make([]float64, len(mags))
	for range bootstrapResamples {
		for i := range sample {
			sample[i] = mags[rng.IntN(len(mags))]
		}
		if m, e, err := catalogueFit(sample); err == nil {
			mcs, bs = append(mcs, m), append(bs, e.B)
		}
	}
	return &report.MagnitudeFrequency{
		Title: fmt.Sprintf("%s — magnitude–frequency, %d synthetic events, realization %d", r.Scenario.Name, len(mags), r.Network.Realization),
		Note: fmt.Sprintf("b by maximum likelihood (Aki 1965) of the %d events at or above Mc, ± Shi & Bolt (1982); Mc by maximum curvature + 0.2. "+
			"Bootstrap (%d of %d resamples fit): σ(Mc) = %.2f, σ(b) = %.2f.",
			b.Events, len(mcs), bootstrapResamples, stdDev(mcs), stdDev(bs)),
		Magnitudes: mags, BinWidth: mechanics.CatalogueBin, BValue: b.B, BError: b.ShiBoltError, Completeness: mc,
	}, nil
}

// catalogueFit is mechanics.FitCatalogue with its error matching
// errFewEvents.
func catalogueFit(mags []float64) (float64, mechanics.BValueEstimate, error) {
	mc, b, err := mechanics.FitCatalogue(mags)
	if err != nil {
		return 0, b, fmt.Errorf("%w for a b-value: %v", errFewEvents, err)
	}
	return mc, b, nil
}

// stdDev is the sample standard deviation of v, NaN for fewer than two.
func stdDev(v []float64) float64 {
	if len(v) < 2 {
		return math.NaN()
	}
	var mean, ss float64
	for _, x := range v {
		mean += x
	}
	mean /= float64(len(v))
	for _, x := range v {
		ss += (x - mean) * (x - mean)
	}
	return math.Sqrt(ss / float64(len(v)-1))
}

// sectionHalfWidth is how far from a well's section plane fractures and
// events are drawn, m: a choice that keeps the picture to the well's
// stimulated neighbourhood (common practice, no source).
const sectionHalfWidth = 100

// SectionPictures are vertical sections along each well (heel to toe in
// map view; a vertical well along SHmax through it, as long as the map's
// shorter side): the fractures crossing the layer coloured by first-slip
// time, the events and the layer.
func (r *Run) SectionPictures() ([]*report.CrossSection, error) {
	s := r.Scenario
	byFracture, err := r.fracturesByID(r.Result)
	if err != nil {
		return nil, err
	}
	var fractures []report.SectionFracture
	for _, t := range r.Network.Traces {
		f, ok := byFracture[t.Fracture]
		if !ok {
			continue
		}
		v := f.FirstSlip / 3600
		var outline []report.Point3
		for _, p := range fractureRing(&r.Network.Fractures[t.Fracture]) {
			outline = append(outline, report.Point3{East: p.X, North: p.Y, Depth: -p.Z})
		}
		fractures = append(fractures, report.SectionFracture{Outline: outline, Value: v})
	}
	var events []report.SectionEvent
	for _, e := range r.Result.Events {
		events = append(events, report.SectionEvent{At: report.Point3{East: e.X, North: e.Y, Depth: e.Depth}, Magnitude: e.Magnitude})
	}
	var out []*report.CrossSection
	for _, w := range s.Wells {
		from, to := sectionLine(s, w)
		x := &report.CrossSection{
			Title: fmt.Sprintf("%s — section along well %s, realization %d", s.Name, w.Name, r.Network.Realization),
			Note:  fmt.Sprintf("Fractures and events within %d m of the section plane; fractures crossing it are always drawn.", sectionHalfWidth),
			From:  from, To: to, HalfWidth: sectionHalfWidth,
			Fractures: fractures, Events: events,
			Colour:   report.ColourScale{Label: "First slip time", Unit: "h", NoValue: "Never slipped"},
			LayerTop: s.Layer.Depth - s.Layer.Thickness/2, LayerBottom: s.Layer.Depth + s.Layer.Thickness/2,
		}
		for _, o := range s.Wells {
			sw := report.SectionWell{Name: o.Name}
			for _, p := range o.Path {
				sw.Path = append(sw.Path, report.Point3{East: p.X, North: p.Y, Depth: p.Depth})
			}
			if len(sw.Path) == 1 {
				sw.Path = append(sw.Path, sw.Path[0])
			}
			x.Wells = append(x.Wells, sw)
		}
		out = append(out, x)
	}
	return out, nil
}

// sectionLine returns the ends of the section along well w: its first and
// last map-view points, or for a vertical well a line along SHmax through
// it, as long as the map's shorter side.
func sectionLine(s *scenarios.Scenario, w scenarios.Well) (from, to report.Point) {
	a, b := w.Path[0], w.Path[len(w.Path)-1]
	if a.X != b.X || a.Y != b.Y {
		return rp(a.X, a.Y), rp(b.X, b.Y)
	}
	half := math.Min(s.Domain.XMax-s.Domain.XMin, s.Domain.YMax-s.Domain.YMin) / 2
	sin, cos := math.Sincos(s.Stress.SHmaxAzimuth)
	u := r2.Vec{X: half * sin, Y: half * cos}
	return rp(a.X-u.X, a.Y-u.Y), rp(a.X+u.X, a.Y+u.Y)
}

// fractureRing is the outline of fracture f in local ENU metres: a
// gis.DefaultDiscVertices-gon for a disc, the four corners of a
// rectangle.
func fractureRing(f *dfn.Fracture) []r3.Vec {
	if f.Shape == dfn.Disc {
		return gis.DiscRing(f.Centre, f.Strike(), f.DownDip(), f.Size, gis.DefaultDiscVertices)
	}
	return gis.RectangleRing(f.Centre, f.Strike(), f.DownDip(), f.Size, f.Height)
}
