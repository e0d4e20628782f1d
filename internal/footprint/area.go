package footprint

import (
	"fmt"
	"math"
	"runtime"
	"sync"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/dfn"
)

// MaxCoordinate is the largest coordinate magnitude, m, that Area and
// Outline accept: far beyond any map, and small enough that squared
// distances stay finite and exact to float64 rounding.
const MaxCoordinate = 1e12

// MinRadiusRatio is the smallest radius, relative to the coordinates'
// magnitude, that Area and Outline accept: below it the radius is within
// a few thousand rounding steps of the coordinates and the geometry is
// noise.
const MinRadiusRatio = 1e-9

// region is the prepared input: stadiums in the sweep frame, the input
// moved by −origin and turned by the angle whose cosine and sine are
// turn.X and turn.Y (no turn, (1, 0), unless a segment is nearly
// horizontal: see sweepTurn).
type region struct {
	origin r2.Vec
	turn   r2.Vec
	r      float64
	scale  float64 // bound on the local coordinates' magnitude, + r
	sw     *sweep
}

// prepare validates the input, merges collinear consecutive segments,
// moves the origin to the centre of the segments' bounding box (so the
// sweep works with small numbers), turns the frame if a segment is nearly
// horizontal (sweepTurn) and builds the strips.
func prepare(segs []dfn.Segment, r float64) (*region, error) {
	if !(r > 0) || math.IsInf(r, 0) {
		return nil, fmt.Errorf("footprint: radius = %g m: must be finite and > 0", r)
	}
	lo, hi := r2.Vec{X: math.Inf(1), Y: math.Inf(1)}, r2.Vec{X: math.Inf(-1), Y: math.Inf(-1)}
	for i, s := range segs {
		for _, p := range [2]r2.Vec{s.P0, s.P1} {
			if !(math.Abs(p.X) <= MaxCoordinate && math.Abs(p.Y) <= MaxCoordinate) {
				return nil, fmt.Errorf("footprint: segment %d: point (%g, %g) m: coordinates must be finite and within ±%g m", i, p.X, p.Y, MaxCoordinate)
			}
			lo = r2.Vec{X: min(lo.X, p.X), Y: min(lo.Y, p.Y)}
			hi = r2.Vec{X: max(hi.X, p.X), Y: max(hi.Y, p.Y)}
		}
	}
	reg := &region{r: r, turn: r2.Vec{X: 1}}
	if len(segs) == 0 {
		reg.sw = newSweep(nil, r, r)
		return reg, nil
	}
	mag := max(max(math.Abs(lo.X), math.Abs(hi.X)), max(math.Abs(lo.Y), math.Abs(hi.Y)))
	if r < MinRadiusRatio*mag {
		return nil, fmt.Errorf("footprint: radius = %g m: must be ≥ %g × the largest coordinate (%g m)", r, MinRadiusRatio, mag)
	}
	reg.origin = r2.Scale(0.5, r2.Add(lo, hi))
	reg.scale = 0.5*max(hi.X-lo.X, hi.Y-lo.Y) + r
	pairs := mergeCollinear(segs, 64*epsilon*mag)
	// Without a frame free of nearly horizontal segments (many segments at
	// a radius tiny for the map) the map frame stays: Area does not need
	// the turn, only Outline's vertex matching does.
	if turn, ok := sweepTurn(pairs, 32*epsilon*reg.scale/reg.mergeDistance()); ok && turn != reg.turn {
		reg.turn = turn
		reg.scale = math.Sqrt2*0.5*max(hi.X-lo.X, hi.Y-lo.Y) + r
	}
	st := make([]stadium, len(pairs))
	for i, p := range pairs {
		st[i] = newStadium(reg.toSweep(p[0]), reg.toSweep(p[1]), r)
	}
	reg.sw = newSweep(st, r, reg.scale)
	return reg, nil
}

// mergeDistance is the distance within which the outline joins vertices
// and gaps: 8·√(ε·r·L) for the rounding of near-tangent crossings (a
// crossing at angle θ moves by δ/θ for a rounding δ, and θ ≳ √(δ/r)), plus
// 64ε·L for the rounding of the coordinates (L the scale).
func (reg *region) mergeDistance() float64 {
	return 8*math.Sqrt(epsilon*reg.r*reg.scale) + 64*epsilon*reg.scale
}

// toSweep returns map point p in the sweep frame.
func (reg *region) toSweep(p r2.Vec) r2.Vec {
	d := r2.Sub(p, reg.origin)
	if reg.turn == (r2.Vec{X: 1}) {
		return d
	}
	c, s := reg.turn.X, reg.turn.Y
	return r2.Vec{X: c*d.X - s*d.Y, Y: s*d.X + c*d.Y}
}

// toMap returns sweep-frame point p in map coordinates.
func (reg *region) toMap(p r2.Vec) r2.Vec {
	if reg.turn != (r2.Vec{X: 1}) {
		c, s := reg.turn.X, reg.turn.Y
		p = r2.Vec{X: c*p.X + s*p.Y, Y: -s*p.X + c*p.Y}
	}
	return r2.Add(p, reg.origin)
}

