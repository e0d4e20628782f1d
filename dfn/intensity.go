package dfn

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/spatial/r3"

	"slipfront/internal/badinput"
	"slipfront/internal/orient"
	"slipfront/scenarios"
)

// DefaultMaxFractures is the cap used when Numerics.MaxFractures is 0.
const DefaultMaxFractures = 2_000_000

// minC13 is the smallest C13 a P10 is converted through: below it the
// measuring line lies (nearly) in the set's planes and P32 = P10/C13 is
// meaningless.
const minC13 = 1e-6

// ErrTooManyFractures is matched (errors.Is) by a *CapError, which also
// matches badinput.Err.
var ErrTooManyFractures = errors.New("dfn: too many fractures")

// CapError reports a scenario whose expected fracture count exceeds the cap.
type CapError struct {
	// Set is the name of the set with the largest expected count;
	// SetExpected its expected count.
	Set         string
	SetExpected float64
	// Total expected count of all sets and mapped fractures.
	Total float64
	// Cap is numerics.max_fractures.
	Cap int
}

func (e *CapError) Error() string {
	return fmt.Sprintf("dfn: the sets would generate %.4g fractures on average (set %q alone %.4g), "+
		"more than numerics.max_fractures = %d: lower the intensity, the size range or the domain, or raise the cap",
		e.Total, e.Set, e.SetExpected, e.Cap)
}

// Is reports whether target is ErrTooManyFractures or badinput.Err (a
// scenario that asks for too many fractures is bad input).
func (e *CapError) Is(target error) bool {
	return target == ErrTooManyFractures || target == badinput.Err
}

// SetModel is a fracture set ready to generate in a counting volume.
type SetModel struct {
	Info        SetInfo
	Orientation OrientationLaw
	Size        SizeLaw
	// Aspect is the rectangles' height / strike length.
	Aspect float64
	// Count is the exact number to generate for a count intensity; −1 for
	// a Poisson number of mean Info.ExpectedCount.
	Count int
	// extentFactor c gives the extent e = c·size.
	extentFactor float64
	// cumWeights are the cumulative mixture weights of s^k, k = 0..3.
	cumWeights [4]float64
}

// MeanArea returns E[A]: π E[S²] for discs, aspect·E[S²] for rectangles, m².
func (m *SetModel) MeanArea() float64 {
	if m.Info.Shape == Disc {
		return math.Pi * m.Size.Moment(2)
	}
	return m.Aspect * m.Size.Moment(2)
}

// NewSetModel prepares a scenario set for the counting volume r.
func NewSetModel(set scenarios.FractureSet, r Region) (*SetModel, error) {
	m := &SetModel{Info: SetInfo{Name: set.Name}, Count: -1, Aspect: 1, extentFactor: 1}
	switch set.Shape {
	case "disc":
		m.Info.Shape = Disc
	case "rectangle":
		m.Info.Shape = Rectangle
		if !(set.AspectRatio > 0) || math.IsInf(set.AspectRatio, 0) {
			return nil, fmt.Errorf("aspect_ratio = %g: must be > 0 and finite", set.AspectRatio)
		}
		m.Aspect = set.AspectRatio
		m.extentFactor = math.Hypot(1, m.Aspect) / 2
	default:
		return nil, fmt.Errorf("shape = %q: must be disc or rectangle", set.Shape)
	}
	var err error
	if m.Orientation, err = NewOrientationLaw(set.Orientation); err != nil {
		return nil, err
	}
	if m.Size, err = NewSizeLaw(set.Size); err != nil {
		return nil, err
	}
	boxVolume := m.mixture(r)
	if err := m.intensity(set.Intensity, boxVolume); err != nil {
		return nil, err
	}
	return m, nil
}

