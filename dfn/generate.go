package dfn

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/spatial/r2"
	"gonum.org/v1/gonum/spatial/r3"
	"gonum.org/v1/gonum/stat/distuv"

	"slipfront/internal/orient"
	"slipfront/scenarios"
)

// Generate builds realization number realization (≥ 0) of the scenario's
// fracture network: each set's fractures (see the package documentation
// for the process), the mapped fractures as rectangles of set KnownSet,
// the traces on the layer mid-plane, their intersections, clusters and
// the wells' crossings. It returns a *CapError (errors.Is
// ErrTooManyFractures) before generating anything when the expected number
// of fractures exceeds s.Numerics.MaxFractures (DefaultMaxFractures when
// 0), and an error naming the key for any value it cannot use.
func Generate(s *scenarios.Scenario, realization int) (*Network, error) {
	if s == nil {
		return nil, fmt.Errorf("dfn: no scenario")
	}
	if realization < 0 {
		return nil, fmt.Errorf("dfn: realization = %d: must be ≥ 0", realization)
	}
	region, err := NewRegion(s.Domain, s.Layer)
	if err != nil {
		return nil, err
	}
	models := make([]*SetModel, len(s.Sets))
	for i, set := range s.Sets {
		if models[i], err = NewSetModel(set, region); err != nil {
			return nil, fmt.Errorf("dfn: sets[%d] (%q): %w", i, set.Name, err)
		}
	}
	wells, err := wellPaths(s.Wells)
	if err != nil {
		return nil, err
	}
	known := s.KnownFractures.Fractures
	if err := checkCap(models, len(known), s.Numerics.MaxFractures); err != nil {
		return nil, err
	}

	net := &Network{Seed: s.Seed, Realization: realization, Region: region, Wells: wells}
	for i, m := range models {
		net.Sets = append(net.Sets, m.Info)
		net.Fractures = m.Generate(net.Fractures, s.Seed, realization, i, region)
	}
	for i, k := range known {
		f, err := KnownFracture(k)
		if err != nil {
			return nil, fmt.Errorf("dfn: %s:%d: known fracture %d (%q): %w",
				s.KnownFractures.File, k.Line, i, k.Name, err)
		}
		net.Fractures = append(net.Fractures, f)
	}
	net.Traces = Traces(net.Fractures, region)
	segs := make([]Segment, len(net.Traces))
	for i := range net.Traces {
		segs[i] = net.Traces[i].Segment
	}
	index := NewIndex(segs)
	net.Intersections = index.Intersections()
	net.Clusters = AssignClusters(net.Traces, net.Intersections)
	for w, p := range wells {
		for _, c := range index.CrossPolyline(p.Path) {
			net.WellCrossings = append(net.WellCrossings,
				WellCrossing{Well: w, Trace: c.Segment, Distance: c.Distance, Point: c.Point})
		}
	}
	return net, nil
}

// Generate appends to dst the set's fractures for one realization, drawn
// from the streams (seed, realization, set, purpose), and returns dst.
func (m *SetModel) Generate(dst []Fracture, seed uint64, realization, set int, r Region) []Fracture {
	n := m.Count
	if n < 0 {
		src := newPCG(seed, realization, set, PurposeCount)
		n = int(distuv.Poisson{Lambda: m.Info.ExpectedCount, Src: src}.Rand())
	}
	rs := Stream(seed, realization, set, PurposeSize)
	rc := Stream(seed, realization, set, PurposeCentre)
	ro := Stream(seed, realization, set, PurposeOrientation)
	lo := [3]float64{r.XMin, r.YMin, r.ZMin()}
	side := r.sides()
	dst = growFractures(dst, n)
	for range n {
		u := rs.Float64()
		k := 0
		for k < 3 && u >= m.cumWeights[k] {
			k++
		}
		size := m.Size.RandWeighted(rs, k)
		f := Fracture{Set: set, Shape: m.Info.Shape, Size: size}
		if f.Shape == Disc {
			f.Height = 2 * size
			f.Area = math.Pi * size * size
		} else {
			f.Height = m.Aspect * size
			f.Area = size * f.Height
		}
		e := m.extentFactor * size
		f.Centre = r3.Vec{
			X: lo[0] - e + (side[0]+2*e)*rc.Float64(),
			Y: lo[1] - e + (side[1]+2*e)*rc.Float64(),
			Z: lo[2] - e + (side[2]+2*e)*rc.Float64(),
		}
		f.Normal = upward(m.Orientation.Rand(ro))
		f.Dip, f.DipDirection = orient.DipAndDirection(f.Normal)
		dst = append(dst, f)
	}
	return dst
}

// maxPrealloc bounds the fractures reserved at once, so that a random
// count far above its expectation cannot reserve memory before any
// fracture is drawn.
const maxPrealloc = 1 << 20

func growFractures(dst []Fracture, n int) []Fracture {
	n = min(n, maxPrealloc) // beyond it, append grows the slice as needed
	if cap(dst)-len(dst) >= n {
		return dst
	}
	out := make([]Fracture, len(dst), len(dst)+n)
	copy(out, dst)
	return out
}

// KnownFracture returns a mapped fracture as a rectangle of set KnownSet.
func KnownFracture(k scenarios.KnownFracture) (Fracture, error) {
	for _, v := range []float64{k.X, k.Y, k.Depth, k.Dip, k.DipDirection, k.Length, k.Height} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return Fracture{}, fmt.Errorf("values must be finite")
		}
	}
	if !(k.Dip >= 0 && k.Dip <= math.Pi/2) {
		return Fracture{}, fmt.Errorf("dip = %g deg: must be in [0, 90]", deg(k.Dip))
	}
	if !(k.Length > 0) || !(k.Height > 0) {
		return Fracture{}, fmt.Errorf("length = %g m, height = %g m: both must be > 0", k.Length, k.Height)
	}
	dd := orient.Azimuth(k.DipDirection)
	return Fracture{
		Set: KnownSet, Name: k.Name, Shape: Rectangle,
		Centre: r3.Vec{X: k.X, Y: k.Y, Z: -k.Depth},
		Normal: orient.Normal(k.Dip, dd),
		Dip:    k.Dip, DipDirection: dd,
		Size: k.Length, Height: k.Height, Area: k.Length * k.Height,
	}, nil
}

// wellPaths returns the wells' map-view paths.
func wellPaths(ws []scenarios.Well) ([]WellPath, error) {
	out := make([]WellPath, len(ws))
	for i, w := range ws {
		if len(w.Path) < 2 {
			return nil, fmt.Errorf("dfn: wells[%d] (%q): path has %d point(s): need at least 2", i, w.Name, len(w.Path))
		}
		p := make([]r2.Vec, len(w.Path))
		for j, q := range w.Path {
			if math.IsNaN(q.X) || math.IsNaN(q.Y) || math.IsInf(q.X, 0) || math.IsInf(q.Y, 0) {
				return nil, fmt.Errorf("dfn: wells[%d] (%q).path[%d]: coordinates must be finite", i, w.Name, j)
			}
			p[j] = r2.Vec{X: q.X, Y: q.Y}
		}
		out[i] = WellPath{Name: w.Name, Path: p}
	}
	return out, nil
}
