package mechanics

import (
	"fmt"
	"math"
	"slices"
	"sort"

	"slipfront/internal/caution"

	"gonum.org/v1/gonum/spatial/r3"
)

// Caution is the statement every screening output carries.
const Caution = caution.Text

// DefaultCurveStep is the pressure step of the slip-versus-pressure curve,
// Pa.
const DefaultCurveStep = 0.25e6

// maxCurvePoints bounds the curve's length: the step is doubled until the
// curve fits (common practice, no source).
const maxCurvePoints = 2001

// DefaultIncreases returns the pore-pressure increases, Pa, at which the
// screening reports the share of slipping fractures: 0, 1, 2, 5 and 10 MPa.
func DefaultIncreases() []float64 { return []float64{0, 1e6, 2e6, 5e6, 10e6} }

// Plane is one fracture plane to screen.
type Plane struct {
	ID          int     // fracture id
	Set         int     // index of the fracture's set
	Normal      r3.Vec  // normal of the plane, any length but zero, either sense
	Area        float64 // fracture area, m²
	TraceLength float64 // length of the fracture's trace on the layer mid-plane, m
}

// PlaneResult is the screening of one plane.
type PlaneResult struct {
	ID  int // fracture id
	Set int // set index
	// Dip and DipDirection of the plane, radians.
	Dip, DipDirection float64
	SigmaN            float64 // total normal stress, Pa
	// PorePressure is the pore pressure the plane was screened at, Pa: the
	// screening's, or its own with ScreenOptions.Local.
	PorePressure      float64
	Tau               float64 // shear stress, Pa
	SlipTendency      float64 // effective slip tendency τ/(σn − p)
	TotalSlipTendency float64 // slip tendency with total stress τ/σn (Morris et al. 1996)
	DilationTendency  float64 // (S1 − σn)/(S1 − S3)
	CriticalIncrease  float64 // Δp_c, Pa; ≤ 0 when already critical
	Rake              float64 // rake of the hanging-wall slip direction, radians
	Area              float64 // m²
	TraceLength       float64 // m
}

// ScreenPlanes resolves the stress s on every plane and writes the results
// to dst, which must have the length of planes. It returns an error for
// an invalid criterion or plane (zero or non-finite normal, area not > 0,
// negative trace length); it does not allocate.
func ScreenPlanes(dst []PlaneResult, planes []Plane, s Stress, c Coulomb) error {
	if len(dst) != len(planes) {
		panic("mechanics: ScreenPlanes: len(dst) != len(planes)")
	}
	if err := c.Validate(); err != nil {
		return err
	}
	return screenPlanes(dst, planes, func(int) Stress { return s }, c)
}

// screenPlanes screens plane i under the stress at(i).
func screenPlanes(dst []PlaneResult, planes []Plane, at func(i int) Stress, c Coulomb) error {
	for i := range planes {
		pl := &planes[i]
		if err := checkPlane(i, pl); err != nil {
			return err
		}
		s := at(i)
		p := s.pore
		r := s.Resolve(pl.Normal)
		dst[i] = PlaneResult{
			PorePressure:      p,
			ID:                pl.ID,
			Set:               pl.Set,
			Dip:               r.Dip,
			DipDirection:      r.DipDirection,
			SigmaN:            r.SigmaN,
			Tau:               r.Tau,
			SlipTendency:      SlipTendency(r.SigmaN, r.Tau, p),
			TotalSlipTendency: TotalSlipTendency(r.SigmaN, r.Tau),
			DilationTendency:  s.DilationTendency(r.SigmaN),
			CriticalIncrease:  c.CriticalIncrease(r.SigmaN, r.Tau, p),
			Rake:              r.Rake,
			Area:              pl.Area,
			TraceLength:       pl.TraceLength,
		}
	}
	return nil
}

// checkPlane returns an error for an unusable plane i.
func checkPlane(i int, pl *Plane) error {
	n := pl.Normal
	if sum := n.X + n.Y + n.Z; math.IsNaN(sum) || math.IsInf(sum, 0) || r3.Norm2(n) == 0 {
		return fmt.Errorf("mechanics: plane %d (fracture %d): normal (%g, %g, %g) must be finite and non-zero",
			i, pl.ID, n.X, n.Y, n.Z)
	}
	if !(pl.Area > 0) || math.IsInf(pl.Area, 0) {
		return fmt.Errorf("mechanics: plane %d (fracture %d): area = %g m²: must be finite and > 0", i, pl.ID, pl.Area)
	}
	if !(pl.TraceLength >= 0) || math.IsInf(pl.TraceLength, 0) {
		return fmt.Errorf("mechanics: plane %d (fracture %d): trace length = %g m: must be finite and ≥ 0",
			i, pl.ID, pl.TraceLength)
	}
	return nil
}

