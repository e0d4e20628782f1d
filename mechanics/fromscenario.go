package mechanics

import (
	"math"

	"gonum.org/v1/gonum/spatial/r2"

	"slipfront/elastic"
	"slipfront/scenarios"
)

// StressFromScenario returns the stress state at true vertical depth z, m,
// from a scenario's stress gradients (SI units, radians).
func StressFromScenario(st scenarios.Stress, z float64) (Stress, error) {
	return StressAtDepth(Gradients{
		Sv:           st.SvGradient,
		SHmax:        st.SHmaxGradient,
		Shmin:        st.ShminGradient,
		PorePressure: st.PorePressureGradient,
		SHmaxAzimuth: st.SHmaxAzimuth,
	}, z)
}

// CoulombFromScenario returns the slip criterion of a scenario's rock:
// static friction and cohesion.
func CoulombFromScenario(r scenarios.Rock) (Coulomb, error) {
	c := Coulomb{Friction: r.FrictionStatic, Cohesion: r.Cohesion}
	if err := c.Validate(); err != nil {
		return Coulomb{}, err
	}
	return c, nil
}

// FrictionFromScenario returns the slip-weakening friction of a
// scenario's rock: μs, μd, Dc and cohesion.
func FrictionFromScenario(r scenarios.Rock) (SlipWeakening, error) {
	f := SlipWeakening{Static: r.FrictionStatic, Residual: r.FrictionResidual,
		CriticalSlip: r.SlipWeakeningDistance, Cohesion: r.Cohesion}
	if err := f.Validate(); err != nil {
		return SlipWeakening{}, err
	}
	return f, nil
}

// ApertureFromScenario returns the aperture model of a scenario's rock.
func ApertureFromScenario(r scenarios.Rock) (ApertureModel, error) {
	m := ApertureModel{
		ZeroStress:        r.ZeroStressAperture,
		ClosureStress:     r.ClosureStress,
		DilationAngle:     r.DilationAngle,
		DilationSlipLimit: r.DilationSlipLimit,
		ShearModulus:      r.ShearModulus,
		PoissonRatio:      r.PoissonRatio,
	}
	if err := m.Validate(); err != nil {
		return ApertureModel{}, err
	}
	return m, nil
}

// LayerFromScenario returns the depletion model of a scenario's layer: its
// rock's Poisson's ratio, its thickness and Biot's coefficient biot
// (depletion.biot).
func LayerFromScenario(r scenarios.Rock, l scenarios.Layer, biot float64) (Layer, error) {
	m := Layer{Poroelastic: Poroelastic{Biot: biot, Poisson: r.PoissonRatio}, Thickness: l.Thickness}
	if err := m.Validate(); err != nil {
		return Layer{}, err
	}
	return m, nil
}

// DepletionGridFromScenario returns the depletion grid with the cells of a
// scenario's map grid (same order: row·Cols + col, rows south to north).
func DepletionGridFromScenario(g scenarios.Grid) DepletionGrid {
	return DepletionGrid{Cols: g.Cols, Rows: g.Rows, DX: g.CellSize, DY: g.CellSize}
}

// ReceiverFromScenario returns the vertical receiver planes of a
// scenario's Coulomb stress change: their unit tangent in map view (east,
// north) and their sense of slip. The optimal receiver is the plane best
// oriented for right-lateral slip under SHmax at the effective friction μ′:
// it makes β = ½·atan(1/μ′) with SHmax (45° − φ/2, tan φ = μ′;
// docs/references.md §7.3) and strikes β anticlockwise of it, where SHmax
// shears it right-laterally.
func ReceiverFromScenario(c scenarios.Coulomb, shmaxAzimuth float64) (tangent r2.Vec, sense elastic.Sense) {
	strike, sense := c.ReceiverStrike, elastic.RightLateral
	if c.Receiver == "optimal" {
		strike = shmaxAzimuth - 0.5*math.Atan2(1, c.EffectiveFriction)
	} else if c.ReceiverSense == "left-lateral" {
		sense = elastic.LeftLateral
	}
	return r2.Vec{X: math.Sin(strike), Y: math.Cos(strike)}, sense
}