// sweepTurn returns the cosine and sine of an angle by which to turn the
// frame so that no segment is nearly horizontal, with ok false if none of
// the angles tried works. The sweep follows each stadium's long edges as
// x(y), which a segment of slope s takes with the rounding δ of its
// heights magnified to δ/s: a fuzz input found a segment of slope 6e-10
// whose outline vertices then missed each other by 2 µm, more than the
// merge distance, and the outline came out empty. Exactly horizontal
// segments are handled exactly (their long edges are flat), so only
// slopes in (0, minSlope) need a turn (minSlope = 32ε·L over the merge
// distance, about 4√(ε·L/r)); then the frame turns by multiples of π/φ
// (φ the golden ratio: the multiples never repeat and spread evenly over
// the half turn) until every segment's slope is 0 or at least minSlope
// away from 0 (for n segments the bad angles cover at most about
// 4n·minSlope of the half turn). Inputs without such a segment keep the
// map frame, bit for bit.
func sweepTurn(pairs [][2]r2.Vec, minSlope float64) (r2.Vec, bool) {
	bad := func(c, s float64) bool {
		for _, p := range pairs {
			d := r2.Sub(p[1], p[0])
			dx, dy := math.Abs(c*d.X-s*d.Y), math.Abs(s*d.X+c*d.Y)
			if dy > 0 && dy < minSlope*dx {
				return true
			}
		}
		return false
	}
	const step = math.Pi * 0.6180339887498949 // π/φ = π(√5 − 1)/2
	for k := range 64 {
		s, c := math.Sincos(float64(k) * step) // k = 0: exactly (0, 1), the map frame
		if !bad(c, s) {
			return r2.Vec{X: c, Y: s}, true
		}
	}
	return r2.Vec{}, false
}

// epsilon is the float64 unit roundoff, 2⁻⁵³.
const epsilon = 0x1p-53

// mergeCollinear joins runs of consecutive segments that continue one
// another along one line (the next starts within tol of where the last
// ended, goes forward, and its far end lies within tol of the line of the
// run's first segment): the union of the stadiums is unchanged but for
// the tol-thin slivers between the pieces and the merged segment, an area
// of at most 2·tol per metre of run. Stimulated elements of one trace
// come in such runs.
func mergeCollinear(segs []dfn.Segment, tol float64) [][2]r2.Vec {
	out := make([][2]r2.Vec, 0, len(segs))
	var dir r2.Vec // unit direction of the current run's first segment
	for _, s := range segs {
		if n := len(out); n > 0 && dir != (r2.Vec{}) {
			run := &out[n-1]
			step := r2.Sub(s.P1, s.P0)
			if r2.Norm(r2.Sub(s.P0, run[1])) <= tol && r2.Dot(step, dir) >= 0 &&
				math.Abs(r2.Cross(dir, r2.Sub(s.P1, run[0]))) <= tol {
				run[1] = s.P1
				continue
			}
		}
		out = append(out, [2]r2.Vec{s.P0, s.P1})
		dir = r2.Vec{}
		if l := r2.Norm(r2.Sub(s.P1, s.P0)); l > 0 {
			dir = r2.Scale(1/l, r2.Sub(s.P1, s.P0))
		}
	}
	return out
}

// Area returns the area, m², of the set of points within distance r (m)
// of at least one of the segments: the union of their stadiums. The
// result is exact up to floating-point rounding (see the package
// documentation for the method and its error bound). It returns an error
// for a radius that is not finite and positive, or too small for the
// coordinates (MinRadiusRatio), and for coordinates that are not finite
// or beyond MaxCoordinate.
func Area(segs []dfn.Segment, r float64) (float64, error) {
	reg, err := prepare(segs, r)
	if err != nil {
		return 0, err
	}
	return reg.area(), nil
}

// area sweeps every strip and adds the strips' areas in strip order (so
// the result does not depend on the number of workers).
func (reg *region) area() float64 {
	sw := reg.sw
	parts := make([]float64, len(sw.lines)-1)
	sw.eachStrip(func(s int, ws *workspace) { parts[s] = sw.stripArea(s, ws) })
	var sum neumaier
	for _, p := range parts {
		sum.add(p)
	}
	return sum.value()
}

// eachStrip calls do for every strip, spread over GOMAXPROCS workers, each
// with its own workspace.
func (sw *sweep) eachStrip(do func(s int, ws *workspace)) {
	n := len(sw.lines) - 1
	workers := min(runtime.GOMAXPROCS(0), n)
	var wg sync.WaitGroup
	for w := range workers {
		wg.Add(1)
		go func() {
			defer wg.Done()
			var ws workspace
			for s := w; s < n; s += workers {
				do(s, &ws)
			}
		}()
	}
	wg.Wait()
}

// stripArea returns the area of the region within strip s: over each slab
// and each maximal interval [L(y), R(y)], ∫ (R − x0) dy − ∫ (L − x0) dy,
// measured from the strip's left bound x0 so the terms stay small.
func (sw *sweep) stripArea(s int, ws *workspace) float64 {
	x0, x1 := sw.lines[s], sw.lines[s+1]
	var sum neumaier
	sw.run(s, ws, 0, func(y0, y1 float64, cells []cell) {
		for _, c := range cells {
			sum.add(sw.integral(c.hi, y0, y1, x0, x1) - sw.integral(c.lo, y0, y1, x0, x1))
		}
	})
	return sum.value()
}

// neumaier is a compensated sum (Neumaier, A. 1974, "Rundungsfehleranalyse
// einiger Verfahren zur Summation endlicher Summen", ZAMM 54(1), 39–51):
// its error is a few units of roundoff of the result, whatever the number
// of terms.
type neumaier struct{ s, c float64 }

func (k *neumaier) add(x float64) {
	t := k.s + x
	if math.Abs(k.s) >= math.Abs(x) {
		k.c += (k.s - t) + x
	} else {
		k.c += (x - t) + k.s
	}
	k.s = t
}

func (k *neumaier) value() float64 { return k.s + k.c }