// ScreenOptions tune [Screen].
type ScreenOptions struct {
	// Increases are the pore-pressure increases, Pa, ascending and ≥ 0, at
	// which shares are reported; nil means DefaultIncreases().
	Increases []float64
	// CurveStep is the pressure step of the curve, Pa; 0 means
	// DefaultCurveStep.
	CurveStep float64
	// SetNames name the sets by index (optional; an index may be
	// negative, e.g. for mapped fractures); sets without a name are called
	// "set <index>".
	SetNames map[int]string
	// Local, when not nil, is the stress state at each plane, parallel to
	// the planes (a depleted field): each plane is resolved, and its Δp_c
	// taken from its own pore pressure, under its own state. The Stress
	// argument of Screen then serves the frictional-limit check only.
	Local []Stress
}

// Shares are the counts and slipping shares of one set or of all
// fractures. The share slices are parallel to Screening.Increases; a
// share is 0 when its total is 0.
type Shares struct {
	Set              int     // set index (Screening.Total: -1, which a set of mapped fractures may share)
	Name             string  // set name; "all" for all fractures
	Fractures        int     // number of fractures
	TraceLength      float64 // total trace length, m
	Area             float64 // total fracture area, m²
	FractureShare    []float64
	TraceLengthShare []float64
	AreaShare        []float64
}

// CurvePoint is one point of the slip-versus-pressure curve.
type CurvePoint struct {
	Increase         float64 // pore-pressure increase Δp, Pa
	SlippingArea     float64 // area of the fractures with Δp_c ≤ Δp, m²
	AreaShare        float64 // SlippingArea over the total area
	FractureShare    float64 // share of fractures with Δp_c ≤ Δp
	TraceLengthShare float64 // share of trace length with Δp_c ≤ Δp
}

// Screening is the pre-injection screening of a fracture population: every
// plane's stress, slip tendency and critical pressure increase, with the
// shares that slip at given increases and a slip-versus-pressure curve.
//
// A fracture counts as slipping at an increase Δp when Δp_c ≤ Δp, with the
// total stresses held fixed (no poroelastic stress path). The curve runs
// from 0 in steps of CurveStep up to the first step at or beyond the
// largest Δp_c, where every fracture slips; if that would take more than
// 2001 points the step is doubled until it does not.
type Screening struct {
	Stress    Stress
	Criterion Coulomb
	Limit     LimitCheck
	Increases []float64 // Pa
	Planes    []PlaneResult
	Sets      []Shares // by ascending set index
	Total     Shares
	CurveStep float64 // Pa
	Curve     []CurvePoint
}

// Screen screens the planes under the stress s with the criterion c.
func Screen(planes []Plane, s Stress, c Coulomb, opt ScreenOptions) (*Screening, error) {
	incs, step, err := opt.resolved()
	if err != nil {
		return nil, err
	}
	limit, err := s.CheckFrictionalLimit(c.Friction)
	if err != nil {
		return nil, err
	}
	sc := &Screening{Stress: s, Criterion: c, Limit: limit, Increases: incs,
		Planes: make([]PlaneResult, len(planes)), CurveStep: step}
	at := func(int) Stress { return s }
	if opt.Local != nil {
		if len(opt.Local) != len(planes) {
			panic("mechanics: Screen: len(ScreenOptions.Local) != len(planes)")
		}
		at = func(i int) Stress { return opt.Local[i] }
	}
	if err := c.Validate(); err != nil {
		return nil, err
	}
	if err := screenPlanes(sc.Planes, planes, at, c); err != nil {
		return nil, err
	}
	sc.Sets, sc.Total = shares(sc.Planes, incs, opt.SetNames)
	sc.CurveStep, sc.Curve = curve(sc.Planes, step)
	return sc, nil
}

