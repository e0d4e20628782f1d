package report

import (
	"fmt"
	"io"
	"math"
)

// Point is a map position in local East-North coordinates, m.
type Point struct {
	East  float64 // Local easting, m.
	North float64 // Local northing, m.
}

// Extent is a map rectangle in local coordinates, m.
type Extent struct {
	MinEast, MaxEast   float64 // West and east edges, m.
	MinNorth, MaxNorth float64 // South and north edges, m.
}

// Trace is a fracture trace on the map: a straight segment with a colour
// value.
type Trace struct {
	A, B Point // Ends, m.
	// Value, in ColourScale.Unit (e.g. first-slip time in hours); NaN
	// means no value (e.g. never slipped): the trace is drawn thin and grey.
	Value float64
}

// ColourScale names the quantity of Trace.Value and its range.
type ColourScale struct {
	Label string // Quantity, e.g. "First slip time".
	Unit  string // Unit of Trace.Value as drawn, e.g. "h".
	// Min and Max are the values drawn with the first and last colours;
	// both zero means the range of the finite trace values. Values outside
	// are drawn with the end colours.
	Min, Max float64
	// NoValue is the key's text for traces without a value, e.g. "Never
	// slipped"; empty means "No value".
	NoValue string
}

// Well is a well path in map view.
type Well struct {
	Name string  // Drawn beside the path's first point in the frame.
	Path []Point // Map-view path, m; one point draws a vertical well.
}

// Cluster is a perforation cluster in map view.
type Cluster struct {
	At    Point  // Position, m.
	Stage string // Stage name; each stage is labelled once, near its clusters.
}

// Event is a synthetic microseismic event in map view.
type Event struct {
	At        Point   // Epicentre, m.
	Magnitude float64 // Moment magnitude Mw.
}

// Segment is a straight map-view segment, such as a primary conduit.
type Segment struct {
	A, B Point // Ends, m.
}

// Polygon is an area outline: the first ring is the outer boundary, any
// further rings are holes. Rings need not repeat their first point.
type Polygon [][]Point

// Map is the quick-look map of a run: fracture traces coloured by a value,
// primary conduits, wells, clusters, events, the stimulated-area outline,
// a scale bar, a north arrow and, optionally, the SHmax direction.
//
// The stimulated traces read first: events are light grey rings drawn
// beneath the coloured traces, the outline is a thin line, and labels are
// placed clear of the cluster markers, the events and each other.
type Map struct {
	Title string // Drawn at the top; the caller's words.
	// Extent is the area shown (always whole; widened along one axis for
	// an equal aspect ratio). The zero Extent fits the features with a 5 %
	// margin.
	Extent Extent
	// CRSNote is printed at the bottom, e.g. "Local frame: origin at
	// E 500000 m, N 3500000 m of EPSG:32614"; empty prints nothing.
	CRSNote string

	Traces   []Trace
	Colour   ColourScale
	Wells    []Well
	Clusters []Cluster
	Events   []Event
	// SmallEvents are the epicentres of events below the resolution of
	// the fractures (a seismicity-rate catalogue): small dots beneath the
	// rings of Events, fainter the more there are.
	SmallEvents []Point
	Outline     []Polygon // Stimulated area, drawn as outlines.
	// Conduits are primary conduits (map-view segments), drawn as dashed
	// dark lines above the traces.
	Conduits []Segment
	// SHmax, when not nil, is the azimuth of the maximum horizontal
	// stress, radians clockwise from north, drawn as a double-headed
	// arrow in the upper-left corner.
	SHmax *float64
	// StressTicks are local SHmax directions (a stress field that varies,
	// such as after depletion), drawn beneath everything as short grey
	// ticks centred on their points.
	StressTicks []StressTick
}

// StressTick is the direction of SHmax at a point of the map.
type StressTick struct {
	At Point
	// Azimuth of SHmax, radians clockwise from north.
	Azimuth float64
}

// WritePNG draws the map at size s (zero: DefaultSize) and writes it to w
// as PNG. Invalid input returns an error and writes nothing.
func (m *Map) WritePNG(w io.Writer, s Size) error {
	pg, _, err := m.render(s)
	if err != nil {
		return err
	}
	return pg.writePNG(w)
}