// mixture sets the weights of the size-weighted mixture and returns
// E[V(e)], the mean volume of the counting volume enlarged by each
// fracture's extent e = c·s on every side:
//
//	V = (Lx + 2cs)(Ly + 2cs)(T + 2cs) = a0 + a1 s + a2 s² + a3 s³
//
// with a0 = LxLyT, a1 = 2c(LxLy + LxT + LyT), a2 = 4c²(Lx + Ly + T),
// a3 = 8c³; the weights are a_k E[S^k] / E[V].
func (m *SetModel) mixture(r Region) float64 {
	l := r.sides()
	c := m.extentFactor
	a := [4]float64{
		l[0] * l[1] * l[2],
		2 * c * (l[0]*l[1] + l[0]*l[2] + l[1]*l[2]),
		4 * c * c * (l[0] + l[1] + l[2]),
		8 * c * c * c,
	}
	var terms [4]float64
	var total float64
	for k := range 4 {
		terms[k] = a[k] * m.Size.Moment(k)
		total += terms[k]
	}
	var cum float64
	for k := range 4 {
		cum += terms[k] / total
		m.cumWeights[k] = cum
	}
	m.cumWeights[3] = 1
	return total
}

// intensity converts the set's intensity to λ, the P32 target and the
// expected count.
func (m *SetModel) intensity(in scenarios.Intensity, boxVolume float64) error {
	area := m.MeanArea()
	switch in.Measure {
	case "p32":
		if !(in.P32 > 0) || math.IsInf(in.P32, 0) {
			return fmt.Errorf("intensity.p32 = %g 1/m: must be > 0 and finite", in.P32)
		}
		m.Info.P32Target = in.P32
	case "p10":
		if !(in.P10 > 0) || math.IsInf(in.P10, 0) {
			return fmt.Errorf("intensity.p10 = %g 1/m: must be > 0 and finite", in.P10)
		}
		line := orient.Line(in.LineTrend, in.LinePlunge)
		c13 := m.Orientation.C13(line)
		if !(c13 >= minC13) {
			return fmt.Errorf("intensity.p10: the measuring line (trend %g deg, plunge %g deg) lies in the set's planes "+
				"(C13 = E|n·l| = %.3g), so P10 cannot be converted to P32", deg(in.LineTrend), deg(in.LinePlunge), c13)
		}
		m.Info.P32Target = in.P10 / c13
	case "count":
		if in.Count < 1 {
			return fmt.Errorf("intensity.count = %d: must be ≥ 1", in.Count)
		}
		m.Count = in.Count
		m.Info.Density = float64(in.Count) / boxVolume
		m.Info.P32Target = m.Info.Density * area
		m.Info.ExpectedCount = float64(in.Count)
		return nil
	default:
		return fmt.Errorf("intensity.measure = %q: must be p32, p10 or count", in.Measure)
	}
	m.Info.Density = m.Info.P32Target / area
	m.Info.ExpectedCount = m.Info.Density * boxVolume
	return nil
}

// C13 is a convenience for the conversion factor of a set along the line
// of the given trend and plunge, radians.
func C13(law OrientationLaw, trend, plunge float64) float64 {
	return law.C13(orient.Line(trend, plunge))
}

// checkCap returns a *CapError when the expected total exceeds the cap.
func checkCap(models []*SetModel, known int, limit int) error {
	if limit <= 0 {
		limit = DefaultMaxFractures
	}
	total := float64(known)
	worst, worstCount := KnownSetName, float64(known)
	for _, m := range models {
		total += m.Info.ExpectedCount
		if m.Info.ExpectedCount > worstCount {
			worst, worstCount = m.Info.Name, m.Info.ExpectedCount
		}
	}
	if total > float64(limit) || math.IsNaN(total) {
		return &CapError{Set: worst, SetExpected: worstCount, Total: total, Cap: limit}
	}
	return nil
}

func deg(a float64) float64 { return a * 180 / math.Pi }

// upward returns the unit vector along v, flipped so that z ≥ 0 (v is a
// unit vector up to rounding, so no overflow-safe norm is needed).
func upward(v r3.Vec) r3.Vec {
	k := 1 / math.Sqrt(v.X*v.X+v.Y*v.Y+v.Z*v.Z)
	if v.Z < 0 {
		k = -k
	}
	return r3.Vec{X: k * v.X, Y: k * v.Y, Z: k * v.Z}
}