// resolved returns the options with defaults filled in, or an error.
func (o ScreenOptions) resolved() (incs []float64, step float64, err error) {
	incs = DefaultIncreases()
	if o.Increases != nil {
		incs = slices.Clone(o.Increases)
	}
	for i, v := range incs {
		if err := nonNegative("pressure increase", v); err != nil {
			return nil, 0, err
		}
		if i > 0 && v <= incs[i-1] {
			return nil, 0, &InputError{Name: "pressure increase", Value: v, Want: "increases must be ascending"}
		}
	}
	step = o.CurveStep
	if step == 0 {
		step = DefaultCurveStep
	}
	if err := positive("curve step", step); err != nil {
		return nil, 0, err
	}
	return incs, step, nil
}

// shares returns the per-set and total shares that slip at each increase.
func shares(res []PlaneResult, incs []float64, names map[int]string) (sets []Shares, total Shares) {
	newShares := func(set int, name string) *Shares {
		return &Shares{Set: set, Name: name, FractureShare: make([]float64, len(incs)),
			TraceLengthShare: make([]float64, len(incs)), AreaShare: make([]float64, len(incs))}
	}
	bySet := map[int]*Shares{}
	all := newShares(-1, "all")
	for i := range res {
		r := &res[i]
		sh := bySet[r.Set]
		if sh == nil {
			sh = newShares(r.Set, setName(r.Set, names))
			bySet[r.Set] = sh
		}
		for _, acc := range [2]*Shares{sh, all} {
			acc.Fractures++
			acc.TraceLength += r.TraceLength
			acc.Area += r.Area
			for k, dp := range incs {
				if r.CriticalIncrease <= dp {
					acc.FractureShare[k]++
					acc.TraceLengthShare[k] += r.TraceLength
					acc.AreaShare[k] += r.Area
				}
			}
		}
	}
	keys := make([]int, 0, len(bySet))
	for k := range bySet {
		keys = append(keys, k)
	}
	sort.Ints(keys)
	for _, k := range keys {
		sh := bySet[k]
		sh.normalise()
		sets = append(sets, *sh)
	}
	all.normalise()
	return sets, *all
}

// normalise turns the slipping sums into shares of the totals.
func (s *Shares) normalise() {
	for k := range s.FractureShare {
		s.FractureShare[k] = ratio(s.FractureShare[k], float64(s.Fractures))
		s.TraceLengthShare[k] = ratio(s.TraceLengthShare[k], s.TraceLength)
		s.AreaShare[k] = ratio(s.AreaShare[k], s.Area)
	}
}

// ratio returns a/b, or 0 when b is 0.
func ratio(a, b float64) float64 {
	if b == 0 {
		return 0
	}
	return a / b
}

// setName returns the name of set i.
func setName(i int, names map[int]string) string {
	if names[i] != "" {
		return names[i]
	}
	return fmt.Sprintf("set %d", i)
}

// curve returns the slip-versus-pressure curve and the step it used.
func curve(res []PlaneResult, step float64) (float64, []CurvePoint) {
	type item struct{ dp, area, length float64 }
	items := make([]item, len(res))
	var top, area, length float64
	for i, r := range res {
		items[i] = item{r.CriticalIncrease, r.Area, r.TraceLength}
		top = math.Max(top, r.CriticalIncrease)
		area += r.Area
		length += r.TraceLength
	}
	slices.SortFunc(items, func(a, b item) int {
		switch {
		case a.dp < b.dp:
			return -1
		case a.dp > b.dp:
			return 1
		}
		return 0
	})
	n := pointsTo(top, step)
	for n+1 > maxCurvePoints {
		step *= 2
		n = pointsTo(top, step)
	}
	pts := make([]CurvePoint, n+1)
	j, count := 0, 0
	var slipArea, slipLength float64
	for k := range pts {
		dp := float64(k) * step
		for j < len(items) && items[j].dp <= dp {
			count++
			slipArea += items[j].area
			slipLength += items[j].length
			j++
		}
		pts[k] = CurvePoint{
			Increase:         dp,
			SlippingArea:     slipArea,
			AreaShare:        ratio(slipArea, area),
			FractureShare:    ratio(float64(count), float64(len(items))),
			TraceLengthShare: ratio(slipLength, length),
		}
	}
	return step, pts
}

// pointsTo returns the least n ≥ 0 with n·step ≥ top.
func pointsTo(top, step float64) int {
	n := int(math.Ceil(top / step))
	if float64(n)*step < top {
		n++
	}
	return max(n, 0)
}