// validate checks every coordinate and value of m.
func (m *Map) validate() error {
	for i, t := range m.Traces {
		if err := checkPoint("Traces", i, "A", t.A); err != nil {
			return err
		}
		if err := checkPoint("Traces", i, "B", t.B); err != nil {
			return err
		}
		if math.IsInf(t.Value, 0) {
			return fmt.Errorf("report: map Traces[%d].Value = %g: must be finite or NaN (no value)", i, t.Value)
		}
	}
	for i, w := range m.Wells {
		if len(w.Path) == 0 {
			return fmt.Errorf("report: map Wells[%d] (%q) has an empty path: need at least one point", i, w.Name)
		}
		for j, p := range w.Path {
			if err := checkPoint("Wells", i, fmt.Sprintf("Path[%d]", j), p); err != nil {
				return err
			}
		}
	}
	for i, c := range m.Clusters {
		if err := checkPoint("Clusters", i, "At", c.At); err != nil {
			return err
		}
	}
	for i, c := range m.Conduits {
		if err := checkPoint("Conduits", i, "A", c.A); err != nil {
			return err
		}
		if err := checkPoint("Conduits", i, "B", c.B); err != nil {
			return err
		}
	}
	for i, t := range m.StressTicks {
		if err := checkPoint("StressTicks", i, "At", t.At); err != nil {
			return err
		}
		if !finite(t.Azimuth) {
			return fmt.Errorf("report: map StressTicks[%d].Azimuth = %g rad: must be finite", i, t.Azimuth)
		}
	}
	if m.SHmax != nil && !finite(*m.SHmax) {
		return fmt.Errorf("report: map SHmax azimuth = %g rad: must be finite", *m.SHmax)
	}
	for i, p := range m.SmallEvents {
		if err := checkPoint("SmallEvents", i, "", p); err != nil {
			return err
		}
	}
	for i, e := range m.Events {
		if err := checkPoint("Events", i, "At", e.At); err != nil {
			return err
		}
		if !finite(e.Magnitude) {
			return fmt.Errorf("report: map Events[%d].Magnitude = %g: must be finite", i, e.Magnitude)
		}
	}
	for i, poly := range m.Outline {
		for j, ring := range poly {
			if len(ring) < 3 {
				return fmt.Errorf("report: map Outline[%d] ring %d has %d points: need at least 3", i, j, len(ring))
			}
			for k, p := range ring {
				if err := checkPoint("Outline", i, fmt.Sprintf("ring %d point %d", j, k), p); err != nil {
					return err
				}
			}
		}
	}
	return m.validateScale()
}

// validateScale checks the colour range.
func (m *Map) validateScale() error { return checkColourRange("map", m.Colour) }

// checkPoint returns an error when p has a NaN or infinite coordinate.
func checkPoint(list string, i int, what string, p Point) error {
	if !finite(p.East) || !finite(p.North) {
		field := fmt.Sprintf("%s[%d]", list, i)
		if what != "" {
			field += "." + what
		}
		return fmt.Errorf("report: map %s = (%g, %g) m: coordinates must be finite", field, p.East, p.North)
	}
	return nil
}

// extent returns the area to show: m.Extent when set, else the features'
// bounding box with a 5 % margin (at least minFitHalf on each side of the
// centre).
func (m *Map) extent() (Extent, error) {
	e := m.Extent
	if e != (Extent{}) {
		return e, checkExtent(e)
	}
	b, ok := m.bounds()
	if !ok {
		return e, fmt.Errorf("report: map has no Extent and no features to fit one to")
	}
	const marginShare = 0.05 // Margin around fitted features, share of the larger side.
	const minFitHalf = 50.0  // Smallest half-width of a fitted extent, m.
	pad := marginShare * math.Max(b.MaxEast-b.MinEast, b.MaxNorth-b.MinNorth)
	b.MinEast, b.MaxEast = widen(b.MinEast-pad, b.MaxEast+pad, minFitHalf)
	b.MinNorth, b.MaxNorth = widen(b.MinNorth-pad, b.MaxNorth+pad, minFitHalf)
	if err := checkSides(b); err != nil {
		return b, fmt.Errorf("%w (extent fitted to the features; set Map.Extent)", err)
	}
	return b, nil
}

// checkExtent requires finite edges in order and sides within limits.
func checkExtent(e Extent) error {
	if !finite(e.MinEast) || !finite(e.MaxEast) || !finite(e.MinNorth) || !finite(e.MaxNorth) ||
		!(e.MaxEast > e.MinEast) || !(e.MaxNorth > e.MinNorth) {
		return fmt.Errorf("report: map Extent east [%g, %g] m, north [%g, %g] m: need finite edges with MinEast < MaxEast and MinNorth < MaxNorth",
			e.MinEast, e.MaxEast, e.MinNorth, e.MaxNorth)
	}
	return checkSides(e)
}

// Limits of the sides of a map extent, m.
const (
	minExtentSide = 0.01
	maxExtentSide = 1e7
)

// checkSides requires both sides of e within [minExtentSide, maxExtentSide].
func checkSides(e Extent) error {
	w, h := e.MaxEast-e.MinEast, e.MaxNorth-e.MinNorth
	if !(w >= minExtentSide && w <= maxExtentSide && h >= minExtentSide && h <= maxExtentSide) {
		return fmt.Errorf("report: map extent %g m × %g m: each side must be %g–%g m", w, h, minExtentSide, maxExtentSide)
	}
	return nil
}

// widen returns [lo, hi] grown about its centre to a half-width of at least
// half.
func widen(lo, hi, half float64) (float64, float64) {
	if hi-lo >= 2*half {
		return lo, hi
	}
	c := (lo + hi) / 2
	return c - half, c + half
}

// bounds returns the bounding box of every feature, and false when there
// is none.
func (m *Map) bounds() (Extent, bool) {
	b := Extent{math.Inf(1), math.Inf(-1), math.Inf(1), math.Inf(-1)}
	add := func(p Point) {
		b.MinEast, b.MaxEast = math.Min(b.MinEast, p.East), math.Max(b.MaxEast, p.East)
		b.MinNorth, b.MaxNorth = math.Min(b.MinNorth, p.North), math.Max(b.MaxNorth, p.North)
	}
	for _, t := range m.Traces {
		add(t.A)
		add(t.B)
	}
	for _, w := range m.Wells {
		for _, p := range w.Path {
			add(p)
		}
	}
	for _, c := range m.Clusters {
		add(c.At)
	}
	for _, c := range m.Conduits {
		add(c.A)
		add(c.B)
	}
	for _, e := range m.Events {
		add(e.At)
	}
	for _, p := range m.SmallEvents {
		add(p)
	}
	for _, poly := range m.Outline {
		for _, ring := range poly {
			for _, p := range ring {
				add(p)
			}
		}
	}
	return b, b.MaxEast >= b.MinEast
}

// colourRange returns the value range of the colour scale, and false when
// no trace has a value.
func (m *Map) colourRange() (lo, hi float64, ok bool) {
	return valueRange(m.Colour, func(yield func(float64) bool) {
		for _, t := range m.Traces {
			if !yield(t.Value) {
				return
			}
		}
	})
}

// magnitudeLevels returns the integer magnitudes of the map's size key.
func (m *Map) magnitudeLevels() []float64 {
	mws := make([]float64, len(m.Events))
	for i, e := range m.Events {
		mws[i] = e.Magnitude
	}
	return magnitudeLevels(mws)
}

// magnitudeLevels returns the integer magnitudes of a size key: from
// floor(min Mw) up to the first level at or above max Mw, in steps of
// one or more so that there are at most five levels; nil for no
// magnitudes.
func magnitudeLevels(mws []float64) []float64 {
	if len(mws) == 0 {
		return nil
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, mw := range mws {
		lo, hi = math.Min(lo, mw), math.Max(hi, mw)
	}
	lo, hi = math.Floor(lo), math.Ceil(hi)
	const maxLevels = 5
	step := math.Max(1, math.Ceil((hi-lo)/(maxLevels-1)))
	var levels []float64
	for v := lo; ; v += step {
		levels = append(levels, v)
		if v >= hi {
			return levels
		}
	}
}

// formatMagnitude writes a key magnitude (an integer) without decimals.
func formatMagnitude(mw float64) string {
	if mw == 0 {
		mw = 0 // Drop the sign of −0.
	}
	return fmt.Sprintf("%.0f", mw)
}
